// The import dialog driven offscreen on a sample log: what it detected, an import choice
// changed and followed by the re-import, a named profile saved and used again.
#include "import_dialog.h"

#include <gtest/gtest.h>

#include <QComboBox>
#include <QLabel>
#include <QSettings>
#include <QTableWidget>
#include <QTest>
#include <cmath>
#include <fstream>

#include "main_window.h"
#include "test_support.h"
#include "workbench_fixtures.h"

namespace photolot::workbench {
namespace {

// Waits for the dialog's trial import (it runs off the GUI thread).
bool wait_trial(ImportDialog& dialog, int timeout_ms = 20000) {
  for (int waited = 0; waited < timeout_ms; waited += 10) {
    QCoreApplication::processEvents(QEventLoop::AllEvents, 10);
    if (!dialog.trialRunning()) {
      QCoreApplication::processEvents();
      if (!dialog.trialRunning()) return true;
    }
    QTest::qWait(5);
  }
  return false;
}

class ImportDialogTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = photolot::test::scratch_dir();
    spec_ = test::small_lot_spec();
    truth_ = synth::simulate(spec_);
    // The semicolon dialect: ';' between fields, decimal commas, resistance in kΩ.
    log_ = dir_ / "bench-2.csv";
    std::ofstream(log_, std::ios::binary) << synth::to_csv(truth_.lot, synth::Dialect::semicolon);
    auto [source, error] = read_source_file(log_.string());
    ASSERT_TRUE(error.empty()) << error;
    sources_ = {source};
    QSettings().remove(QStringLiteral("importProfiles"));
  }
  std::filesystem::path dir_, log_;
  synth::LotSpec spec_;
  synth::SimulatedLot truth_;
  std::vector<SourceFile> sources_;
};

TEST_F(ImportDialogTest, ShowsTheDetectedDelimiterDecimalMarkColumnsAndUnits) {
  ImportDialog dialog(sources_, ImportOptions{});
  dialog.show();
  ASSERT_TRUE(wait_trial(dialog));
  const FileLayout& layout = dialog.layout();
  EXPECT_EQ(layout.delimiter, ';');
  EXPECT_EQ(layout.decimal, ',');
  ASSERT_EQ(layout.columns.size(), 4u);
  EXPECT_EQ(layout.columns[2].role, ColumnRole::ohm);
  EXPECT_EQ(layout.columns[2].unit, "kohm");
  // The same, as the person importing reads it.
  const QString detected = dialog.detectedLabel()->text();
  EXPECT_TRUE(detected.contains(QStringLiteral("delimiter semicolon"))) << detected.toStdString();
  EXPECT_TRUE(detected.contains(QStringLiteral("decimal mark comma"))) << detected.toStdString();
  EXPECT_TRUE(detected.contains(QStringLiteral("resistance (kohm)"))) << detected.toStdString();
  EXPECT_TRUE(detected.contains(QStringLiteral("illuminance (lx)"))) << detected.toStdString();
  // The preview's first row is the log's first data row, split at the semicolons.
  ASSERT_GE(dialog.previewTable()->rowCount(), 1);
  EXPECT_EQ(dialog.previewTable()->columnCount(), 4);
  EXPECT_EQ(dialog.previewTable()->item(0, 0)->text().toStdString(), truth_.lot.units[0].id);
  // The trial import counts every unit of the log.
  EXPECT_TRUE(dialog.summaryLabel()->text().startsWith(
      QStringLiteral("%1 units").arg(truth_.lot.units.size())))
      << dialog.summaryLabel()->text().toStdString();
}

