// Crash-safe autosave (autosave.h): unsaved work gets a recovery copy in the app-data folder
// (here a scratch folder named by PHOTOLOT_RECOVERY_DIR); a run that did not end cleanly leaves
// it and the next start offers it back; a clean save or exit leaves none.
#include "autosave.h"

#include <gtest/gtest.h>

#include <QCoreApplication>
#include <QDialog>
#include <QElapsedTimer>
#include <QFileInfo>
#include <QMessageBox>
#include <QTabWidget>
#include <filesystem>
#include <memory>

#include "main_window.h"
#include "photolot/workspace_doc.h"
#include "test_support.h"
#include "unit_table_model.h"
#include "workbench_fixtures.h"

namespace photolot::workbench {
namespace {

namespace fs = std::filesystem;

// Each test its own recovery folder, set before any window exists.
class AutosaveTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = photolot::test::scratch_dir();
    recovery_ = dir_ / "recovery";
    old_ = qgetenv("PHOTOLOT_RECOVERY_DIR");
    qputenv("PHOTOLOT_RECOVERY_DIR", QByteArray::fromStdString(recovery_.string()));
    log_ = dir_ / "reel-07.csv";
    test::write_log(log_, test::small_lot_spec());
  }
  void TearDown() override { qputenv("PHOTOLOT_RECOVERY_DIR", old_); }
  int files_in_recovery() const {
    int n = 0;
    if (fs::is_directory(recovery_))
      for (const auto& e : fs::directory_iterator(recovery_)) n += e.is_regular_file();
    return n;
  }
  fs::path dir_, recovery_, log_;
  QByteArray old_;
};

TEST_F(AutosaveTest, ACopyLeftByACrashedRunIsOfferedAndRestoresTheState) {
  std::vector<std::vector<QString>> ids;
  {
    // The "crashed" run: unsaved work, a copy written, and the window destroyed without the
    // close that a clean exit goes through (the copy is not removed; the lock is released, as
    // the system does for a killed process).
    auto crashed = std::make_unique<MainWindow>();
    crashed->openPaths({QString::fromStdString(log_.string())});
    ASSERT_TRUE(test::wait_idle(*crashed->session()));
    crashed->selectUnits({1, 3});
    crashed->tabs()->setCurrentIndex(2);
    ASSERT_TRUE(crashed->hasUnsavedChanges());
    ASSERT_TRUE(crashed->autosave()->saveNow().isEmpty())
        << crashed->autosave()->lastError().toStdString();
    ASSERT_TRUE(crashed->autosave()->hasCopy());
    // The copy is a workspace document that core's reader takes.
    const auto read = workspace::load(crashed->autosave()->copyPath().toStdString());
    ASSERT_TRUE(read.ok()) << read.error->message;
    ASSERT_EQ(read.doc.sources.size(), 1u);
    EXPECT_EQ(read.doc.sources[0].path, log_);
  }
  ASSERT_EQ(Autosave::orphans().size(), 1u);
  MainWindow next;
  next.setRecoveryAnswerForTests(QMessageBox::Yes);
  next.setSourceAnswerForTests(QDialog::Accepted);
  ASSERT_TRUE(next.offerRecovery());
  ASSERT_TRUE(test::wait_idle(*next.session()));
  EXPECT_EQ(next.unitModel()->rowCount(), test::small_lot_spec().units);
  EXPECT_EQ(next.selectedUnits(), (std::vector<int>{1, 3}));
  EXPECT_EQ(next.tabs()->currentIndex(), 2);
  EXPECT_TRUE(next.hasUnsavedChanges());  // recovered work is still unsaved
  EXPECT_TRUE(next.workspacePath().isEmpty());
  // The old copy is gone; this run keeps its own.
  EXPECT_TRUE(Autosave::orphans().empty());
  EXPECT_TRUE(next.autosave()->hasCopy());
}

