// Crash-safe autosave: while the window holds unsaved work, a recovery copy (a workspace
// document, written atomically with QSaveFile) is kept in the user's app-data folder and
// refreshed every interval. A clean save or exit removes it; a run that ends any other way
// (crash, kill, power cut) leaves it, and the next start offers it back.
//
// Each running window owns one copy, recovery-<pid>-<n>.photolot, and holds a lock file beside
// it (QLockFile), so that a second photolot running at the same time never takes another's
// copy for an orphan. The folder is QStandardPaths::AppDataLocation/recovery, or the folder
// named by the environment variable PHOTOLOT_RECOVERY_DIR (tests).
#pragma once

#include <QDateTime>
#include <QLockFile>
#include <QObject>
#include <QString>
#include <QTimer>
#include <functional>
#include <memory>
#include <string>
#include <vector>

namespace photolot::workbench {

class Autosave : public QObject {
  Q_OBJECT
 public:
  // The recovery copy's content now: a workspace document's text (workspace.h), and the path of
  // the workspace it belongs to ("" for a session never saved).
  struct Snapshot {
    std::string text;
    QString workspace_path;
  };
  using SnapshotFn = std::function<Snapshot()>;

  explicit Autosave(SnapshotFn snapshot, QObject* parent = nullptr);
  ~Autosave() override;  // keeps the copy: only discard() removes it

  static QString folder();
  static constexpr int kDefaultIntervalMs = 60 * 1000;
  void setIntervalMs(int ms) { timer_.setInterval(ms); }

  // There is unsaved work: a copy is written within one interval.
  void markDirty();
  // Writes the copy now if there is unsaved work since the last one. Empty, or the error.
  QString saveNow();
  // The work was saved or thrown away on purpose: the copy goes.
  void discard();
  bool hasCopy() const;
  QString copyPath() const { return path_; }
  QString lastError() const { return last_error_; }

  // A copy left by a run that did not end cleanly (its lock is free).
  struct Orphan {
    QString path;
    QDateTime saved_at;
    QString workspace_path;  // "" when the work was never saved as a workspace
  };
  // Newest first.
  static std::vector<Orphan> orphans();
  static void remove(const Orphan& orphan);

 private:
  SnapshotFn snapshot_;
  QString path_;
  std::unique_ptr<QLockFile> lock_;
  QTimer timer_;
  bool dirty_ = false;
  QString last_error_;
};

}  // namespace photolot::workbench