TEST_F(ImportDialogTest, AChangedResistanceUnitIsWhatTheReimportUses) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  const double r10_kohm_read = window.session()->lotFit()->units[0].r10_ohm;
  // Read as kΩ the fit recovers the simulated R10 (0.5 % noise: within 2 %).
  EXPECT_NEAR(r10_kohm_read / truth_.truth[0].r10_ohm, 1.0, 0.02);

  ImportDialog dialog(window.session()->sources(), window.session()->importOptions());
  ASSERT_TRUE(wait_trial(dialog));
  const int ohm = dialog.ohmUnitBox()->findData(QStringLiteral("ohm"));
  ASSERT_GE(ohm, 0);
  dialog.ohmUnitBox()->setCurrentIndex(ohm);
  ASSERT_TRUE(wait_trial(dialog));
  EXPECT_EQ(dialog.options().ohm_unit, "ohm");
  EXPECT_EQ(dialog.layout().columns[2].unit, "ohm");
  window.setImportOptions(dialog.options());
  ASSERT_TRUE(test::wait_idle(*window.session()));
  // The same numbers read as ohm instead of kΩ: 1 kΩ = 10^3 Ω (SI prefix kilo).
  EXPECT_NEAR(window.session()->lotFit()->units[0].r10_ohm * 1e3 / r10_kohm_read, 1.0, 1e-6);
}

TEST_F(ImportDialogTest, AnotherResistanceColumnIsWhatTheReimportUses) {
  ImportDialog dialog(sources_, ImportOptions{});
  ASSERT_TRUE(wait_trial(dialog));
  // Point the resistance at the temperature column (column 4), its unit stated as kΩ: the
  // readings are then the bench temperature read as kΩ, and the import follows it.
  const int fourth = dialog.ohmColumnBox()->findData(QStringLiteral("4"));
  ASSERT_GE(fourth, 0);
  dialog.ohmColumnBox()->setCurrentIndex(fourth);
  dialog.ohmUnitBox()->setCurrentIndex(dialog.ohmUnitBox()->findData(QStringLiteral("kohm")));
  ASSERT_TRUE(wait_trial(dialog));
  EXPECT_EQ(dialog.options().ohm_column, "4");
  EXPECT_EQ(dialog.layout().columns[3].role, ColumnRole::ohm);
  const ImportResult result = run_import(sources_, dialog.options());
  ASSERT_FALSE(result.lot.units.empty());
  const Reading& r = result.lot.units[0].readings[0];
  // synth.h: the bench temperature is 25 degC with no spread; as kΩ, 25 x 10^3 Ω (SI kilo).
  EXPECT_NEAR(r.ohm, 25e3, 1.0);
}

TEST_F(ImportDialogTest, ANamedProfileIsSavedAndUsedAgain) {
  {
    ImportDialog dialog(sources_, ImportOptions{});
    ASSERT_TRUE(wait_trial(dialog));
    dialog.ohmUnitBox()->setCurrentIndex(dialog.ohmUnitBox()->findData(QStringLiteral("Mohm")));
    dialog.delimiterBox()->setCurrentIndex(dialog.delimiterBox()->findData(QStringLiteral(";")));
    ASSERT_TRUE(wait_trial(dialog));
    dialog.saveProfileAs(QStringLiteral("bench 2 semicolon"));
  }
  // A new dialog, as for the next log from that bench: the profile is listed and restores
  // the choices.
  ImportDialog again(sources_, ImportOptions{});
  ASSERT_TRUE(wait_trial(again));
  EXPECT_EQ(again.options().ohm_unit, "");
  EXPECT_GE(again.profileBox()->findText(QStringLiteral("bench 2 semicolon")), 1);
  ASSERT_TRUE(again.chooseProfile(QStringLiteral("bench 2 semicolon")));
  ASSERT_TRUE(wait_trial(again));
  EXPECT_EQ(again.options().ohm_unit, "Mohm");
  EXPECT_EQ(again.options().delimiter, ';');
  EXPECT_EQ(again.layout().columns[2].unit, "Mohm");
  EXPECT_FALSE(again.chooseProfile(QStringLiteral("no such profile")));
}

}  // namespace
}  // namespace photolot::workbench