TEST_F(AutosaveTest, RecoveredChangesToASavedWorkspaceBelongToIt) {
  const QString ws = QString::fromStdString((dir_ / "lot.photolot").string());
  {
    auto crashed = std::make_unique<MainWindow>();
    crashed->openPaths({QString::fromStdString(log_.string())});
    ASSERT_TRUE(test::wait_idle(*crashed->session()));
    ASSERT_TRUE(crashed->saveWorkspaceTo(ws));
    EXPECT_FALSE(crashed->autosave()->hasCopy());  // saved: no copy needed
    crashed->selectUnits({4});
    crashed->tabs()->setCurrentIndex(1);
    crashed->session()->setFitOptions([] {
      fitting::FitOptions o;
      o.loss = fitting::Loss::cauchy;
      return o;
    }());
    ASSERT_TRUE(crashed->hasUnsavedChanges());
    ASSERT_TRUE(crashed->autosave()->saveNow().isEmpty());
  }
  MainWindow next;
  next.setRecoveryAnswerForTests(QMessageBox::Yes);
  next.setSourceAnswerForTests(QDialog::Accepted);
  ASSERT_TRUE(next.offerRecovery());
  ASSERT_TRUE(test::wait_idle(*next.session()));
  EXPECT_EQ(next.workspacePath(), QFileInfo(ws).absoluteFilePath());
  EXPECT_EQ(next.session()->fitOptions().loss, fitting::Loss::cauchy);
  EXPECT_EQ(next.tabs()->currentIndex(), 1);
  EXPECT_TRUE(next.hasUnsavedChanges());
}

TEST_F(AutosaveTest, ACleanExitLeavesNoCopy) {
  {
    MainWindow window;
    window.openPaths({QString::fromStdString(log_.string())});
    ASSERT_TRUE(test::wait_idle(*window.session()));
    ASSERT_TRUE(window.autosave()->saveNow().isEmpty());
    ASSERT_TRUE(window.autosave()->hasCopy());
    window.setPromptAnswerForTests(QMessageBox::Discard);  // "close without saving"
    ASSERT_TRUE(window.close());
  }
  EXPECT_EQ(files_in_recovery(), 0);
  EXPECT_TRUE(Autosave::orphans().empty());
}

TEST_F(AutosaveTest, ASaveRemovesTheCopy) {
  MainWindow window;
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  ASSERT_TRUE(window.autosave()->saveNow().isEmpty());
  ASSERT_TRUE(window.saveWorkspaceTo(QString::fromStdString((dir_ / "lot.photolot").string())));
  EXPECT_FALSE(window.autosave()->hasCopy());
  EXPECT_EQ(files_in_recovery(), 0);
}

TEST_F(AutosaveTest, TheCopyOfARunStillGoingIsNotOffered) {
  MainWindow running;
  running.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*running.session()));
  ASSERT_TRUE(running.autosave()->saveNow().isEmpty());
  MainWindow second;
  second.setRecoveryAnswerForTests(QMessageBox::Yes);
  EXPECT_FALSE(second.offerRecovery());
  EXPECT_TRUE(running.autosave()->hasCopy());
}

TEST_F(AutosaveTest, DiscardingTheOfferRemovesTheCopy) {
  {
    auto crashed = std::make_unique<MainWindow>();
    crashed->openPaths({QString::fromStdString(log_.string())});
    ASSERT_TRUE(test::wait_idle(*crashed->session()));
    ASSERT_TRUE(crashed->autosave()->saveNow().isEmpty());
  }
  MainWindow next;
  next.setRecoveryAnswerForTests(QMessageBox::Discard);
  EXPECT_FALSE(next.offerRecovery());
  EXPECT_EQ(files_in_recovery(), 0);
  EXPECT_EQ(next.session()->lot(), nullptr);
}

TEST_F(AutosaveTest, WritesACopyWithinTheIntervalOnceThereIsUnsavedWork) {
  MainWindow window;
  window.autosave()->setIntervalMs(20);
  window.openPaths({QString::fromStdString(log_.string())});
  ASSERT_TRUE(test::wait_idle(*window.session()));
  QElapsedTimer timer;
  timer.start();
  while (!window.autosave()->hasCopy() && timer.elapsed() < 10000)
    QCoreApplication::processEvents(QEventLoop::AllEvents, 20);
  EXPECT_TRUE(window.autosave()->hasCopy());
}

}  // namespace
}  // namespace photolot::workbench
