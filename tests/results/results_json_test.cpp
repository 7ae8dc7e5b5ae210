// The results document: every key of docs/results-format.md written with its documented type,
// NaN as null, deterministic bytes, and a faithful read-back with placed errors.
#include <gtest/gtest.h>

#include <fstream>
#include <regex>
#include <sstream>

#include "photolot/results.h"
#include "test_support.h"

namespace photolot::results {
namespace {

ResultsDocument sample_document() {
  ResultsDocument doc;
  doc.lot_name = "reel-7";
  doc.files = {{"logs/a.csv", 1234, "af63dc4c8601ec8c"}};
  doc.options["import"] = Json::object({{"delimiter", nullptr}});
  doc.options["fit"] = Json::object({{"loss", "huber"}});
  doc.import_counts = {20, 18, 2, 0, 0, 1, 1};
  doc.fit_method = "power law, huber loss";
  doc.temperature.source = "none";
  doc.temperature.outcome = TemperatureOutcome::not_identifiable;
  doc.temperature.reason = "the readings span 0.00 degC, at least 5 needed";
  doc.temperature.message = "not identifiable: " + doc.temperature.reason + "; none applied";
  doc.with_residuals = true;

  UnitFit a;
  a.id = "U1";
  a.status = FitStatus::fitted;
  a.message = "converged";
  a.curve = make_power_law(18700, 0.75, {1e-4, 0, 0, 1e-4});
  a.r10_ohm = 18700;
  a.gamma = 0.75;
  a.gamma_10_100 = 0.75;
  a.r10_ci95_ohm = {18300, 19100};
  a.gamma_ci95 = {0.73, kNaN};
  a.points = 10;
  a.levels = 10;
  a.dof = 8;
  a.dark_ohm = {5e6, 2e7};
  a.dark_censored = {false, true};
  a.flags = {"censored"};
  a.residuals = {{0, 1.0, 56000, 0.01, 1.0, false}, {1, 10.0, 18700, -0.2, 0.3, true}};
  UnitFit b;
  b.id = "U2";
  b.status = FitStatus::too_few_levels;
  b.message = "2 levels, 3 needed";
  doc.units = {a, b};
  // Keys a later step adds to the units (the spec's verdicts; docs/statistics.md).
  doc.unit_sections = {
      Json::object({{"verdict", "conforming"},
                    {"reasons", Json::array()},
                    {"notes", Json::array({"no dark reading: dark_min_ohm not judged"})}}),
      Json::object({{"verdict", "nonconforming"},
                    {"reasons", Json::array({Json::object({{"characteristic", "fit"},
                                                           {"limit", "fit"},
                                                           {"measured", nullptr},
                                                           {"limit_value", nullptr},
                                                           {"excess_pct", nullptr},
                                                           {"text", "not fitted"}})})},
                    {"notes", Json::array()}})};
  doc.diagnostics = {{"logs/a.csv", 7, 3, Severity::warning, "not a number: 'x'; row skipped"}};
  return doc;
}

struct DocumentedKey {
  std::string path;
  std::string type;
  bool optional = false;
};

// The key table of docs/results-format.md: rows "| `path` | type[, optional] | meaning |".
std::vector<DocumentedKey> documented_keys() {
  std::ifstream in(test::source_path("docs/results-format.md"));
  std::vector<DocumentedKey> keys;
  std::regex row(R"(^\| `([a-z0-9_.\[\]]+)` \| ([a-z]+)(, optional)? \|)");
  std::string line;
  while (std::getline(in, line)) {
    std::smatch m;
    if (std::regex_search(line, m, row)) keys.push_back({m[1], m[2], m[3].matched});
  }
  return keys;
}

// Follows a documented path; "[]" takes every element. Returns the values found.
std::vector<const Json*> follow(const Json& root, const std::string& path) {
  std::vector<const Json*> here{&root};
  std::stringstream parts(path);
  std::string part;
  while (std::getline(parts, part, '.')) {
    bool each = part.size() > 2 && part.ends_with("[]");
    if (each) part.resize(part.size() - 2);
    std::vector<const Json*> next;
    for (const Json* j : here) {
      if (!j->is_object() || !j->contains(part)) continue;
      const Json& v = (*j)[part];
      if (each) {
        for (const auto& e : v) next.push_back(&e);
      } else {
        next.push_back(&v);
      }
    }
    here = std::move(next);
  }
  return here;
}

bool has_type(const Json& v, const std::string& type) {
  if (type == "string") return v.is_string();
  if (type == "integer") return v.is_number_integer();
  if (type == "number") return v.is_number() || v.is_null();
  if (type == "boolean") return v.is_boolean();
  if (type == "array") return v.is_array();
  if (type == "object") return v.is_object();
  return false;
}

TEST(ResultsJson, WritesEveryDocumentedKeyWithItsDocumentedType) {
  auto keys = documented_keys();
  ASSERT_GT(keys.size(), 60u) << "the key table of docs/results-format.md was not found";
  Json j = Json::parse(to_json_text(sample_document()));
  for (const auto& key : keys) {
    auto values = follow(j, key.path);
    EXPECT_FALSE(values.empty()) << key.path << " is documented but not written";
    for (const Json* v : values) EXPECT_TRUE(has_type(*v, key.type)) << key.path << ": " << *v;
  }
  EXPECT_EQ(j["format"], "photolot-results");
  EXPECT_EQ(j["version"], 1);
}

TEST(ResultsJson, DocumentsEveryKeyItWrites) {
  std::set<std::string> documented;
  for (const auto& key : documented_keys()) documented.insert(key.path);
  // Walk the written document (options are free-form per step, so stop there).
  std::function<void(const Json&, const std::string&)> walk = [&](const Json& v,
                                                                  const std::string& path) {
    if (path == "inputs.options" || path == "fit.not_fitted") return;
    if (v.is_object()) {
      for (const auto& [k, child] : v.items()) {
        std::string p = path.empty() ? k : path + "." + k;
        EXPECT_TRUE(documented.count(p)) << p << " is written but not documented";
        walk(child, p);
      }
    } else if (v.is_array() && !v.empty() && v[0].is_object()) {
      for (const auto& e : v) walk(e, path + "[]");
    }
  };
  walk(Json::parse(to_json_text(sample_document())), "");
}

TEST(ResultsJson, WritesNaNAsNull) {
  Json j = Json::parse(to_json_text(sample_document()));
  EXPECT_TRUE(j["units"][0]["gamma_ci95"][1].is_null());
  EXPECT_TRUE(j["units"][1]["r10_ohm"].is_null());
  EXPECT_TRUE(j["units"][1]["r10_ci95_ohm"][0].is_null());
  EXPECT_TRUE(j["fit"]["temperature"]["coefficient_pct_per_c"].is_null());
  EXPECT_EQ(to_json_text(sample_document()).find("NaN"), std::string::npos);
}

TEST(ResultsJson, CountsUnitsNotFittedByReason) {
  Json j = Json::parse(to_json_text(sample_document()));
  EXPECT_EQ(j["fit"]["units"], 2);
  EXPECT_EQ(j["fit"]["fitted"], 1);
  EXPECT_EQ(j["fit"]["not_fitted"]["too_few_levels"], 1);
}

TEST(ResultsJson, GivesTheSameBytesForTheSameDocument) {
  EXPECT_EQ(to_json_text(sample_document()), to_json_text(sample_document()));
}

TEST(ResultsJson, PutsEachUnitOnOneLine) {
  std::string text = to_json_text(sample_document());
  std::stringstream lines(text);
  std::string line;
  int unit_lines = 0;
  while (std::getline(lines, line)) unit_lines += line.rfind("    {\"id\":", 0) == 0;
  EXPECT_EQ(unit_lines, 2);
}

TEST(ResultsJson, ReadsBackWhatItWrote) {
  ResultsDocument doc = sample_document();
  doc.sections["pairing"] = Json::object({{"pairs", Json::array({Json::array({"U1", "U2"})})}});
  doc.sections["acceptance"] = Json::object({{"verdict", "accept"}});
  std::string text = to_json_text(doc);
  ReadResult back = from_json_text(text);
  ASSERT_TRUE(back.ok()) << back.error->message;
  EXPECT_EQ(to_json_text(back.doc), text);  // byte-for-byte, further sections in their order

  const ResultsDocument& d = back.doc;
  EXPECT_EQ(d.lot_name, "reel-7");
  ASSERT_EQ(d.files.size(), 1u);
  EXPECT_EQ(d.files[0].size_bytes, 1234u);
  EXPECT_EQ(d.import_counts.rows_skipped, 2u);
  ASSERT_EQ(d.units.size(), 2u);
  EXPECT_EQ(d.units[0].r10_ohm, 18700);
  EXPECT_TRUE(std::isnan(d.units[0].gamma_ci95[1]));
  EXPECT_EQ(d.units[1].status, FitStatus::too_few_levels);
  EXPECT_TRUE(std::isnan(d.units[1].r10_ohm));
  ASSERT_EQ(d.units[0].residuals.size(), 2u);
  EXPECT_TRUE(d.units[0].residuals[1].outlier);
  EXPECT_EQ(d.units[0].dark_censored, (std::vector<bool>{false, true}));
  // The curve comes back whole: it evaluates to the R10 it was made from (R(10 lx) = R10).
  EXPECT_NEAR(d.units[0].curve.ohm(10.0), 18700, 1e-9 * 18700);
  ASSERT_EQ(d.diagnostics.size(), 1u);
  EXPECT_EQ(d.diagnostics[0].column, 3u);
  EXPECT_EQ(d.sections.begin().key(), "pairing");
  // The keys of later steps in the units come back with their units.
  ASSERT_EQ(d.unit_sections.size(), 2u);
  EXPECT_EQ(d.unit_sections[1].at("verdict"), "nonconforming");
  EXPECT_FALSE(d.unit_sections[0].contains("id"));
  EXPECT_EQ(d.temperature.outcome, TemperatureOutcome::not_identifiable);
  EXPECT_EQ(d.temperature.reason, "the readings span 0.00 degC, at least 5 needed");
}

TEST(ResultsJson, ReadsTheTemperatureOutcomeOfADocumentWrittenBeforeItWasAKey) {
  // Earlier documents said it only in the message's opening words.
  struct Case {
    bool identifiable;
    const char* source;
    const char* message;
    TemperatureOutcome outcome;
    const char* reason;
  };
  const Case cases[] = {
      {true, "fitted", "fitted jointly over 9 units: -0.4 +- 0.02 %/degC at 10 lx",
       TemperatureOutcome::fitted, ""},
      {false, "none", "temperature handling off: results are at the bench temperature",
       TemperatureOutcome::not_sought, "temperature handling was off for this run"},
      {false, "spec", "not identifiable: the readings span 1.00 degC, at least 5 needed; x",
       TemperatureOutcome::not_identifiable, "the readings span 1.00 degC, at least 5 needed"},
      {false, "", "", TemperatureOutcome::not_stated, ""},
  };
  for (const Case& c : cases) {
    ResultsDocument doc = sample_document();
    doc.temperature = {};
    doc.temperature.identifiable = c.identifiable;
    doc.temperature.source = c.source;
    doc.temperature.message = c.message;
    Json j = Json::parse(to_json_text(doc));
    j["fit"]["temperature"].erase("outcome");
    j["fit"]["temperature"].erase("reason");
    ReadResult back = from_json_text(j.dump());
    ASSERT_TRUE(back.ok()) << back.error->message;
    EXPECT_EQ(back.doc.temperature.outcome, c.outcome) << c.message;
    EXPECT_EQ(back.doc.temperature.reason, c.reason) << c.message;
  }
}

TEST(ResultsJson, EscapesTextAndReplacesInvalidUtf8) {
  // RFC 8259 section 7: quote, backslash and control characters are escaped; the document
  // must stay valid UTF-8 (section 8.1), so a stray Latin-1 byte becomes U+FFFD.
  ResultsDocument doc = sample_document();
  doc.units[0].id = "A\"1\\x\ty";
  doc.units[1].id = "caf\xe9";
  ReadResult back = from_json_text(to_json_text(doc));
  ASSERT_TRUE(back.ok()) << back.error->message;
  EXPECT_EQ(back.doc.units[0].id, "A\"1\\x\ty");
  EXPECT_EQ(back.doc.units[1].id, "caf\xef\xbf\xbd");
}

// A member of a unit kept from a later step keeps its key as read, escaped when written
// (RFC 8259 section 7), so a key holding a CR or a quote reads back (found by fuzzing: the
// key was written raw, and the document it wrote could not be read).
TEST(ResultsJson, EscapesTheKeysOfMembersKeptFromAReadDocument) {
  Json j = Json::parse(to_json_text(sample_document()));
  j["units"][0]["ln\r10 \"sd\""] = 1.5;
  const ReadResult once = from_json_text(j.dump());
  ASSERT_TRUE(once.ok()) << once.error->message;
  const std::string text = to_json_text(once.doc);
  const ReadResult again = from_json_text(text);
  ASSERT_TRUE(again.ok()) << again.error->message;
  EXPECT_EQ(to_json_text(again.doc), text);
  ASSERT_FALSE(again.doc.unit_sections.empty());
  EXPECT_EQ(again.doc.unit_sections[0].at("ln\r10 \"sd\""), 1.5);
}

// A count too large for its field is refused at its path, not read as another number that
// photolot would then write and refuse itself (found by fuzzing: points = 10797103454).
TEST(ResultsJson, RefusesACountBeyondItsFieldsType) {
  Json j = Json::parse(to_json_text(sample_document()));
  j["units"][1]["points"] = 10797103454LL;
  const ReadResult r = from_json_text(j.dump());
  ASSERT_FALSE(r.ok());
  EXPECT_EQ(r.error->message, "units[1].points: expected a count of at most 2147483647");
  j["units"][1]["points"] = 2147483647LL;  // the largest an int holds reads and writes back
  const ReadResult edge = from_json_text(j.dump());
  ASSERT_TRUE(edge.ok()) << edge.error->message;
  EXPECT_EQ(edge.doc.units[1].points, 2147483647);
  EXPECT_TRUE(from_json_text(to_json_text(edge.doc)).ok());
}

TEST(ResultsJson, PlacesASyntaxErrorByLineAndColumn) {
  ReadResult r = from_json_text("{\n  \"format\": photolot\n}\n");
  ASSERT_FALSE(r.ok());
  EXPECT_EQ(r.error->line, 2u);
  EXPECT_EQ(r.error->column, 13u);  // the 'p' of the unquoted word
  EXPECT_NE(r.error->message.find("not valid JSON"), std::string::npos) << r.error->message;
}

TEST(ResultsJson, NamesThePathOfAValueOfTheWrongType) {
  Json j = to_json(sample_document());
  j["units"][1]["gamma"] = "steep";
  ReadResult r = from_json(j);
  ASSERT_FALSE(r.ok());
  EXPECT_EQ(r.error->message, "units[1].gamma: expected a number or null");
}

TEST(ResultsJson, RefusesANewerVersionAndOtherFormats) {
  Json j = to_json(sample_document());
  j["version"] = 2;
  ReadResult newer = from_json(j);
  ASSERT_FALSE(newer.ok());
  EXPECT_NE(newer.error->message.find("newer"), std::string::npos) << newer.error->message;
  j["version"] = 1;
  j["format"] = "something-else";
  EXPECT_FALSE(from_json(j).ok());
}

}  // namespace
}  // namespace photolot::results
