// The window driven offscreen: open a lot, the table against the lot, selection against the
// plotted graphs, an import choice, a workspace saved and opened again.
#include "main_window.h"

#include <QMessageBox>
#include <QTableView>
#include <QTabWidget>
#include <QTest>

#include <gtest/gtest.h>

#include <qcustomplot.h>

#include <cctype>
#include <cstdio>
#include <fstream>

#include "curves_view.h"
#include "spread_view.h"
#include "test_support.h"
#include "unit_table_model.h"
#include "workbench_fixtures.h"

namespace photolot::workbench {
namespace {

// Every cell of the table, in lot order, as shown.
std::vector<std::vector<QString>> table_text(const UnitTableModel& model) {
  std::vector<std::vector<QString>> rows;
  for (int r = 0; r < model.rowCount(); ++r) {
    std::vector<QString> row;
    for (int c = 0; c < model.columnCount(); ++c) row.push_back(model.index(r, c).data().toString());
    rows.push_back(row);
  }
  return rows;
}

// The PDF's text as poppler's pdftotext reads it (poppler-utils), spaces collapsed: what a
// person reading the page sees, not what our writer meant to put there.
std::string pdf_text(const std::filesystem::path& pdf) {
  const std::string command = "pdftotext -layout '" + pdf.string() + "' - 2>/dev/null";
  std::string text;
  if (FILE* pipe = popen(command.c_str(), "r")) {
    char buffer[4096];
    std::size_t n;
    while ((n = std::fread(buffer, 1, sizeof buffer, pipe)) > 0) text.append(buffer, n);
    pclose(pipe);
  }
  std::string flat;
  for (char c : text) {
    const bool space = c == ' ' || c == '\n' || c == '\t' || c == '\f' || c == '\r';
    if (space && (flat.empty() || flat.back() == ' ')) continue;
    flat.push_back(space ? ' ' : c);
  }
  return flat;
}

class MainWindowTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = photolot::test::scratch_dir();
    log_ = dir_ / "reel-07.csv";
    test::write_log(log_, test::small_lot_spec());
  }
  std::filesystem::path dir_, log_;
};

TEST_F(MainWindowTest, OpensALogAndListsEveryUnitOfTheLot) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const auto truth = synth::simulate(test::small_lot_spec());
  const UnitTableModel* model = window.unitModel();
  ASSERT_EQ(model->rowCount(), static_cast<int>(truth.lot.units.size()));
  for (int r = 0; r < model->rowCount(); ++r) {
    EXPECT_EQ(model->index(r, UnitTableModel::kId).data().toString().toStdString(),
              truth.lot.units[static_cast<std::size_t>(r)].id);
    // Ten illuminance levels per unit in the generated log (synth.h's default levels).
    EXPECT_EQ(model->index(r, UnitTableModel::kPoints).data().toInt(), 10);
  }
  EXPECT_TRUE(window.hasUnsavedChanges());
}

TEST_F(MainWindowTest, PlotsTheSelectedUnitsAndNothingElse) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  window.selectUnits({1, 4});
  EXPECT_EQ(window.selectedUnits(), (std::vector<int>{1, 4}));
  const CurvesView* curves = window.curvesView();
  ASSERT_TRUE(curves->detailed());
  const Lot* lot = window.session()->lot();
  int lines = 0, readings = 0;
  for (int i = 0; i < curves->plot()->graphCount(); ++i) {
    const QCPGraph* g = curves->plot()->graph(i);
    for (int u : {1, 4}) {
      const QString id = QString::fromStdString(lot->units[static_cast<std::size_t>(u)].id);
      if (g->name() == id) {
        ++lines;
        EXPECT_GE(g->dataCount(), 2);
      }
      if (g->name() == id + QStringLiteral(" readings")) {
        ++readings;
        EXPECT_EQ(g->dataCount(), 10);
      }
    }
  }
  EXPECT_EQ(lines, 2);
  EXPECT_EQ(readings, 2);
  // Clicking a dot in the spread selects its unit: the same path the click takes.
  emit window.spreadView()->unitClicked(3, false);
  EXPECT_EQ(window.selectedUnits(), std::vector<int>{3});
}

TEST_F(MainWindowTest, SelectingTheWholeLotDrawsEveryUnitTogether) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  window.unitTable()->selectAll();
  QCoreApplication::processEvents();
  QTest::qWait(60);
  const CurvesView* curves = window.curvesView();
  EXPECT_FALSE(curves->detailed());
  EXPECT_EQ(curves->series().size(), 12u);
  int points = 0;
  for (int i = 0; i < curves->plot()->graphCount(); ++i) {
    if (curves->plot()->graph(i)->name() == QStringLiteral("readings")) {
      points = curves->plot()->graph(i)->dataCount();
    }
  }
  EXPECT_EQ(points, 120);
}

TEST_F(MainWindowTest, AnImportChoiceChangesWhatTheTableShows) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const double before = window.session()->lotFit()->units[0].r10_ohm;
  ImportOptions options;
  options.ohm_unit = "Mohm";  // 1 Mohm = 10^6 ohm (SI prefix M)
  window.setImportOptions(options);
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const double after = window.session()->lotFit()->units[0].r10_ohm;
  EXPECT_NEAR(after / before, 1e6, 1e-3);
  EXPECT_TRUE(window.unitModel()->index(0, UnitTableModel::kR10).data().toString().endsWith(
      QStringLiteral("GΩ")));
}

