// The workbench's main window: the unit table on the left, the views (curves, spread,
// acceptance, pairs, import log) on the right, progress and Cancel in the status bar. It owns
// the analysis session and the workspace file; it never blocks on a step.
#pragma once

#include <QMainWindow>
#include <QMessageBox>
#include <QTimer>

#include <functional>
#include <memory>
#include <vector>

#include "session.h"
#include "workspace.h"

class QAction;
class QComboBox;
class QLabel;
class QLineEdit;
class QMenu;
class QProgressBar;
class QPushButton;
class QSplitter;
class QTabWidget;
class QTableView;
class QTreeWidget;

namespace photolot::workbench {

class AcceptanceView;
class Autosave;
class CurvesView;
class PairsView;
class SpreadView;
class UnitFilterModel;
class UnitTableModel;

class MainWindow : public QMainWindow {
  Q_OBJECT
 public:
  explicit MainWindow(QWidget* parent = nullptr);
  ~MainWindow() override;

  // Opens logs (imported with the current choices, no dialog) or a workspace (*.photolot).
  void openPaths(const QStringList& paths);
  // Opens logs, showing the import dialog first when ask is true.
  void openLogs(const QStringList& paths, bool ask);
  // Safe open: the workspace is read and checked, then the bench logs it names are listed
  // (source_check_dialog.h) and read only once the user accepts the list.
  bool openWorkspace(const QString& path);
  // Offers back the newest recovery copy a run that did not end cleanly left (autosave.h):
  // "Recover unsaved work from <time>?". True when work was recovered.
  bool offerRecovery();
  // Loads and applies a spec file (TOML); false with a message box when it does not load.
  bool openSpecFile(const QString& path);
  // Starts pairing with the options shown in the pairs view.
  void findPairs();
  bool saveWorkspaceTo(const QString& path);
  // Writes the lot summary PDF (app/report) of what is shown: the fit, and the spec, statistics,
  // verdicts, disposition and pairs when they are there. Empty on success, else the message.
  QString writeSummaryTo(const QString& path);
  // Re-imports the current sources with other choices (the import dialog's result).
  void setImportOptions(const ImportOptions& options);
  // The curve model, bench profile (with its file name) and temperature handling; refits.
  void setFitHandling(const FitHandling& handling);
  // Select units by index into the lot (the table, the curves and the spread follow).
  void selectUnits(const std::vector<int>& units);
  std::vector<int> selectedUnits() const;

  AnalysisSession* session() { return &session_; }
  UnitTableModel* unitModel() const { return model_; }
  UnitFilterModel* filterModel() const { return filter_; }
  QTableView* unitTable() const { return table_; }
  CurvesView* curvesView() const { return curves_; }
  SpreadView* spreadView() const { return spread_; }
  PairsView* pairsView() const { return pairs_; }
  AcceptanceView* acceptanceView() const { return acceptance_; }
  QTabWidget* tabs() const { return tabs_; }
  QString workspacePath() const { return workspace_path_; }
  bool hasUnsavedChanges() const { return isWindowModified(); }
  QString statusText() const;
  // Answers the unsaved-changes prompt without showing it (tests): Save, Discard or Cancel.
  void setPromptAnswerForTests(int standard_button) { prompt_answer_ = standard_button; }
  // Answers the list of files a workspace reads without showing it (tests): QDialog::Accepted
  // or QDialog::Rejected; 0 shows the dialog.
  void setSourceAnswerForTests(int dialog_code) { source_answer_ = dialog_code; }
  // Answers the recovery offer without showing it (tests): QMessageBox::Yes recovers,
  // QMessageBox::Discard discards; 0 asks.
  void setRecoveryAnswerForTests(int standard_button) { recovery_answer_ = standard_button; }
  // Messages of the open and recovery steps go here instead of a message box (tests).
  void setMessageSinkForTests(std::function<void(const QString&)> sink) {
    message_sink_ = std::move(sink);
  }
  Autosave* autosave() const { return autosave_; }
 protected:
  void closeEvent(QCloseEvent* event) override;
  void dragEnterEvent(QDragEnterEvent* event) override;
  void dropEvent(QDropEvent* event) override;

 private:
  void buildActions();
  void buildLayout();
  void restoreSettings();
  void rememberRecent(const QString& path);
  void rebuildRecentMenu();
  bool maybeSave();

  void chooseLogs();
  void chooseWorkspace();
  bool save();
  bool saveAs();
  void editImportChoices();
  void editFitOptions();
  void exportPlot();
  void printSummary();
  void closeLot();
  void showHelp();
  void showAbout();

  void onBusyChanged(bool busy);
  // Shows the outcome of a step in the status line and keeps it for when the run ends.
  void showResult(const QString& text);
  void onProgress(AnalysisSession::Step step, qint64 done, qint64 total);
  void onImportFinished();
  void onFitFinished();
  void onAnalysisFinished();
  void onPairingFinished();
  void openSpec();
  void saveSpec();
  void applySpec(std::optional<Spec> spec);
  void savePickList();
  void onSelectionChanged();
  void updateCountLabel();
  void updateTitle();
  void setModified(bool modified);
  Workspace currentWorkspace() const;
  // The safe open's steps after the file was parsed; `folder` is what "outside" is judged by.
  bool openWorkspaceDocument(const QString& path, Workspace workspace, const QString& folder);
  void tellUser(QMessageBox::Icon icon, const QString& title, const QString& text);

  AnalysisSession session_;
  UnitTableModel* model_ = nullptr;
  UnitFilterModel* filter_ = nullptr;

  QSplitter* splitter_ = nullptr;
  QTableView* table_ = nullptr;
  QLineEdit* filter_text_ = nullptr;
  QComboBox* status_filter_ = nullptr;
  QComboBox* verdict_filter_ = nullptr;
  QLabel* count_label_ = nullptr;
  QTabWidget* tabs_ = nullptr;
  CurvesView* curves_ = nullptr;
  SpreadView* spread_ = nullptr;
  AcceptanceView* acceptance_ = nullptr;
  PairsView* pairs_ = nullptr;
  QTreeWidget* import_log_ = nullptr;
  QLabel* lot_label_ = nullptr;

  QLabel* status_text_ = nullptr;
  QProgressBar* progress_ = nullptr;
  QPushButton* cancel_button_ = nullptr;

  QMenu* recent_menu_ = nullptr;
  QAction* save_action_ = nullptr;
  QAction* save_as_action_ = nullptr;
  QAction* import_choices_action_ = nullptr;
  QAction* export_action_ = nullptr;
  QAction* summary_action_ = nullptr;
  QAction* refit_action_ = nullptr;
  QAction* cancel_action_ = nullptr;

  QTimer selection_timer_;
  QString workspace_path_;
  QString result_text_;
  std::string bench_profile_name_;  // file name of the bench profile in use (empty: none)  // what the status line says once the session is idle
  std::string spec_toml_;  // the applied spec as written to a workspace
  std::vector<std::string> pending_selection_;  // unit ids to select when the fit arrives
  int prompt_answer_ = 0;
  int source_answer_ = 0;
  int recovery_answer_ = 0;
  std::function<void(const QString&)> message_sink_;
  Autosave* autosave_ = nullptr;
};

}  // namespace photolot::workbench
