// The window driven offscreen: open a lot, the table against the lot, selection against the
// plotted graphs, an import choice, a workspace saved and opened again.
#include "main_window.h"

#include <QCheckBox>
#include <QLabel>
#include <QMessageBox>
#include <QTableView>
#include <QTabWidget>
#include <QTest>

#include <gtest/gtest.h>

#include <qcustomplot.h>

#include <cctype>
#include <cstdio>
#include <fstream>

#include "acceptance_view.h"
#include "curves_view.h"
#include "pairs_view.h"
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

// A spec file for the small lot (R10 median 20 kohm, ln R10 sd 0.15): a window narrow enough
// that some of the twelve units fall outside it. Our own spec format (docs/spec-format.md).
std::filesystem::path write_spec(const std::filesystem::path& dir, const std::string& limits = {},
                                 const std::string& tables = {}) {
  const auto path = dir / "narrow-spec.toml";
  std::ofstream(path) << "[part]\nnumber = \"TEST-20K\"\n\n[limits]\nr10_min_ohm = \"18k\"\n"
                         "r10_max_ohm = \"22k\"\n"
                      << limits << "\n[inspection]\nmode = \"100%\"\n" << tables;
  return path;
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

TEST_F(MainWindowTest, StatusLineSaysHowTheRunEndedNotThatItIsStillFitting) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  // The last progress poll lands just before the session goes idle; it must not stay.
  const auto settled = [&] {
    for (int i = 0; i < 5; ++i) QCoreApplication::processEvents(QEventLoop::AllEvents, 20);
    return window.statusText();
  };
  QString text = settled();
  EXPECT_FALSE(text.contains(QStringLiteral("Fitting"))) << text.toStdString();
  EXPECT_FALSE(text.contains(QStringLiteral("Working"))) << text.toStdString();
  EXPECT_TRUE(text.startsWith(QStringLiteral("12 of 12 units fitted"))) << text.toStdString();
  // A spec applied afterwards runs the acceptance step only: the line ends the same way.
  ASSERT_TRUE(window.openSpecFile(QString::fromStdString(write_spec(dir_).string())));
  ASSERT_TRUE(test::wait_idle(*window.session()));
  text = settled();
  EXPECT_FALSE(text.contains(QStringLiteral("…"))) << text.toStdString();
  EXPECT_TRUE(text.startsWith(QStringLiteral("12 of 12 units fitted"))) << text.toStdString();
}

TEST_F(MainWindowTest, PairsOnlyConformingUnitsWhenASpecIsLoadedUnlessAskedForAll) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(window.openSpecFile(QString::fromStdString(write_spec(dir_).string())));
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const auto analysis = window.session()->analysis();
  ASSERT_TRUE(analysis && analysis->verdicts);
  std::size_t conforming = 0;
  for (const auto& v : *analysis->verdicts) conforming += v.verdict == Verdict::conforming;
  ASSERT_GT(conforming, 1u);
  ASSERT_LT(conforming, 12u);  // the narrow window rejects some units

  // The choice is visible and on by default only with a spec: conforming units only.
  QCheckBox* all = window.pairsView()->allFittedBox();
  EXPECT_TRUE(all->isEnabled());
  EXPECT_FALSE(all->isChecked());
  window.findPairs();
  ASSERT_TRUE(test::wait_idle(*window.session()));
  auto pairing = window.session()->pairing();
  ASSERT_TRUE(pairing);
  EXPECT_EQ(window.session()->pairingEligibility(), PairEligibility::conforming);
  EXPECT_EQ(pairing->counts.eligible, conforming);
  for (const auto& p : pairing->pairs) {
    EXPECT_EQ((*analysis->verdicts)[p.a].verdict, Verdict::conforming) << p.a_id;
    EXPECT_EQ((*analysis->verdicts)[p.b].verdict, Verdict::conforming) << p.b_id;
  }

  // Ticking the box pairs every fitted unit again, at once.
  all->setChecked(true);
  ASSERT_TRUE(test::wait_idle(*window.session()));
  pairing = window.session()->pairing();
  ASSERT_TRUE(pairing);
  EXPECT_EQ(window.session()->pairingEligibility(), PairEligibility::fitted);
  EXPECT_EQ(pairing->counts.eligible, 12u);
}

TEST_F(MainWindowTest, WithoutASpecEveryFittedUnitIsPaired) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  EXPECT_FALSE(window.pairsView()->allFittedBox()->isEnabled());
  window.findPairs();
  ASSERT_TRUE(test::wait_idle(*window.session()));
  ASSERT_TRUE(window.session()->pairing());
  EXPECT_EQ(window.session()->pairing()->counts.eligible, 12u);
  EXPECT_EQ(window.session()->pairingEligibility(), PairEligibility::fitted);
}