TEST_F(MainWindowTest, SavedWorkspaceOpensToTheSameTableWithoutRefitting) {
  const QString path = QString::fromStdString((dir_ / "lot.photolot").string());
  std::vector<std::vector<QString>> saved;
  {
    MainWindow window;
    window.openPaths({QString::fromStdString(log_.string())});
    ASSERT_TRUE(test::wait_idle(*window.session()));
    window.selectUnits({2, 5});
    window.tabs()->setCurrentIndex(1);
    ASSERT_TRUE(window.saveWorkspaceTo(path));
    EXPECT_FALSE(window.hasUnsavedChanges());
    saved = table_text(*window.unitModel());
  }
  MainWindow again;
  again.setSourceAnswerForTests(QDialog::Accepted);  // the list of files it reads
  ASSERT_TRUE(again.openWorkspace(path));
  ASSERT_TRUE(test::wait_idle(*again.session()));
  EXPECT_EQ(table_text(*again.unitModel()), saved);
  EXPECT_EQ(again.session()->fitRuns(), 0);  // the saved results were taken over
  EXPECT_EQ(again.selectedUnits(), (std::vector<int>{2, 5}));
  EXPECT_EQ(again.tabs()->currentIndex(), 1);
  EXPECT_FALSE(again.hasUnsavedChanges());
}

TEST_F(MainWindowTest, AChangedLogIsReloadedWhenTheWorkspaceOpens) {
  const QString path = QString::fromStdString((dir_ / "lot.photolot").string());
  {
    MainWindow window;
    window.openPaths({QString::fromStdString(log_.string())});
    ASSERT_TRUE(test::wait_idle(*window.session()));
    ASSERT_TRUE(window.saveWorkspaceTo(path));
  }
  auto bigger = test::small_lot_spec();
  bigger.units = 15;
  test::write_log(log_, bigger);
  MainWindow again;
  again.setSourceAnswerForTests(QDialog::Accepted);
  again.setPromptAnswerForTests(QMessageBox::Ok);  // "Reload and refit"
  ASSERT_TRUE(again.openWorkspace(path));
  ASSERT_TRUE(test::wait_idle(*again.session()));
  EXPECT_EQ(again.unitModel()->rowCount(), 15);
  EXPECT_EQ(again.session()->fitRuns(), 1);
  EXPECT_TRUE(again.hasUnsavedChanges());
}

TEST(MainWindowSampleLot, OpensTheBundledSampleLot) {
  const auto path = photolot::test::source_path("sample-data/demo-lot.csv");
  if (!std::filesystem::exists(path)) GTEST_SKIP() << "sample-data/demo-lot.csv has not landed";
  MainWindow window;
  window.openPaths({QString::fromStdString(path.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const Lot* lot = window.session()->lot();
  ASSERT_NE(lot, nullptr);
  EXPECT_EQ(window.unitModel()->rowCount(), static_cast<int>(lot->units.size()));
  EXPECT_GT(window.session()->lotFit()->fitted_count(), lot->units.size() / 2);
}

TEST(MainWindowSampleLot, WritesTheLotSummaryWithTheDispositionPartNumberAndPairs) {
  const auto log = photolot::test::source_path("sample-data/demo-lot.csv");
  const auto spec = photolot::test::source_path("sample-data/demo-spec.toml");
  if (!std::filesystem::exists(log)) GTEST_SKIP() << "sample-data/demo-lot.csv has not landed";
  MainWindow window;
  window.openPaths({QString::fromStdString(log.string())});
  ASSERT_TRUE(window.openSpecFile(QString::fromStdString(spec.string())));
  ASSERT_TRUE(test::wait_idle(*window.session()));
  window.findPairs();
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const auto analysis = window.session()->analysis();
  ASSERT_TRUE(analysis && analysis->acceptance);
  ASSERT_TRUE(window.session()->pairing());

  const auto pdf = photolot::test::scratch_dir() / "summary.pdf";
  const QString error = window.writeSummaryTo(QString::fromStdString(pdf.string()));
  ASSERT_TRUE(error.isEmpty()) << error.toStdString();
  const std::string text = pdf_text(pdf);
  ASSERT_FALSE(text.empty()) << "pdftotext could not read " << pdf;
  // The part number as written in the spec file, and the disposition the acceptance step
  // decided (the summary prints it in capitals, as an inspection stamp would).
  EXPECT_NE(text.find("DEMO-LDR-20K"), std::string::npos);
  std::string disposition(to_string(analysis->acceptance->disposition));
  for (char& c : disposition) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
  EXPECT_NE(text.find(disposition), std::string::npos) << disposition;
  // The first pair of the pick list, by its two unit ids.
  const auto& pairs = window.session()->pairing()->pairs;
  if (!pairs.empty()) {
    EXPECT_NE(text.find(pairs.front().a_id), std::string::npos);
    EXPECT_NE(text.find(pairs.front().b_id), std::string::npos);
  }
}

}  // namespace
}  // namespace photolot::workbench
