// Safe open: before a workspace reads any of its bench logs, this dialog lists them, resolved
// against the workspace's folder, with those outside the folder marked and those that cannot be
// read (missing, a device, a pipe, a folder, too large) said so. Nothing has been read when it
// shows; Cancel reads nothing. Only a looked-at list of plain files can be accepted.
#pragma once

#include <QDialog>
#include <QString>
#include <vector>

#include "photolot/workspace_doc.h"
#include "workspace.h"

class QLabel;
class QPushButton;
class QTreeWidget;

namespace photolot::workbench {

// One source as the dialog shows it: the workspace's entry and what is on disk there.
struct SourceRow {
  WorkspaceSource source;
  workspace::SourceCheck check;
  bool usable() const { return check.state == workspace::SourceState::file; }
};

// Looks at each source without reading it (workspace::check_source).
std::vector<SourceRow> look_at_sources(const Workspace& workspace, const QString& folder);

// The text of a row's "where" and "state" cells, shared by the dialog and the tests.
QString where_text(const SourceRow& row);
QString state_text(const SourceRow& row);

class SourceCheckDialog : public QDialog {
  Q_OBJECT
 public:
  SourceCheckDialog(const QString& workspace_path, const std::vector<SourceRow>& rows,
                    const std::vector<std::string>& warnings, QWidget* parent = nullptr);

  QTreeWidget* list() const { return list_; }
  QPushButton* readButton() const { return read_; }
  QLabel* summary() const { return summary_; }

 private:
  QTreeWidget* list_ = nullptr;
  QPushButton* read_ = nullptr;
  QLabel* summary_ = nullptr;
};

}  // namespace photolot::workbench