TEST_F(MainWindowTest, CurvesComeFromTheSeriesBuiltWithTheFit) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const auto all = window.session()->curveSeries();
  ASSERT_TRUE(all);
  ASSERT_EQ(all->size(), 12u);
  window.selectUnits({3, 7});
  const auto& shown = window.curvesView()->series();
  ASSERT_EQ(shown.size(), 2u);
  // Picked from the worker's series, not built again on the GUI thread.
  EXPECT_EQ(shown[0], &(*all)[3]);
  EXPECT_EQ(shown[1], &(*all)[7]);
}

TEST_F(MainWindowTest, SpreadViewRebuildsOnceWhenShownNotOncePerChange) {
  MainWindow window;
  window.show();
  SpreadView* spread = window.spreadView();
  window.tabs()->setCurrentWidget(window.curvesView());
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(window.openSpecFile(QString::fromStdString(write_spec(dir_).string())));
  ASSERT_TRUE(test::wait_idle(*window.session()));
  QTest::qWait(20);
  // Hidden: the fit, the limits and the tolerance intervals are only noted.
  const int hidden = spread->rebuilds();
  EXPECT_TRUE(spread->pending());
  window.tabs()->setCurrentWidget(spread);
  QTest::qWait(20);
  EXPECT_EQ(spread->rebuilds(), hidden + 1);
  EXPECT_FALSE(spread->pending());
  // Shown: a new spec changes the limits and the intervals; one rebuild for them all.
  ASSERT_TRUE(window.openSpecFile(QString::fromStdString(
      write_spec(dir_, "gamma_min = 0.70\ngamma_max = 0.80\n").string())));
  ASSERT_TRUE(test::wait_idle(*window.session()));
  QTest::qWait(20);
  EXPECT_EQ(spread->rebuilds(), hidden + 2);
  EXPECT_EQ(spread->scatterUnits().size(), 12u);
}

// Issue "beyond the straight line": a lot with a dark conductance in parallel, fitted with the
// model chosen per unit.
class DarkConductanceLot : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = photolot::test::scratch_dir();
    spec_ = test::small_lot_spec();
    // 1/R = G_dark + G10 (E/10 lx)^gamma. With R10 = 20 kohm, G10 = 50 uS; G_dark = 2 uS
    // (500 kohm) is 23 % of the photoconductance at 1 lx: the curve bends at the dark end.
    spec_.dark_conductance_s = 2e-6;
    spec_.dark_readings = true;
    spec_.dark_ohm_median = 1 / 2e-6;
    truth_ = synth::simulate(spec_);
    log_ = dir_ / "dark.csv";
    test::write_log(log_, spec_);
  }
  std::filesystem::path dir_, log_;
  synth::LotSpec spec_;
  synth::SimulatedLot truth_;
};

TEST_F(DarkConductanceLot, TableShowsEachUnitsModelAndDarkConductance) {
  MainWindow window;
  FitHandling choose;
  choose.model.model = fitting::ModelChoice::choose;
  window.setFitHandling(choose);
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const auto fit = window.session()->lotFit();
  ASSERT_TRUE(fit);
  const UnitTableModel* model = window.unitModel();
  int dark = 0;
  for (int r = 0; r < model->rowCount(); ++r) {
    const UnitFit& u = fit->units[static_cast<std::size_t>(r)];
    ASSERT_TRUE(u.ok()) << u.message;
    const QString shown = model->index(r, UnitTableModel::kModel).data().toString();
    const QString g = model->index(r, UnitTableModel::kDarkConductance).data().toString();
    if (u.curve.model == ModelKind::dark_conductance) {
      ++dark;
      EXPECT_EQ(shown, QStringLiteral("dark conductance"));
      EXPECT_TRUE(g.endsWith(QStringLiteral("µS"))) << g.toStdString();
      // Recovered within 25 % of the simulated G_dark (0.5 % reading noise).
      EXPECT_NEAR(u.dark_conductance_s / truth_.truth[static_cast<std::size_t>(r)].dark_conductance_s,
                  1.0, 0.25);
    } else {
      EXPECT_EQ(shown, QStringLiteral("power law"));
      EXPECT_EQ(g, QStringLiteral("—"));
    }
    // The evidence for the choice is a hover away.
    EXPECT_TRUE(model->index(r, UnitTableModel::kModel).data(Qt::ToolTipRole).toString().contains(
        QStringLiteral("AICc")));
  }
  // Saturating data picks the dark-conductance model (issue 6's model-choice check).
  EXPECT_GE(dark, 10);
}

