#include "autosave.h"

#include <QCoreApplication>
#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QSaveFile>
#include <QStandardPaths>
#include <algorithm>
#include <atomic>

namespace photolot::workbench {
namespace {

const QString kPrefix = QStringLiteral("recovery-");
const QString kSuffix = QStringLiteral(".photolot");
// Beside each copy: the path of the workspace it belongs to, one line of UTF-8.
QString origin_path(const QString& copy) { return copy + QStringLiteral(".origin"); }
QString lock_path(const QString& copy) { return copy + QStringLiteral(".lock"); }

bool write_atomically(const QString& path, const QByteArray& bytes, QString* error) {
  QSaveFile file(path);
  if (!file.open(QIODevice::WriteOnly) || file.write(bytes) != bytes.size() || !file.commit()) {
    *error = QObject::tr("cannot write the recovery copy '%1': %2").arg(path, file.errorString());
    return false;
  }
  return true;
}

}  // namespace

QString Autosave::folder() {
  const QString over = qEnvironmentVariable("PHOTOLOT_RECOVERY_DIR");
  if (!over.isEmpty()) return over;
  return QStandardPaths::writableLocation(QStandardPaths::AppDataLocation) +
         QStringLiteral("/recovery");
}

Autosave::Autosave(SnapshotFn snapshot, QObject* parent)
    : QObject(parent), snapshot_(std::move(snapshot)) {
  static std::atomic<int> counter{0};
  path_ = QDir(folder()).filePath(QStringLiteral("%1%2-%3%4")
                                      .arg(kPrefix)
                                      .arg(QCoreApplication::applicationPid())
                                      .arg(++counter)
                                      .arg(kSuffix));
  timer_.setSingleShot(true);
  timer_.setInterval(kDefaultIntervalMs);
  connect(&timer_, &QTimer::timeout, this, [this] { saveNow(); });
}

Autosave::~Autosave() = default;

void Autosave::markDirty() {
  dirty_ = true;
  if (!timer_.isActive()) timer_.start();
}

QString Autosave::saveNow() {
  timer_.stop();
  if (!dirty_) return {};
  const Snapshot snap = snapshot_();
  if (snap.text.empty()) return {};
  if (!QDir().mkpath(folder())) {
    last_error_ = tr("cannot create the recovery folder '%1'").arg(folder());
    return last_error_;
  }
  if (!lock_) {
    lock_ = std::make_unique<QLockFile>(lock_path(path_));
    if (!lock_->tryLock(0)) {
      last_error_ = tr("cannot lock the recovery copy '%1'").arg(path_);
      lock_.reset();
      return last_error_;
    }
  }
  // The origin first: a copy is never without the right origin beside it.
  if (!write_atomically(origin_path(path_), snap.workspace_path.toUtf8(), &last_error_) ||
      !write_atomically(path_, QByteArray::fromStdString(snap.text), &last_error_)) {
    return last_error_;
  }
  dirty_ = false;
  last_error_.clear();
  return {};
}

void Autosave::discard() {
  timer_.stop();
  dirty_ = false;
  QFile::remove(path_);
  QFile::remove(origin_path(path_));
  lock_.reset();  // unlocks and removes the lock file
}

bool Autosave::hasCopy() const { return QFileInfo::exists(path_); }

std::vector<Autosave::Orphan> Autosave::orphans() {
  std::vector<Orphan> out;
  const QDir dir(folder());
  for (const QFileInfo& info :
       dir.entryInfoList({kPrefix + QStringLiteral("*") + kSuffix}, QDir::Files)) {
    QLockFile probe(lock_path(info.absoluteFilePath()));
    if (!probe.tryLock(0)) continue;  // its run is still going
    probe.unlock();
    Orphan o;
    o.path = info.absoluteFilePath();
    o.saved_at = info.lastModified();
    QFile origin(origin_path(o.path));
    if (origin.open(QIODevice::ReadOnly)) o.workspace_path = QString::fromUtf8(origin.readAll());
    out.push_back(std::move(o));
  }
  std::sort(out.begin(), out.end(),
            [](const Orphan& a, const Orphan& b) { return a.saved_at > b.saved_at; });
  return out;
}

void Autosave::remove(const Orphan& orphan) {
  QFile::remove(orphan.path);
  QFile::remove(origin_path(orphan.path));
}

}  // namespace photolot::workbench
