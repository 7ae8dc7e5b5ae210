// The workspace file: round trip, atomic write, changed-source detection.
#include "workspace.h"

#include <gtest/gtest.h>

#include <QFile>
#include <fstream>

#include "engine.h"
#include "test_support.h"

namespace photolot::workbench {
namespace {

TEST(Workspace, RoundTripsChoicesAndKeepsPathsRelativeToItsFolder) {
  const auto dir = photolot::test::scratch_dir();
  std::filesystem::create_directories(dir / "logs");
  std::ofstream(dir / "logs" / "reel.csv") << "unit,lux,ohm\nA,10,20000\n";
  Workspace w;
  const auto [source, error] = read_source_file((dir / "logs" / "reel.csv").string());
  ASSERT_TRUE(error.empty()) << error;
  w.sources.push_back({source.path, source.sha256_hex, source.content.size(), {}, false});
  w.import_options.delimiter = ';';
  w.import_options.ohm_unit = "kohm";
  w.import_options.overload_ohm = 2e7;
  w.fit_options.loss = fitting::Loss::cauchy;
  w.fit_options.meter_accuracy_pct = 0.5;
  w.view.selected_units = {"A"};
  w.view.tab = "spread";
  const QString path = QString::fromStdString((dir / "lot.photolot").string());
  ASSERT_TRUE(save_workspace(path, w).isEmpty());

  QFile file(path);
  ASSERT_TRUE(file.open(QIODevice::ReadOnly));
  const auto j = nlohmann::json::parse(file.readAll().toStdString());
  EXPECT_EQ(j["format"], "photolot-workspace");
  EXPECT_EQ(j["version"], 1);
  EXPECT_EQ(j["sources"][0]["path"], "logs/reel.csv");

  Workspace back;
  ASSERT_TRUE(load_workspace(path, back).isEmpty());
  ASSERT_EQ(back.sources.size(), 1u);
  EXPECT_EQ(std::filesystem::path(back.sources[0].path), std::filesystem::path(source.path));
  EXPECT_EQ(back.import_options.delimiter, ';');
  EXPECT_EQ(back.import_options.ohm_unit, "kohm");
  EXPECT_EQ(back.import_options.overload_ohm, 2e7);
  EXPECT_EQ(back.fit_options.loss, fitting::Loss::cauchy);
  EXPECT_EQ(back.fit_options.meter_accuracy_pct, 0.5);
  EXPECT_EQ(back.view.selected_units, std::vector<std::string>{"A"});
  EXPECT_EQ(back.view.tab, "spread");
  EXPECT_TRUE(changed_sources(back).empty());
}

TEST(Workspace, HashIsSha256OfTheBytes) {
  // FIPS 180-2, Appendix B.1: SHA-256("abc").
  EXPECT_EQ(sha256_hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
}

TEST(Workspace, NoticesAChangedOrMissingSource) {
  const auto dir = photolot::test::scratch_dir();
  std::ofstream(dir / "a.csv") << "unit,lux,ohm\nA,10,20000\n";
  std::ofstream(dir / "b.csv") << "unit,lux,ohm\nB,10,20000\n";
  Workspace w;
  for (const char* name : {"a.csv", "b.csv"}) {
    const auto [s, e] = read_source_file((dir / name).string());
    w.sources.push_back({s.path, s.sha256_hex, s.content.size(), {}, false});
  }
  std::ofstream(dir / "a.csv") << "unit,lux,ohm\nA,10,21000\n";
  std::filesystem::remove(dir / "b.csv");
  const auto changes = changed_sources(w);
  ASSERT_EQ(changes.size(), 2u);
  EXPECT_FALSE(changes[0].missing);
  EXPECT_TRUE(changes[1].missing);
}

TEST(Workspace, RefusesAnotherFormatAndNamesTheBadField) {
  Workspace w;
  EXPECT_TRUE(workspace_from_text(R"({"format": "other"})", ".", w).has_value());
  const auto wrong = workspace_from_text(
      R"({"format": "photolot-workspace", "version": 1, "fit": {"loss": "l2"}})", ".", w);
  ASSERT_TRUE(wrong.has_value());
  EXPECT_NE(wrong->find("fit.loss"), std::string::npos);
  const auto newer =
      workspace_from_text(R"({"format": "photolot-workspace", "version": 99})", ".", w);
  ASSERT_TRUE(newer.has_value());
  EXPECT_NE(newer->find("99"), std::string::npos);
}

TEST(Workspace, RefusesFitChoicesTheFitWouldRefuse) {
  // FitOptions::validate() decides; a confidence of 1.5 is no probability.
  Workspace w;
  const auto bad = workspace_from_text(
      R"({"format": "photolot-workspace", "version": 1, "fit": {"confidence": 1.5}})", ".", w);
  ASSERT_TRUE(bad.has_value());
  EXPECT_NE(bad->find("confidence"), std::string::npos) << *bad;
}

TEST(Workspace, ABrokenFileIsRefusedAtItsLineAndColumn) {
  const auto dir = photolot::test::scratch_dir();
  std::ofstream(dir / "cut.photolot")
      << "{\n  \"format\": \"photolot-workspace\",\n  \"version\": 1,\n  \"sources\": [tru";
  Workspace w;
  const QString error = load_workspace(QString::fromStdString((dir / "cut.photolot").string()), w);
  EXPECT_TRUE(error.contains(QStringLiteral("cut.photolot:4:"))) << error.toStdString();
}

TEST(Workspace, SaveLeavesNoTemporaryFileAndReplacesTheOldOne) {
  const auto dir = photolot::test::scratch_dir();
  const QString path = QString::fromStdString((dir / "w.photolot").string());
  Workspace w;
  ASSERT_TRUE(save_workspace(path, w).isEmpty());
  w.view.tab = "pairs";
  ASSERT_TRUE(save_workspace(path, w).isEmpty());
  int files = 0;
  for (const auto& e : std::filesystem::directory_iterator(dir)) files += e.is_regular_file();
  EXPECT_EQ(files, 1);
  Workspace back;
  ASSERT_TRUE(load_workspace(path, back).isEmpty());
  EXPECT_EQ(back.view.tab, "pairs");
}

TEST(Workspace, KeepsTheCurveModelChoicesInItsModelMember) {
  Workspace w;
  w.model.model.model = fitting::ModelChoice::dark_conductance;
  w.model.model.temperature = fitting::TemperatureMode::off;
  const std::string text = workspace_to_text(w, ".");
  EXPECT_NE(text.find("\"model\""), std::string::npos) << text;
  Workspace back;
  ASSERT_FALSE(workspace_from_text(text, ".", back).has_value());
  EXPECT_EQ(back.model.model.model, fitting::ModelChoice::dark_conductance);
  EXPECT_EQ(back.model.model.temperature, fitting::TemperatureMode::off);
  // A "model" member that is not an object is refused with its name.
  const auto bad = workspace_from_text(
      R"({"format": "photolot-workspace", "version": 1, "model": 3})", ".", back);
  ASSERT_TRUE(bad.has_value());
  EXPECT_NE(bad->find("model"), std::string::npos) << *bad;
}

}  // namespace
}  // namespace photolot::workbench
