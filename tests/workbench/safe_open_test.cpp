// Safe open (source_check_dialog.h, MainWindow::openWorkspace): a workspace's bench logs are
// resolved against its folder and shown before any is read; those outside the folder are
// marked; Cancel reads nothing; hostile paths (escaping the folder, absolute, devices, pipes,
// too long, control characters) get a clear message and are never read.
#include <gtest/gtest.h>
#include <sys/stat.h>

#include <QApplication>
#include <QDialog>
#include <QLabel>
#include <QPushButton>
#include <QTimer>
#include <QTreeWidget>
#include <filesystem>
#include <fstream>
#include <functional>
#include <string>

#include "engine.h"
#include "main_window.h"
#include "source_check_dialog.h"
#include "test_support.h"
#include "unit_table_model.h"
#include "workbench_fixtures.h"

namespace photolot::workbench {
namespace {

namespace fs = std::filesystem;

// A workspace text naming `paths` as written, with no hash (a hand-made workspace).
std::string workspace_naming(const std::vector<std::string>& paths) {
  nlohmann::json sources = nlohmann::json::array();
  for (const auto& p : paths) sources.push_back({{"path", p}});
  return nlohmann::json{{"format", "photolot-workspace"}, {"version", 1}, {"sources", sources}}
      .dump(2);
}

QString write_workspace(const fs::path& path, const std::vector<std::string>& sources) {
  fs::create_directories(path.parent_path());
  std::ofstream(path) << workspace_naming(sources);
  return QString::fromStdString(path.string());
}

// What the dialog showed: each row's cells, and whether Read was enabled.
struct Shown {
  std::vector<QStringList> rows;
  bool read_enabled = false;
  QString summary;
  bool seen = false;
};

// While the window's source dialog is open, records it, runs `during`, then presses Read (when
// accept and enabled) or Cancel.
void when_the_list_shows(Shown* shown, bool accept, std::function<void()> during = {}) {
  QTimer::singleShot(0, [=] {
    auto* dialog = qobject_cast<SourceCheckDialog*>(QApplication::activeModalWidget());
    if (!dialog) {  // not up yet
      when_the_list_shows(shown, accept, during);
      return;
    }
    shown->seen = true;
    for (int i = 0; i < dialog->list()->topLevelItemCount(); ++i) {
      QStringList cells;
      for (int c = 0; c < dialog->list()->columnCount(); ++c)
        cells << dialog->list()->topLevelItem(i)->text(c);
      shown->rows.push_back(cells);
    }
    shown->read_enabled = dialog->readButton()->isEnabled();
    shown->summary = dialog->summary()->text();
    if (during) during();
    if (accept && dialog->readButton()->isEnabled()) {
      dialog->readButton()->click();
    } else {
      dialog->reject();
    }
  });
}

TEST(SafeOpen, ShowsTheResolvedFilesBeforeReadingAny) {
  const fs::path dir = photolot::test::scratch_dir();
  const fs::path log = dir / "logs" / "reel-07.csv";
  test::write_log(log, test::small_lot_spec());
  const QString ws = write_workspace(dir / "lot.photolot", {"logs/../logs/./reel-07.csv"});

  MainWindow window;
  Shown shown;
  bool nothing_read_while_shown = false;
  when_the_list_shows(&shown, true, [&] {
    nothing_read_while_shown = window.session()->sources().empty() && !window.session()->lot();
    // Changed while the list is up: what is imported must be what is on disk after Read.
    auto bigger = test::small_lot_spec();
    bigger.units = 15;
    test::write_log(log, bigger);
  });
  ASSERT_TRUE(window.openWorkspace(ws));
  ASSERT_TRUE(shown.seen);
  EXPECT_TRUE(nothing_read_while_shown);
  ASSERT_EQ(shown.rows.size(), 1u);
  EXPECT_EQ(fs::path(shown.rows[0][0].toStdString()), log);  // resolved and normalised
  EXPECT_EQ(shown.rows[0][1], QStringLiteral("in the workspace's folder"));
  EXPECT_TRUE(shown.rows[0][2].startsWith(QStringLiteral("file")));
  EXPECT_EQ(shown.rows[0][3], QStringLiteral("logs/../logs/./reel-07.csv"));
  EXPECT_TRUE(shown.read_enabled);
  ASSERT_TRUE(test::wait_idle(*window.session()));
  EXPECT_EQ(window.unitModel()->rowCount(), 15);
}

TEST(SafeOpen, MarksAFileOutsideTheWorkspacesFolder) {
  const fs::path dir = photolot::test::scratch_dir();
  test::write_log(dir / "ws" / "inside.csv", test::small_lot_spec());
  test::write_log(dir / "elsewhere" / "outside.csv", test::small_lot_spec());
  test::write_log(dir / "elsewhere" / "other.csv", test::small_lot_spec());
  // A link inside the folder to a file outside it is outside too, once followed.
  fs::create_symlink(dir / "elsewhere" / "outside.csv", dir / "ws" / "link.csv");
  const QString ws = write_workspace(dir / "ws" / "lot.photolot",
                                     {"inside.csv", "../elsewhere/outside.csv",
                                      (dir / "elsewhere" / "other.csv").string(), "link.csv"});
  MainWindow window;
  Shown shown;
  when_the_list_shows(&shown, false);
  EXPECT_FALSE(window.openWorkspace(ws));
  ASSERT_EQ(shown.rows.size(), 4u);
  const QString outside = QStringLiteral("OUTSIDE the workspace's folder");
  EXPECT_EQ(shown.rows[0][1], QStringLiteral("in the workspace's folder"));
  EXPECT_EQ(shown.rows[1][1], outside);
  EXPECT_EQ(shown.rows[2][1], outside);
  EXPECT_EQ(shown.rows[3][1], outside);
  EXPECT_TRUE(shown.rows[3][0].contains(QString::fromStdString(
      (dir / "elsewhere" / "outside.csv").string())));  // where the link leads is shown
  EXPECT_TRUE(shown.summary.contains(QStringLiteral("outside the workspace's folder")));
}

TEST(SafeOpen, CancelReadsNothingAndChangesNothing) {
  const fs::path dir = photolot::test::scratch_dir();
  test::write_log(dir / "reel.csv", test::small_lot_spec());
  const QString ws = write_workspace(dir / "lot.photolot", {"reel.csv"});
  MainWindow window;
  const QString title = window.windowTitle();
  Shown shown;
  when_the_list_shows(&shown, false);
  EXPECT_FALSE(window.openWorkspace(ws));
  EXPECT_TRUE(shown.seen);
  QCoreApplication::processEvents();
  EXPECT_TRUE(window.session()->sources().empty());
  EXPECT_EQ(window.session()->lot(), nullptr);
  EXPECT_EQ(window.session()->importRuns(), 0);
  EXPECT_TRUE(window.workspacePath().isEmpty());
  EXPECT_EQ(window.windowTitle(), title);
  EXPECT_FALSE(window.hasUnsavedChanges());
}

TEST(SafeOpen, DevicesPipesAndFoldersAreListedButNeverRead) {
  // Reading /dev/zero never ends and a pipe with no writer blocks: were either read, this test
  // would hang or run out of memory instead of failing.
  const fs::path dir = photolot::test::scratch_dir();
  ASSERT_EQ(mkfifo((dir / "pipe.csv").c_str(), 0600), 0);
  fs::create_directories(dir / "folder.csv");
  const QString ws =
      write_workspace(dir / "lot.photolot", {"/dev/zero", "pipe.csv", "folder.csv", "gone.csv"});
  {
    MainWindow window;
    Shown shown;
    when_the_list_shows(&shown, true);  // Read is disabled: the dialog can only be cancelled
    EXPECT_FALSE(window.openWorkspace(ws));
    ASSERT_EQ(shown.rows.size(), 4u);
    EXPECT_FALSE(shown.read_enabled);
    EXPECT_TRUE(shown.rows[0][2].contains(QStringLiteral("a device")));
    EXPECT_TRUE(shown.rows[1][2].contains(QStringLiteral("a pipe")));
    EXPECT_TRUE(shown.rows[2][2].contains(QStringLiteral("a folder")));
    EXPECT_TRUE(shown.rows[3][2].contains(QStringLiteral("no such file")));
    EXPECT_TRUE(window.session()->sources().empty());
  }
  // Accepted all the same (as a script would): refused with the files named.
  MainWindow window;
  QString message;
  window.setSourceAnswerForTests(QDialog::Accepted);
  window.setMessageSinkForTests([&](const QString& m) { message = m; });
  EXPECT_FALSE(window.openWorkspace(ws));
  EXPECT_TRUE(message.contains(QStringLiteral("/dev/zero (a device, not a file; never read)")))
      << message.toStdString();
  EXPECT_TRUE(message.contains(QStringLiteral("pipe.csv")));
  EXPECT_TRUE(window.session()->sources().empty());
}

TEST(SafeOpen, AbsurdPathsAreRefusedWithAMessageNamingTheEntry) {
  const fs::path dir = photolot::test::scratch_dir();
  struct Case {
    std::string path;
    QString expected;
  };
  const Case cases[] = {
      {std::string(5000, 'a') + ".csv", QStringLiteral("sources[0].path is 5004 bytes long")},
      {std::string(300, 'b') + "/x.csv", QStringLiteral("sources[0].path has a name of 300 bytes")},
      {"reel\n.csv", QStringLiteral("sources[0].path holds a control character (byte 0x0a)")},
      {"", QStringLiteral("sources[0].path is empty")},
      {"../..", QStringLiteral("sources[0].path names a folder, not a file")},
  };
  for (const auto& c : cases) {
    SCOPED_TRACE(c.path.substr(0, 40));
    const QString ws = write_workspace(dir / "lot.photolot", {c.path});
    MainWindow window;
    QString message;
    window.setSourceAnswerForTests(QDialog::Accepted);
    window.setMessageSinkForTests([&](const QString& m) { message = m; });
    EXPECT_FALSE(window.openWorkspace(ws));
    EXPECT_TRUE(message.contains(c.expected)) << message.toStdString();
    EXPECT_TRUE(message.contains(QStringLiteral("lot.photolot")));  // the file is named
  }
}

TEST(SafeOpen, PathsClimbingOutOfTheFolderAreMarkedOutside) {
  const fs::path dir = photolot::test::scratch_dir();
  test::write_log(dir / "top.csv", test::small_lot_spec());
  const fs::path ws_dir = dir / "a" / "b" / "c";
  Workspace w;
  ASSERT_TRUE(
      workspace_from_text(workspace_naming({"../../../top.csv", "../../../../../../../../x"}),
                          QString::fromStdString(ws_dir.string()), w)
          .value_or("")
          .empty());
  const auto rows = look_at_sources(w, QString::fromStdString(ws_dir.string()));
  ASSERT_EQ(rows.size(), 2u);
  EXPECT_EQ(fs::path(rows[0].source.path), dir / "top.csv");
  EXPECT_TRUE(rows[0].check.outside_folder);
  EXPECT_TRUE(rows[0].usable());
  EXPECT_EQ(fs::path(rows[1].source.path), fs::path("/x"));  // ".." stops at the root
  EXPECT_TRUE(rows[1].check.outside_folder);
  EXPECT_EQ(where_text(rows[1]), QStringLiteral("OUTSIDE the workspace's folder"));
}

}  // namespace
}  // namespace photolot::workbench