TEST_F(DarkConductanceLot, CurvesViewDrawsTheBentCurveAsFittedWithItsBand) {
  MainWindow window;
  FitHandling dark;
  dark.model.model = fitting::ModelChoice::dark_conductance;
  window.setFitHandling(dark);
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  window.selectUnits({0});
  const UnitFit& u = window.session()->lotFit()->units[0];
  ASSERT_TRUE(u.ok());
  ASSERT_EQ(u.curve.model, ModelKind::dark_conductance);
  const QString id = QString::fromStdString(u.id);
  const QCustomPlot* plot = window.curvesView()->plot();
  const QCPGraph* line = nullptr;
  int bands = 0;
  for (int i = 0; i < plot->graphCount(); ++i) {
    if (plot->graph(i)->name() == id) line = plot->graph(i);
    if (plot->graph(i)->name() == id + QStringLiteral(" band")) {
      ++bands;
      EXPECT_GE(plot->graph(i)->dataCount(), 8);
    }
  }
  ASSERT_NE(line, nullptr);
  EXPECT_EQ(bands, 2);
  ASSERT_GE(line->dataCount(), 8);
  // Every drawn point on the model as issue 6 states it: 1/R = G_dark + G10 (E/10 lx)^gamma,
  // params [ln G10, gamma, G_dark].
  const double g10 = std::exp(u.curve.params[0]), gamma = u.curve.params[1];
  const double g_dark = u.curve.params[2];
  auto slope = [&](int a, int b) {
    const auto pa = line->data()->at(a), pb = line->data()->at(b);
    return -std::log(pb->value / pa->value) / std::log(pb->key / pa->key);
  };
  for (int i = 0; i < line->dataCount(); ++i) {
    const auto p = line->data()->at(i);
    const double r = 1 / (g_dark + g10 * std::pow(p->key / 10, gamma));
    EXPECT_NEAR(p->value / r, 1.0, 1e-9) << "at " << p->key << " lx";
  }
  // Not a straight line: the log-log slope at the dark end is well below that at the bright end.
  const int n = line->dataCount();
  EXPECT_LT(slope(0, 1), slope(n - 2, n - 1) - 0.05);
}

TEST_F(MainWindowTest, AcceptanceViewSaysHowTemperatureWasHandled) {
  // The small lot's readings are all at 25 degC: the coefficient cannot be identified.
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  QString text = window.acceptanceView()->fitHandlingLabel()->text();
  EXPECT_TRUE(text.contains(QStringLiteral("not identifiable"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("no coefficient applied"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("Bench profile</b>: none"))) << text.toStdString();
  // A spec with a coefficient: it is applied, and the fit says so.
  ASSERT_TRUE(window.openSpecFile(QString::fromStdString(
      write_spec(dir_, {}, "\n[temperature]\ncoefficient_pct_per_c = -0.3\n").string())));
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const auto fit = window.session()->lotFit();
  EXPECT_EQ(fit->temperature.source, "spec");
  EXPECT_DOUBLE_EQ(fit->temperature.coefficient_pct_per_c, -0.3);
  text = window.acceptanceView()->fitHandlingLabel()->text();
  EXPECT_TRUE(text.contains(QStringLiteral("applied the spec's coefficient, -0.300 %/°C")))
      << text.toStdString();
  EXPECT_TRUE(window.statusText().contains(QStringLiteral("spec's -0.300 %/°C applied")))
      << window.statusText().toStdString();
}

TEST(MainWindowTemperature, ShowsTheFittedLotCoefficientAndEachUnitsOwn) {
  // Readings spread over 25 +- 10 degC with a true coefficient of -0.5 %/degC at 10 lx.
  auto spec = test::small_lot_spec();
  spec.temp_span_c = 20;
  spec.temp_coeff_pct_per_c = -0.5;
  const auto log = photolot::test::scratch_dir() / "warm.csv";
  test::write_log(log, spec);
  MainWindow window;
  window.openPaths({QString::fromStdString(log.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const auto fit = window.session()->lotFit();
  ASSERT_TRUE(fit->temperature.identifiable) << fit->temperature.message;
  EXPECT_NEAR(fit->temperature.coefficient_pct_per_c, -0.5, 0.05);
  const QString text = window.acceptanceView()->fitHandlingLabel()->text();
  EXPECT_TRUE(text.contains(QStringLiteral("identifiable (the readings span"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("stated at 25 °C"))) << text.toStdString();
  const UnitTableModel* model = window.unitModel();
  for (int r = 0; r < model->rowCount(); ++r) {
    const double own = fit->units[static_cast<std::size_t>(r)].temp_coeff_pct_per_c;
    const QString shown = model->index(r, UnitTableModel::kTempCoeff).data().toString();
    if (std::isfinite(own)) {
      EXPECT_TRUE(shown.endsWith(QStringLiteral("%/°C"))) << shown.toStdString();
    } else {
      EXPECT_EQ(shown, QStringLiteral("—"));
    }
  }
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
