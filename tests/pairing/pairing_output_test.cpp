// The pairing's JSON section and the pick-list CSV.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "pairing_support.h"
#include "photolot/pairing.h"
#include "test_support.h"

using photolot::LotFit;
using photolot::PairOptions;
using photolot::test::unit_through;

namespace {

photolot::Pairing small_pairing(std::vector<std::string> ids) {
  LotFit fit;
  const double lo = std::log(100e3), hi = std::log(500.0);
  for (std::size_t i = 0; i < ids.size(); ++i) {
    fit.units.push_back(unit_through(ids[i], lo + 0.001 * double(i / 2), hi));
    fit.units.back().curve.covariance.clear();  // unknown
  }
  return photolot::pair_units(fit, PairOptions{});
}

}  // namespace

TEST(PairingJson, HoldsPairsUnpairedAndTheSettingsUsed) {
  const auto p = small_pairing({"A", "B", "C"});
  const nlohmann::json j = photolot::pairing_json(p);
  EXPECT_EQ(j["pairing"]["mode"], "absolute");
  EXPECT_EQ(j["pairing"]["range"]["lux_lo"], 1.0);
  EXPECT_EQ(j["pairing"]["range"]["lux_hi"], 1000.0);
  EXPECT_EQ(j["pairing"]["tolerance_pct"], 2.0);
  EXPECT_EQ(j["pairing"]["proof"], "proved optimal");
  ASSERT_EQ(j["pairs"].size(), 1u);
  EXPECT_EQ(j["pairs"][0]["a"], "A");
  EXPECT_EQ(j["pairs"][0]["b"], "B");
  EXPECT_TRUE(j["pairs"][0].contains("tracking_error_pct"));
  // No covariance on these curves: the sigma is unknown, written as null.
  EXPECT_TRUE(j["pairs"][0]["tracking_error_sigma_pct"].is_null());
  ASSERT_EQ(j["unpaired"].size(), 1u);
  EXPECT_EQ(j["unpaired"][0]["id"], "C");
  EXPECT_FALSE(j["unpaired"][0]["reason"].get<std::string>().empty());
}

TEST(PickListCsv, NeutralisesCellsASpreadsheetWouldReadAsFormulas) {
  // OWASP "CSV Injection": cells starting with =, +, -, @, tab or carriage return are prefixed
  // with an apostrophe; RFC 4180: cells with a comma, quote or line break are quoted.
  const auto p = small_pairing({"=SUM(A1)", "+1", "-2", "@cmd", "\tx", "\ry", "a,b", "plain"});
  const std::string csv = photolot::pick_list_csv(p);
  std::istringstream in(csv);
  std::string header;
  std::getline(in, header);
  EXPECT_EQ(header, "pair,unit_a,unit_b,tracking_error_pct,tracking_error_sigma_pct");
  EXPECT_NE(csv.find(",'=SUM(A1),"), std::string::npos) << csv;
  EXPECT_NE(csv.find(",'+1,"), std::string::npos);
  EXPECT_NE(csv.find(",'-2,"), std::string::npos);
  EXPECT_NE(csv.find(",'@cmd,"), std::string::npos);
  EXPECT_NE(csv.find(",'\tx,"), std::string::npos);
  EXPECT_NE(csv.find(",\"'\ry\","), std::string::npos);
  EXPECT_NE(csv.find(",\"a,b\","), std::string::npos);
  EXPECT_NE(csv.find("1,"), std::string::npos);
}

TEST(PickListCsv, IsWrittenThroughATemporaryFileAndReportsAFolderThatIsMissing) {
  const auto p = small_pairing({"A", "B"});
  const auto dir = photolot::test::scratch_dir();
  const auto path = (dir / "picks.csv").string();
  EXPECT_EQ(photolot::write_pick_list_csv(p, path), "");
  std::ifstream f(path);
  std::stringstream text;
  text << f.rdbuf();
  EXPECT_EQ(text.str(), photolot::pick_list_csv(p));
  EXPECT_FALSE(std::filesystem::exists(path + ".tmp"));
  const auto bad = (dir / "no-such-folder" / "picks.csv").string();
  const std::string err = photolot::write_pick_list_csv(p, bad);
  EXPECT_NE(err.find(bad), std::string::npos) << err;
}
