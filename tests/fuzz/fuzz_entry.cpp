#include "fuzz_entry.h"

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <string>
#include <utility>
#include <vector>

#include "photolot/import.h"
#include "photolot/results.h"
#include "photolot/spec.h"
#include "photolot/workspace_doc.h"

namespace photolot::fuzz {
namespace {

// A broken promise: say which, then abort so libFuzzer (or the test) stops on this input.
#define PHOTOLOT_FUZZ_CHECK(cond)                                                        \
  do {                                                                                   \
    if (!(cond)) {                                                                       \
      std::fprintf(stderr, "%s:%d: fuzz check failed: %s\n", __FILE__, __LINE__, #cond); \
      std::abort();                                                                      \
    }                                                                                    \
  } while (0)

// What the importer promises of any lot it returns (core/include/photolot/lot.h, import.h):
// illuminance is finite and not negative, 0 exactly for dark readings; a normal reading has a
// finite positive resistance; a censored bound is NaN or positive; every place is 1-based or 0.
void check_import(const ImportResult& r) {
  for (const auto& unit : r.lot.units) {
    PHOTOLOT_FUZZ_CHECK(!unit.readings.empty());
    for (const auto& reading : unit.readings) {
      PHOTOLOT_FUZZ_CHECK(std::isfinite(reading.lux) && reading.lux >= 0);
      PHOTOLOT_FUZZ_CHECK((reading.kind == ReadingKind::dark) == (reading.lux == 0));
      if (reading.kind == ReadingKind::normal)
        PHOTOLOT_FUZZ_CHECK(std::isfinite(reading.ohm) && reading.ohm > 0);
      if (reading.kind == ReadingKind::censored)
        PHOTOLOT_FUZZ_CHECK(std::isnan(reading.ohm) || reading.ohm > 0);
    }
  }
  for (const auto& e : r.errors) PHOTOLOT_FUZZ_CHECK(!e.message.empty() && !e.file.empty());
  for (const auto& d : r.lot.diagnostics) PHOTOLOT_FUZZ_CHECK(!d.message.empty());
  PHOTOLOT_FUZZ_CHECK(r.lot.counts.rows_used <= r.lot.counts.rows_read);
}

}  // namespace

void import_csv(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  check_import(import_buffers({{"fuzz.csv", text}}));
  if (size > 0) {
    // The first byte picks forced options, the rest is the file: the paths detection skips.
    ImportOptions options;
    const char delimiters[] = {0, ',', ';', '\t'};
    const char decimals[] = {0, '.', ','};
    options.delimiter = delimiters[data[0] & 3];
    options.decimal = decimals[(data[0] >> 2) % 3];
    if (data[0] & 0x40) options.ohm_unit = "kohm";
    if (data[0] & 0x80) options.overload_ohm = 2e7;
    const std::string rest = text.substr(1);
    if (options.validate().empty()) check_import(import_buffers({{"fuzz.csv", rest}}, options));
    // Split in two files of one lot: merging and duplicate handling across files.
    const std::size_t half = rest.size() / 2;
    check_import(import_buffers({{"a.csv", rest.substr(0, half)}, {"b.csv", rest.substr(half)}}));
  }
  // The preview's detection on its own.
  const FileLayout layout = detect_layout("fuzz.csv", text);
  if (layout.error) PHOTOLOT_FUZZ_CHECK(!layout.error->message.empty());
}

void spec_toml(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const SpecLoadResult r = parse_spec(text, "fuzz.toml");
  // spec.h: a spec is set only when there are no errors, and a loaded spec is valid.
  PHOTOLOT_FUZZ_CHECK(r.spec.has_value() == r.errors.empty());
  if (r.spec) {
    PHOTOLOT_FUZZ_CHECK(r.spec->validate().empty());
    (void)spec_json(*r.spec).dump();
  }
  for (const auto& e : r.errors) PHOTOLOT_FUZZ_CHECK(!e.message.empty());
}

void results_json(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const results::ReadResult r = results::from_json_text(text);
  if (!r.ok()) {
    PHOTOLOT_FUZZ_CHECK(!r.error->message.empty());
    return;
  }
  // results.h: a document read back is written as it was read, so writing what was read and
  // reading that again is a fixed point.
  const std::string once = results::to_json_text(r.doc);
  const results::ReadResult again = results::from_json_text(once);
  PHOTOLOT_FUZZ_CHECK(again.ok());
  PHOTOLOT_FUZZ_CHECK(results::to_json_text(again.doc) == once);
  (void)results::units_csv(r.doc.units);
}

void workspace_json(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  // A folder that need not exist: parse() resolves paths without touching the disk.
  const std::filesystem::path folder = "/fuzz/workspace";
  const workspace::ParseResult r = workspace::parse(text, folder);
  if (!r.ok()) {
    PHOTOLOT_FUZZ_CHECK(!r.error->message.empty());
    return;
  }
  // workspace_doc.h: every source path is resolved (absolute, lexically normal, within the
  // system's limits) and marked outside exactly when it is not under the folder.
  for (const auto& s : r.doc.sources) {
    PHOTOLOT_FUZZ_CHECK(s.path.is_absolute());
    PHOTOLOT_FUZZ_CHECK(s.path == s.path.lexically_normal());
    PHOTOLOT_FUZZ_CHECK(s.path.native().size() <= workspace::kMaxPathBytes);
    PHOTOLOT_FUZZ_CHECK(!s.path.filename().empty());
    const auto rel = s.path.lexically_relative(folder);
    PHOTOLOT_FUZZ_CHECK(s.outside_folder == (rel.empty() || *rel.begin() == ".."));
  }
  PHOTOLOT_FUZZ_CHECK(r.doc.sources.size() <= workspace::kMaxSources);
  PHOTOLOT_FUZZ_CHECK(r.doc.import_options.validate().empty());
  if (!r.doc.results.is_null()) PHOTOLOT_FUZZ_CHECK(results::from_json(r.doc.results).ok());
  // Written and read again: a fixed point.
  const std::string once = workspace::to_text(r.doc, folder);
  const workspace::ParseResult again = workspace::parse(once, folder);
  PHOTOLOT_FUZZ_CHECK(again.ok());
  PHOTOLOT_FUZZ_CHECK(again.doc.sources.size() == r.doc.sources.size());
  PHOTOLOT_FUZZ_CHECK(workspace::to_text(again.doc, folder) == once);
}

EntryPoint entry_point(std::string_view target) {
  if (target == "workspace") return &workspace_json;
  if (target == "import") return &import_csv;
  if (target == "spec") return &spec_toml;
  if (target == "results") return &results_json;
  return nullptr;
}

}  // namespace photolot::fuzz
