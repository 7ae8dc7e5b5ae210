#include "main_window.h"

#include <fmt/format.h>

#include <QAction>
#include <QApplication>
#include <QCheckBox>
#include <QCloseEvent>
#include <QComboBox>
#include <QDate>
#include <QDialog>
#include <QDialogButtonBox>
#include <QDoubleSpinBox>
#include <QDragEnterEvent>
#include <QFile>
#include <QFileDialog>
#include <QFileInfo>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QLocale>
#include <QMenuBar>
#include <QMessageBox>
#include <QMimeData>
#include <QProgressBar>
#include <QPushButton>
#include <QSaveFile>
#include <QSettings>
#include <QSplitter>
#include <QStatusBar>
#include <QTabWidget>
#include <QTableView>
#include <QTextBrowser>
#include <QToolBar>
#include <QTreeWidget>
#include <QVBoxLayout>
#include <cmath>
#include <unordered_map>

#include "acceptance_view.h"
#include "autosave.h"
#include "curves_view.h"
#include "diagnostics_list.h"
#include "fit_handling.h"
#include "help_text.h"
#include "import_dialog.h"
#include "pairs_view.h"
#include "photolot/read_file.h"
#include "photolot/results.h"
#include "source_check_dialog.h"
#include "spec_toml.h"
#include "spread_view.h"
#include "unit_table_model.h"

#if defined(PHOTOLOT_HAVE_REPORT) && __has_include("photolot/report/summary.h")
#include "photolot/report/summary.h"
#define PHOTOLOT_WORKBENCH_REPORT 1
#endif

// The icon lives in the library's resources; a static library must register them itself.
static void init_workbench_resources() { Q_INIT_RESOURCE(workbench); }

namespace photolot::workbench {
namespace {

constexpr int kMaxRecent = 10;
const QString kWorkspaceSuffix = QStringLiteral("photolot");

QString tab_key(int index) {
  static const char* kKeys[] = {"curves", "spread", "acceptance", "pairs", "import-log"};
  return index >= 0 && index < 5 ? QString::fromLatin1(kKeys[index]) : QString();
}

}  // namespace

MainWindow::MainWindow(QWidget* parent) : QMainWindow(parent) {
  init_workbench_resources();
  setObjectName(QStringLiteral("photolotMainWindow"));
  setWindowIcon(QIcon(QStringLiteral(":/photolot/icons/photolot.svg")));
  setAcceptDrops(true);
  autosave_ = new Autosave(
      [this] {
        Autosave::Snapshot snap;
        if (!isWindowModified() || session_.sources().empty()) return snap;
        const QString folder = workspace_path_.isEmpty()
                                   ? Autosave::folder()
                                   : QFileInfo(workspace_path_).absolutePath();
        snap.text = workspace_to_text(currentWorkspace(), folder);
        snap.workspace_path = workspace_path_;
        return snap;
      },
      this);
  model_ = new UnitTableModel(this);
  filter_ = new UnitFilterModel(this);
  filter_->setSourceModel(model_);

  buildLayout();
  buildActions();
  restoreSettings();

  selection_timer_.setSingleShot(true);
  selection_timer_.setInterval(30);  // coalesce the bursts of a drag-select or Ctrl+A
  connect(&selection_timer_, &QTimer::timeout, this, &MainWindow::onSelectionChanged);

  connect(&session_, &AnalysisSession::busyChanged, this, &MainWindow::onBusyChanged);
  connect(&session_, &AnalysisSession::progress, this, &MainWindow::onProgress);
  connect(&session_, &AnalysisSession::importFinished, this, &MainWindow::onImportFinished);
  connect(&session_, &AnalysisSession::fitFinished, this, &MainWindow::onFitFinished);
  connect(&session_, &AnalysisSession::analysisFinished, this, &MainWindow::onAnalysisFinished);
  connect(&session_, &AnalysisSession::pairingFinished, this, &MainWindow::onPairingFinished);
  connect(&session_, &AnalysisSession::cancelled, this, [this] {
    showResult(
        tr("Stopped. The results shown are from the last finished run; "
           "Analysis ▸ Refit runs it again."));
  });
  connect(&session_, &AnalysisSession::inputsChanged, this, [this] {
    if (!session_.sources().empty()) setModified(true);
  });
  updateTitle();
  onBusyChanged(false);
}

MainWindow::~MainWindow() = default;

QString MainWindow::statusText() const { return status_text_->text(); }

void MainWindow::buildLayout() {
  // Left: the unit table with its filters.
  auto* left = new QWidget(this);
  auto* left_layout = new QVBoxLayout(left);
  left_layout->setContentsMargins(6, 6, 0, 6);
  lot_label_ = new QLabel(tr("No lot open"), left);
  lot_label_->setObjectName(QStringLiteral("lotLabel"));
  QFont bold = lot_label_->font();
  bold.setBold(true);
  bold.setPointSizeF(bold.pointSizeF() * 1.15);
  lot_label_->setFont(bold);
  filter_text_ = new QLineEdit(left);
  filter_text_->setPlaceholderText(tr("Filter by unit id or flag  (Ctrl+F)"));
  filter_text_->setClearButtonEnabled(true);
  status_filter_ = new QComboBox(left);
  status_filter_->addItems({tr("All fits"), tr("Fitted"), tr("Not fitted"), tr("Flagged")});
  verdict_filter_ = new QComboBox(left);
  verdict_filter_->addItems(
      {tr("All verdicts"), tr("Conforming"), tr("Nonconforming"), tr("No verdict")});
  auto* filters = new QHBoxLayout;
  filters->addWidget(filter_text_, 1);
  filters->addWidget(status_filter_);
  filters->addWidget(verdict_filter_);

  table_ = new QTableView(left);
  table_->setObjectName(QStringLiteral("unitTable"));
  table_->setModel(filter_);
  table_->setSortingEnabled(true);
  table_->sortByColumn(UnitTableModel::kId, Qt::AscendingOrder);
  table_->setSelectionBehavior(QAbstractItemView::SelectRows);
  table_->setSelectionMode(QAbstractItemView::ExtendedSelection);
  table_->setAlternatingRowColors(true);
  table_->verticalHeader()->setVisible(false);
  table_->verticalHeader()->setDefaultSectionSize(table_->fontMetrics().height() + 6);
  table_->horizontalHeader()->setStretchLastSection(true);
  table_->horizontalHeader()->setSectionsMovable(true);
  table_->setWordWrap(false);
  count_label_ = new QLabel(left);

  left_layout->addWidget(lot_label_);
  left_layout->addLayout(filters);
  left_layout->addWidget(table_, 1);
  left_layout->addWidget(count_label_);

  connect(filter_text_, &QLineEdit::textChanged, this, [this](const QString& text) {
    filter_->setText(text);
    updateCountLabel();
  });
  connect(status_filter_, &QComboBox::currentIndexChanged, this, [this](int i) {
    filter_->setStatusFilter(static_cast<UnitFilterModel::StatusFilter>(i));
    updateCountLabel();
  });
  connect(verdict_filter_, &QComboBox::currentIndexChanged, this, [this](int i) {
    filter_->setVerdictFilter(static_cast<UnitFilterModel::VerdictFilter>(i));
    updateCountLabel();
  });
  connect(table_->selectionModel(), &QItemSelectionModel::selectionChanged, this,
          [this] { selection_timer_.start(); });

  // Right: the views.
  tabs_ = new QTabWidget(this);
  tabs_->setObjectName(QStringLiteral("views"));
  tabs_->setDocumentMode(true);
  curves_ = new CurvesView(tabs_);
  spread_ = new SpreadView(tabs_);
  acceptance_ = new AcceptanceView(tabs_);
  pairs_ = new PairsView(tabs_);
  import_log_ = new QTreeWidget(tabs_);
  import_log_->setObjectName(QStringLiteral("importLog"));
  import_log_->setHeaderLabels(
      {tr("File"), tr("Line"), tr("Column"), tr("Severity"), tr("Message")});
  import_log_->setRootIsDecorated(false);
  tabs_->addTab(curves_, tr("Curves"));
  tabs_->addTab(spread_, tr("Spread"));
  tabs_->addTab(acceptance_, tr("Acceptance"));
  tabs_->addTab(pairs_, tr("Pairs"));
  tabs_->addTab(import_log_, tr("Import log"));
  connect(spread_, &SpreadView::unitClicked, this, [this](int unit, bool add) {
    std::vector<int> units = add ? selectedUnits() : std::vector<int>{};
    units.push_back(unit);
    selectUnits(units);
  });
  connect(acceptance_, &AcceptanceView::summaryRequested, this, &MainWindow::printSummary);
  connect(acceptance_, &AcceptanceView::openSpecRequested, this, &MainWindow::openSpec);
  connect(acceptance_, &AcceptanceView::saveSpecRequested, this, &MainWindow::saveSpec);
  connect(acceptance_, &AcceptanceView::specApplied, this, &MainWindow::applySpec);
  connect(acceptance_, &AcceptanceView::unitActivated, this, [this](const QString& id) {
    if (const Lot* lot = session_.lot()) {
      for (std::size_t i = 0; i < lot->units.size(); ++i) {
        if (lot->units[i].id == id.toStdString()) selectUnits({static_cast<int>(i)});
      }
    }
  });
  connect(pairs_, &PairsView::findRequested, this, [this](const PairOptions& options) {
    if (const std::string problem = options.validate(); !problem.empty()) {
      QMessageBox::warning(this, tr("Pairs"), QString::fromStdString(problem));
      return;
    }
    session_.setPairOptions(options);
    session_.setPairAllFitted(pairs_->includeAllFitted());
    session_.setPairingWanted(true);
    pairs_->setPairing(nullptr, true);
    session_.run();
  });
  connect(pairs_, &PairsView::pairActivated, this, [this](std::size_t a, std::size_t b) {
    selectUnits({static_cast<int>(a), static_cast<int>(b)});
  });
  connect(pairs_, &PairsView::exportRequested, this, &MainWindow::savePickList);
  connect(pairs_, &PairsView::includeAllFittedChanged, this, [this] {
    session_.setPairAllFitted(pairs_->includeAllFitted());
    if (!session_.pairingWanted()) return;
    pairs_->setPairing(nullptr, true);
    session_.run();
  });

  splitter_ = new QSplitter(this);
  splitter_->setObjectName(QStringLiteral("mainSplitter"));
  splitter_->addWidget(left);
  splitter_->addWidget(tabs_);
  splitter_->setStretchFactor(0, 2);
  splitter_->setStretchFactor(1, 3);
  setCentralWidget(splitter_);

  status_text_ = new QLabel(this);
  progress_ = new QProgressBar(this);
  progress_->setMaximumWidth(220);
  progress_->setTextVisible(true);
  cancel_button_ = new QPushButton(tr("Cancel"), this);
  cancel_button_->setObjectName(QStringLiteral("cancelButton"));
  connect(cancel_button_, &QPushButton::clicked, &session_, &AnalysisSession::cancel);
  statusBar()->addWidget(status_text_, 1);
  statusBar()->addPermanentWidget(progress_);
  statusBar()->addPermanentWidget(cancel_button_);
}

void MainWindow::buildActions() {
  QMenu* file = menuBar()->addMenu(tr("&File"));
  auto* open_logs = file->addAction(tr("&Open Logs…"), this, &MainWindow::chooseLogs);
  open_logs->setShortcut(QKeySequence::Open);
  auto* open_ws = file->addAction(tr("Open &Workspace…"), this, &MainWindow::chooseWorkspace);
  open_ws->setShortcut(QKeySequence(Qt::CTRL | Qt::SHIFT | Qt::Key_O));
  recent_menu_ = file->addMenu(tr("Open &Recent"));
  file->addSeparator();
  save_action_ = file->addAction(tr("&Save Workspace"), this, &MainWindow::save);
  save_action_->setShortcut(QKeySequence::Save);
  save_as_action_ = file->addAction(tr("Save Workspace &As…"), this, &MainWindow::saveAs);
  save_as_action_->setShortcut(QKeySequence::SaveAs);
  file->addSeparator();
  import_choices_action_ =
      file->addAction(tr("&Import Choices…"), this, &MainWindow::editImportChoices);
  import_choices_action_->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_I));
  export_action_ = file->addAction(tr("&Export Plot…"), this, &MainWindow::exportPlot);
  export_action_->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_E));
  summary_action_ = file->addAction(tr("&Print Lot Summary…"), this, &MainWindow::printSummary);
  summary_action_->setShortcut(QKeySequence::Print);
  file->addSeparator();
  auto* close = file->addAction(tr("&Close Lot"), this, &MainWindow::closeLot);
  close->setShortcut(QKeySequence::Close);
  auto* quit = file->addAction(tr("&Quit"), this, &QWidget::close);
  quit->setShortcut(QKeySequence::Quit);
  quit->setMenuRole(QAction::QuitRole);

  QMenu* edit = menuBar()->addMenu(tr("&Edit"));
  auto* select_all =
      edit->addAction(tr("Select &All Units"), this, [this] { table_->selectAll(); });
  select_all->setShortcut(QKeySequence::SelectAll);
  auto* find = edit->addAction(tr("&Find Unit"), this, [this] {
    filter_text_->setFocus();
    filter_text_->selectAll();
  });
  find->setShortcut(QKeySequence::Find);

  QMenu* view = menuBar()->addMenu(tr("&View"));
  for (int i = 0; i < tabs_->count(); ++i) {
    auto* a = view->addAction(tabs_->tabText(i), this, [this, i] { tabs_->setCurrentIndex(i); });
    a->setShortcut(QKeySequence(Qt::CTRL | static_cast<Qt::Key>(Qt::Key_1 + i)));
  }

  QMenu* analysis = menuBar()->addMenu(tr("&Analysis"));
  refit_action_ = analysis->addAction(tr("&Refit"), this, [this] {
    session_.setFitOptions(session_.fitOptions());
    session_.run();
  });
  refit_action_->setShortcut(QKeySequence::Refresh);
  cancel_action_ = analysis->addAction(tr("&Stop"), &session_, &AnalysisSession::cancel);
  cancel_action_->setShortcut(QKeySequence(Qt::Key_Escape));
  analysis->addAction(tr("Fit &Options…"), this, &MainWindow::editFitOptions);

  QMenu* help = menuBar()->addMenu(tr("&Help"));
  auto* guide = help->addAction(tr("photolot &Guide"), this, &MainWindow::showHelp);
  guide->setShortcut(QKeySequence::HelpContents);
  auto* about = help->addAction(tr("&About photolot"), this, &MainWindow::showAbout);
  about->setMenuRole(QAction::AboutRole);

  auto* toolbar = addToolBar(tr("Main"));
  toolbar->setObjectName(QStringLiteral("mainToolbar"));
  toolbar->setToolButtonStyle(Qt::ToolButtonTextOnly);
  toolbar->addAction(open_logs);
  toolbar->addAction(save_action_);
  toolbar->addAction(import_choices_action_);
  toolbar->addAction(refit_action_);
  toolbar->addAction(export_action_);
  toolbar->addAction(summary_action_);
  rebuildRecentMenu();
}

void MainWindow::restoreSettings() {
  QSettings settings;
  if (!restoreGeometry(settings.value("window/geometry").toByteArray())) resize(1360, 840);
  restoreState(settings.value("window/state").toByteArray());
  splitter_->restoreState(settings.value("window/splitter").toByteArray());
  table_->horizontalHeader()->restoreState(settings.value("window/unitTableV2").toByteArray());
  if (splitter_->sizes().value(0) == 0) splitter_->setSizes({560, 800});
}

void MainWindow::rememberRecent(const QString& path) {
  QSettings settings;
  QStringList recent = settings.value("recentFiles").toStringList();
  const QString absolute = QFileInfo(path).absoluteFilePath();
  recent.removeAll(absolute);
  recent.prepend(absolute);
  while (recent.size() > kMaxRecent) recent.removeLast();
  settings.setValue("recentFiles", recent);
  rebuildRecentMenu();
}

void MainWindow::rebuildRecentMenu() {
  recent_menu_->clear();
  const QStringList recent = QSettings().value("recentFiles").toStringList();
  for (const QString& path : recent) {
    recent_menu_->addAction(QFileInfo(path).fileName() + QStringLiteral("  —  ") + path, this,
                            [this, path] { openPaths({path}); });
  }
  if (recent.isEmpty()) recent_menu_->addAction(tr("(none yet)"))->setEnabled(false);
  recent_menu_->addSeparator();
  recent_menu_->addAction(tr("Clear List"), this, [this] {
    QSettings().remove("recentFiles");
    rebuildRecentMenu();
  });
}

void MainWindow::openPaths(const QStringList& paths) {
  QStringList logs;
  for (const QString& p : paths) {
    if (QFileInfo(p).suffix() == kWorkspaceSuffix) {
      openWorkspace(p);
      return;
    }
    logs << p;
  }
  if (!logs.isEmpty()) openLogs(logs, false);
}

void MainWindow::openLogs(const QStringList& paths, bool ask) {
  if (!maybeSave()) return;
  std::vector<SourceFile> sources;
  QStringList problems;
  for (const QString& p : paths) {
    auto [source, error] = read_source_file(QFileInfo(p).absoluteFilePath().toStdString(), false);
    if (!error.empty()) {
      problems << QString::fromStdString(error);
      continue;
    }
    sources.push_back(std::move(source));
  }
  if (!problems.isEmpty()) {
    QMessageBox::warning(this, tr("Open logs"), problems.join(QLatin1Char('\n')));
  }
  if (sources.empty()) return;
  ImportOptions options = session_.importOptions();
  if (ask) {
    ImportDialog dialog(sources, options, this);
    if (dialog.exec() != QDialog::Accepted) return;
    options = dialog.options();
  }
  for (const auto& s : sources) rememberRecent(QString::fromStdString(s.path));
  QSettings().setValue("folders/logs",
                       QFileInfo(QString::fromStdString(sources[0].path)).absolutePath());
  workspace_path_.clear();
  pending_selection_.clear();
  session_.setSources(std::move(sources));
  session_.setImportOptions(options);
  session_.run();
  setModified(true);
  updateTitle();
}

void MainWindow::setImportOptions(const ImportOptions& options) {
  session_.setImportOptions(options);
  pending_selection_.clear();
  for (int u : selectedUnits()) pending_selection_.push_back(session_.lot()->units[u].id);
  session_.run();
}

bool MainWindow::openWorkspace(const QString& path) {
  if (!maybeSave()) return false;
  Workspace workspace;
  if (QString error = load_workspace(path, workspace); !error.isEmpty()) {
    tellUser(QMessageBox::Critical, tr("Open workspace"), error);
    return false;
  }
  if (!openWorkspaceDocument(path, std::move(workspace), QFileInfo(path).absolutePath())) {
    return false;
  }
  rememberRecent(path);
  QSettings().setValue("folders/workspace", QFileInfo(path).absolutePath());
  return true;
}

void MainWindow::tellUser(QMessageBox::Icon icon, const QString& title, const QString& text) {
  if (message_sink_) {
    message_sink_(text);
    return;
  }
  QMessageBox box(icon, title, text, QMessageBox::Ok, this);
  box.exec();
}

bool MainWindow::openWorkspaceDocument(const QString& path, Workspace workspace,
                                       const QString& folder) {
  // Nothing is read before the user has seen, resolved, every file the workspace names.
  const std::vector<SourceRow> rows = look_at_sources(workspace, folder);
  QStringList unreadable;
  for (const auto& r : rows) {
    if (!r.usable()) {
      unreadable << QStringLiteral("%1 (%2)").arg(QString::fromStdString(r.source.path),
                                                  state_text(r));
    }
  }
  bool accepted = false;
  if (source_answer_) {
    accepted = source_answer_ == QDialog::Accepted;
    if (accepted && !unreadable.isEmpty()) {
      tellUser(QMessageBox::Critical, tr("Open workspace"),
               tr("These bench logs of the workspace cannot be read:\n%1\n\nPut them back (or "
                  "beside the workspace) and open it again.")
                   .arg(unreadable.join(QLatin1Char('\n'))));
      return false;
    }
  } else {
    SourceCheckDialog dialog(path, rows, workspace.warnings, this);
    accepted = dialog.exec() == QDialog::Accepted;
  }
  if (!accepted) {
    status_text_->setText(tr("Did not open %1: nothing was read.").arg(QFileInfo(path).fileName()));
    return false;
  }
  std::vector<SourceFile> sources;
  QStringList changed;
  for (const auto& r : rows) {
    auto [file, error] = read_source_file(r.source.path);
    if (!error.empty()) {
      tellUser(QMessageBox::Critical, tr("Open workspace"), QString::fromStdString(error));
      return false;
    }
    if (!r.source.sha256_hex.empty() && file.sha256_hex != r.source.sha256_hex) {
      changed << QString::fromStdString(r.source.path);
    }
    sources.push_back(std::move(file));
  }
  if (!changed.isEmpty()) {
    QMessageBox box(QMessageBox::Question, tr("Source logs changed"),
                    tr("These bench logs changed since the workspace was saved:\n%1\n\n"
                       "Reload them and refit the lot?")
                        .arg(changed.join(QLatin1Char('\n'))),
                    QMessageBox::NoButton, this);
    box.addButton(tr("Reload and refit"), QMessageBox::AcceptRole);
    box.addButton(QMessageBox::Cancel);
    const int answer = prompt_answer_ ? prompt_answer_ : (box.exec(), 0);
    if (answer == QMessageBox::Cancel ||
        (!prompt_answer_ && box.buttonRole(box.clickedButton()) != QMessageBox::AcceptRole)) {
      return false;
    }
  }
  session_.setSources(std::move(sources));
  session_.setImportOptions(workspace.import_options);
  session_.setFitOptions(workspace.fit_options);
  session_.setModelOptions(workspace.model.model);
  bench_profile_name_ = workspace.model.bench_profile_name;
  std::optional<Spec> spec;
  spec_toml_.clear();
  if (workspace.spec.is_object() && workspace.spec.contains("toml")) {
    spec_toml_ = workspace.spec.value("toml", "");
    SpecLoadResult loaded = parse_spec(spec_toml_, workspace.spec.value("file", "workspace spec"));
    if (loaded.ok()) {
      spec = loaded.spec;
      spec->source_file = workspace.spec.value("file", "");
    } else {
      tellUser(QMessageBox::Warning, tr("Open workspace"),
               tr("The workspace's spec does not load: %1")
                   .arg(QString::fromStdString(to_string(loaded.errors.front()))));
    }
  }
  session_.setSpec(spec);
  acceptance_->showSpec(spec);
  // Saved results are taken over when the logs are unchanged: the lot is re-imported (fast, and
  // the curves need the readings) but not fitted again.
  if (changed.isEmpty() && workspace.results.is_object()) {
    const auto read = results::from_json(results::Json::parse(workspace.results.dump()));
    if (read.ok()) {
      auto fit = std::make_shared<LotFit>();
      fit->units = read.doc.units;
      fit->method = read.doc.fit_method;
      fit->temperature = read.doc.temperature;
      session_.offerSavedFit(fit);
    }
  }
  pending_selection_ = workspace.view.selected_units;
  filter_text_->setText(QString::fromStdString(workspace.view.filter));
  for (int i = 0; i < tabs_->count(); ++i) {
    if (tab_key(i) == QString::fromStdString(workspace.view.tab)) tabs_->setCurrentIndex(i);
  }
  // The results are recomputed from the logs: the fit is deterministic, so they are the
  // numbers that were saved whenever the logs are unchanged.
  session_.run();
  workspace_path_ = QFileInfo(path).absoluteFilePath();
  setModified(!changed.isEmpty());
  updateTitle();
  return true;
}

bool MainWindow::offerRecovery() {
  const auto orphans = Autosave::orphans();
  if (orphans.empty()) return false;
  const Autosave::Orphan& o = orphans.front();
  const QString when = QLocale().toString(o.saved_at, QLocale::ShortFormat);
  int answer = recovery_answer_;
  if (!answer) {
    QMessageBox box(QMessageBox::Question, tr("Recover unsaved work"),
                    tr("Recover unsaved work from %1?").arg(when), QMessageBox::NoButton, this);
    box.setInformativeText(
        o.workspace_path.isEmpty()
            ? tr("photolot did not close cleanly, and a copy of a lot that was never saved was "
                 "kept. Recover shows the bench logs it reads before reading them.")
            : tr("photolot did not close cleanly, and a copy of the unsaved changes to %1 was "
                 "kept. Recover shows the bench logs it reads before reading them.")
                  .arg(QFileInfo(o.workspace_path).fileName()));
    QPushButton* recover = box.addButton(tr("Recover"), QMessageBox::AcceptRole);
    box.addButton(QMessageBox::Discard);
    box.setDefaultButton(recover);
    box.exec();
    answer = box.clickedButton() == recover ? QMessageBox::Yes : QMessageBox::Discard;
  }
  if (answer != QMessageBox::Yes) {
    Autosave::remove(o);
    return false;
  }
  QFile file(o.path);
  if (!file.open(QIODevice::ReadOnly)) {
    tellUser(QMessageBox::Critical, tr("Recover unsaved work"),
             tr("cannot read the recovery copy '%1': %2").arg(o.path, file.errorString()));
    return false;
  }
  const QByteArray text = file.readAll();
  const QString folder =
      o.workspace_path.isEmpty() ? Autosave::folder() : QFileInfo(o.workspace_path).absolutePath();
  Workspace workspace;
  if (auto error =
          workspace_from_text(std::string_view(text.constData(), text.size()), folder, workspace)) {
    tellUser(QMessageBox::Critical, tr("Recover unsaved work"),
             tr("The recovery copy '%1' does not read (it is kept): %2")
                 .arg(o.path, QString::fromStdString(*error)));
    return false;
  }
  // Cancelling the list of files keeps the copy for the next start.
  if (!openWorkspaceDocument(o.path, std::move(workspace), folder)) return false;
  workspace_path_ = o.workspace_path;
  setModified(true);
  updateTitle();
  autosave_->saveNow();  // this run's own copy first, then the old one goes
  if (autosave_->hasCopy()) Autosave::remove(o);
  status_text_->setText(tr("Recovered the unsaved work of %1. Save it to keep it.").arg(when));
  return true;
}

Workspace MainWindow::currentWorkspace() const {
  Workspace w;
  for (const auto& s : session_.sources()) {
    w.sources.push_back(
        {s.path, s.sha256_hex, static_cast<std::uint64_t>(s.content.size()), {}, false});
  }
  w.import_options = session_.importOptions();
  w.fit_options = session_.fitOptions();
  w.model = {session_.modelOptions(), bench_profile_name_};
  if (const Lot* lot = session_.lot()) {
    for (int u : selectedUnits()) w.view.selected_units.push_back(lot->units[u].id);
  } else {
    w.view.selected_units = pending_selection_;
  }
  w.view.filter = filter_text_->text().toStdString();
  if (session_.spec()) {
    w.spec = {{"file", session_.spec()->source_file}, {"toml", spec_toml_}};
  }
  const auto imported = session_.importResult();
  const auto fit = session_.lotFit();
  if (imported && fit) {
    results::ResultsDocument doc = results::make_document(imported->lot, *fit);
    doc.with_residuals = true;  // the curves and residual plots come back without a refit
    if (const auto analysis = session_.analysis()) {
      doc.sections["statistics"] =
          results::Json::parse(lot_statistics_json(analysis->statistics).dump());
      if (analysis->acceptance) {
        doc.sections["acceptance"] =
            results::Json::parse(acceptance_json(*analysis->acceptance).dump());
      }
    }
    if (const auto pairing = session_.pairing()) {
      doc.sections["pairing"] = results::Json::parse(pairing_json(*pairing).dump());
    }
    w.results = nlohmann::json::parse(results::to_json_text(doc));
  }
  w.view.tab = tab_key(tabs_->currentIndex()).toStdString();
  return w;
}

bool MainWindow::saveWorkspaceTo(const QString& path) {
  if (QString error = save_workspace(path, currentWorkspace()); !error.isEmpty()) {
    QMessageBox::critical(this, tr("Save workspace"), error);
    return false;
  }
  workspace_path_ = QFileInfo(path).absoluteFilePath();
  rememberRecent(path);
  QSettings().setValue("folders/workspace", QFileInfo(path).absolutePath());
  setModified(false);
  updateTitle();
  status_text_->setText(tr("Saved %1").arg(QFileInfo(path).fileName()));
  return true;
}

bool MainWindow::save() {
  if (workspace_path_.isEmpty()) return saveAs();
  return saveWorkspaceTo(workspace_path_);
}

bool MainWindow::saveAs() {
  const QString folder =
      QSettings().value("folders/workspace", QSettings().value("folders/logs")).toString();
  QString path = QFileDialog::getSaveFileName(this, tr("Save workspace"), folder,
                                              tr("photolot workspace (*.photolot)"));
  if (path.isEmpty()) return false;
  if (QFileInfo(path).suffix().isEmpty()) path += QStringLiteral(".") + kWorkspaceSuffix;
  return saveWorkspaceTo(path);
}

bool MainWindow::maybeSave() {
  if (!isWindowModified()) return true;
  int answer = prompt_answer_;
  if (!answer) {
    answer = QMessageBox::warning(
        this, tr("Unsaved changes"),
        tr("The lot has changes that are not saved in a workspace. Save them first?"),
        QMessageBox::Save | QMessageBox::Discard | QMessageBox::Cancel, QMessageBox::Save);
  }
  if (answer == QMessageBox::Save) return save();
  return answer == QMessageBox::Discard;
}

void MainWindow::chooseLogs() {
  const QStringList paths = QFileDialog::getOpenFileNames(
      this, tr("Open bench logs"), QSettings().value("folders/logs").toString(),
      tr("Bench logs (*.csv *.txt *.tsv);;All files (*)"));
  if (!paths.isEmpty()) openLogs(paths, true);
}

void MainWindow::chooseWorkspace() {
  const QString path = QFileDialog::getOpenFileName(
      this, tr("Open workspace"), QSettings().value("folders/workspace").toString(),
      tr("photolot workspace (*.photolot)"));
  if (!path.isEmpty()) openWorkspace(path);
}

void MainWindow::editImportChoices() {
  if (session_.sources().empty()) {
    chooseLogs();
    return;
  }
  ImportDialog dialog(session_.sources(), session_.importOptions(), this);
  if (dialog.exec() == QDialog::Accepted) setImportOptions(dialog.options());
}

void MainWindow::editFitOptions() {
  QDialog dialog(this);
  dialog.setWindowTitle(tr("Fit options"));
  auto* form = new QFormLayout(&dialog);
  const fitting::FitOptions current = session_.fitOptions();
  auto* loss = new QComboBox(&dialog);
  loss->addItem(tr("Huber (robust)"), static_cast<int>(fitting::Loss::huber));
  loss->addItem(tr("Cauchy (more robust)"), static_cast<int>(fitting::Loss::cauchy));
  loss->addItem(tr("None (plain least squares)"), static_cast<int>(fitting::Loss::none));
  loss->setCurrentIndex(loss->findData(static_cast<int>(current.loss)));
  auto* accuracy = new QDoubleSpinBox(&dialog);
  accuracy->setRange(0.01, 20);
  accuracy->setDecimals(2);
  accuracy->setSuffix(tr(" % of reading"));
  accuracy->setValue(current.meter_accuracy_pct);
  auto* threshold = new QDoubleSpinBox(&dialog);
  threshold->setRange(1, 20);
  threshold->setDecimals(1);
  threshold->setValue(current.outlier_threshold);
  auto* confidence = new QDoubleSpinBox(&dialog);
  confidence->setRange(50, 99.9);
  confidence->setDecimals(1);
  confidence->setSuffix(tr(" %"));
  confidence->setValue(current.confidence * 100);
  const fitting::ExtendedFitOptions current_model = session_.modelOptions();
  auto* model = new QComboBox(&dialog);
  model->setObjectName(QStringLiteral("fitModel"));
  model->addItem(tr("Power law"), static_cast<int>(fitting::ModelChoice::power_law));
  model->addItem(tr("Dark conductance in parallel"),
                 static_cast<int>(fitting::ModelChoice::dark_conductance));
  model->addItem(tr("Choose per unit (lower AICc)"),
                 static_cast<int>(fitting::ModelChoice::choose));
  model->setCurrentIndex(model->findData(static_cast<int>(current_model.model)));
  auto* temperature = new QComboBox(&dialog);
  temperature->addItem(tr("Fit where identifiable, else the spec's coefficient"),
                       static_cast<int>(fitting::TemperatureMode::fit));
  temperature->addItem(tr("Off: results at the bench's temperature"),
                       static_cast<int>(fitting::TemperatureMode::off));
  temperature->setCurrentIndex(temperature->findData(static_cast<int>(current_model.temperature)));
  auto* bounds = new QCheckBox(tr("Over-range readings as one-sided bounds"), &dialog);
  bounds->setChecked(current_model.censored_terms);
  // The bench profile: its file is read when chosen; the workspace keeps its content.
  std::optional<BenchProfile> bench = current_model.bench;
  QString bench_name = QString::fromStdString(bench_profile_name_);
  auto* bench_label = new QLabel(&dialog);
  auto show_bench = [&] {
    bench_label->setText(bench ? (bench_name.isEmpty() ? tr("(from the workspace)") : bench_name)
                               : tr("none"));
  };
  show_bench();
  auto* bench_choose = new QPushButton(tr("Choose…"), &dialog);
  auto* bench_clear = new QPushButton(tr("None"), &dialog);
  connect(bench_choose, &QPushButton::clicked, &dialog, [&] {
    const QString path = QFileDialog::getOpenFileName(&dialog, tr("Bench profile"),
                                                      QSettings().value("folders/spec").toString(),
                                                      tr("Bench profile (*.toml);;All files (*)"));
    if (path.isEmpty()) return;
    BenchProfileResult loaded = load_bench_profile(path.toStdString());
    if (!loaded.ok()) {
      const FileError& e = *loaded.error;
      QMessageBox::critical(
          &dialog, tr("Bench profile"),
          QString::fromStdString(fmt::format("{}:{}:{}: {}", e.file, e.line, e.column, e.message)));
      return;
    }
    bench = loaded.profile;
    bench_name = QFileInfo(path).fileName();
    show_bench();
  });
  connect(bench_clear, &QPushButton::clicked, &dialog, [&] {
    bench.reset();
    bench_name.clear();
    show_bench();
  });
  auto* bench_row = new QHBoxLayout;
  bench_row->addWidget(bench_label, 1);
  bench_row->addWidget(bench_choose);
  bench_row->addWidget(bench_clear);
  form->addRow(tr("Curve model"), model);
  form->addRow(tr("Temperature"), temperature);
  form->addRow(QString(), bounds);
  form->addRow(tr("Bench profile"), bench_row);
  form->addRow(tr("Robust loss"), loss);
  form->addRow(tr("Meter accuracy"), accuracy);
  form->addRow(tr("Outlier beyond (× loss scale)"), threshold);
  form->addRow(tr("Interval confidence"), confidence);
  auto* buttons = new QDialogButtonBox(QDialogButtonBox::Ok | QDialogButtonBox::Cancel, &dialog);
  form->addRow(buttons);
  connect(buttons, &QDialogButtonBox::accepted, &dialog, &QDialog::accept);
  connect(buttons, &QDialogButtonBox::rejected, &dialog, &QDialog::reject);
  if (dialog.exec() != QDialog::Accepted) return;
  fitting::FitOptions options = current;
  options.loss = static_cast<fitting::Loss>(loss->currentData().toInt());
  options.meter_accuracy_pct = accuracy->value();
  options.outlier_threshold = threshold->value();
  options.confidence = confidence->value() / 100;
  fitting::ExtendedFitOptions model_options = current_model;
  model_options.model = static_cast<fitting::ModelChoice>(model->currentData().toInt());
  model_options.temperature =
      static_cast<fitting::TemperatureMode>(temperature->currentData().toInt());
  model_options.censored_terms = bounds->isChecked();
  model_options.bench = bench;
  std::string problem = options.validate();
  if (problem.empty()) problem = model_options.validate();
  if (!problem.empty()) {
    QMessageBox::warning(this, tr("Fit options"), QString::fromStdString(problem));
    return;
  }
  session_.setFitOptions(options);
  setFitHandling({model_options, bench_name.toStdString()});
}

void MainWindow::setFitHandling(const FitHandling& handling) {
  bench_profile_name_ = handling.bench_profile_name;
  session_.setModelOptions(handling.model);
  session_.run();
}

void MainWindow::exportPlot() {
  const bool spread = tabs_->currentWidget() == spread_;
  QString path = QFileDialog::getSaveFileName(
      this, tr("Export plot"), QSettings().value("folders/export").toString(),
      tr("PNG image (*.png);;SVG drawing (*.svg);;PDF document (*.pdf)"));
  if (path.isEmpty()) return;
  if (QFileInfo(path).suffix().isEmpty()) path += QStringLiteral(".png");
  const QString error = spread ? spread_->exportTo(path) : curves_->exportTo(path);
  if (!error.isEmpty()) {
    QMessageBox::critical(this, tr("Export plot"), error);
    return;
  }
  QSettings().setValue("folders/export", QFileInfo(path).absolutePath());
  status_text_->setText(tr("Exported %1").arg(QFileInfo(path).fileName()));
}

void MainWindow::printSummary() {
  if (!session_.lot() || !session_.lotFit()) {
    status_text_->setText(tr("Open and fit a lot first: the summary is of its fitted curves."));
    return;
  }
  QString path = QFileDialog::getSaveFileName(this, tr("Save lot summary"),
                                              QSettings().value("folders/export").toString(),
                                              tr("PDF document (*.pdf)"));
  if (path.isEmpty()) return;
  if (QFileInfo(path).suffix().isEmpty()) path += QStringLiteral(".pdf");
  if (const QString error = writeSummaryTo(path); !error.isEmpty()) {
    QMessageBox::critical(this, tr("Lot summary"), error);
    return;
  }
  QSettings().setValue("folders/export", QFileInfo(path).absolutePath());
  status_text_->setText(tr("Wrote %1").arg(QFileInfo(path).fileName()));
}

QString MainWindow::writeSummaryTo(const QString& path) {
#if defined(PHOTOLOT_WORKBENCH_REPORT)
  const Lot* lot = session_.lot();
  const auto fit = session_.lotFit();
  if (!lot || !fit) return tr("No fitted lot to summarise.");
  // The snapshots are held here for the whole call, whatever the worker does meanwhile.
  const auto analysis = session_.analysis();
  const auto pairing = session_.pairing();
  report::SummaryInput input;
  input.lot = lot;
  input.fit = fit.get();
  if (session_.spec()) input.spec = &*session_.spec();
  if (analysis) {
    input.stats = &analysis->statistics;
    if (analysis->acceptance) input.acceptance = &*analysis->acceptance;
    if (analysis->verdicts) input.verdicts = &*analysis->verdicts;
  }
  if (pairing) {
    report::PairsSection pairs;
    const PairOptions& o = pairing->options;
    pairs.method = fmt::format("{} tracking error over {:g}-{:g} lx, exact maximum matching ({})",
                               to_string(o.mode), o.lux_lo, o.lux_hi, to_string(pairing->proof));
    pairs.tolerance_pct = o.tolerance_pct;
    pairs.unpaired = pairing->unpaired.size();
    int n = 0;
    for (const auto& p : pairing->pairs) {
      pairs.rows.push_back({++n, p.a_id, p.b_id, p.tracking_error_pct, p.tracking_error_sigma_pct});
    }
    input.pairs = std::move(pairs);
  }
  if (input.spec) input.header.part = input.spec->part_number;
  input.header.lot_id = lot->name;
  input.header.date = QDate::currentDate().toString(Qt::ISODate).toStdString();
  input.software_version = PHOTOLOT_VERSION;
  return QString::fromStdString(report::write_lot_summary_pdf(input, path.toStdString()));
#else
  (void)path;
  return tr("The printed lot summary is not part of this build.");
#endif
}

void MainWindow::closeLot() {
  if (!maybeSave()) return;
  session_.clear();
  workspace_path_.clear();
  setModified(false);
  updateTitle();
}

void MainWindow::showHelp() {
  auto* dialog = new QDialog(this);
  dialog->setAttribute(Qt::WA_DeleteOnClose);
  dialog->setWindowTitle(tr("photolot guide"));
  dialog->resize(760, 720);
  auto* browser = new QTextBrowser(dialog);
  browser->setObjectName(QStringLiteral("helpBrowser"));
  browser->setOpenExternalLinks(false);
  browser->setHtml(help_html());
  auto* layout = new QVBoxLayout(dialog);
  layout->addWidget(browser);
  auto* buttons = new QDialogButtonBox(QDialogButtonBox::Close, dialog);
  connect(buttons, &QDialogButtonBox::rejected, dialog, &QDialog::close);
  layout->addWidget(buttons);
  dialog->show();
}

void MainWindow::showAbout() { QMessageBox::about(this, tr("About photolot"), about_html()); }

void MainWindow::onBusyChanged(bool busy) {
  progress_->setVisible(busy);
  cancel_button_->setVisible(busy);
  cancel_action_->setEnabled(busy);
  if (busy) {
    progress_->setRange(0, 0);
    status_text_->setText(tr("Working…"));
  } else {
    // The last progress poll arrives just before the session goes idle: put back what the
    // run ended with, so the status line never keeps saying "Fitting…" after the fit.
    status_text_->setText(result_text_.isEmpty() ? tr("Ready.") : result_text_);
  }
}

void MainWindow::showResult(const QString& text) {
  result_text_ = text;
  status_text_->setText(text);
}

void MainWindow::onProgress(AnalysisSession::Step step, qint64 done, qint64 total) {
  if (!session_.busy()) return;
  QString what;
  switch (step) {
    case AnalysisSession::Step::import:
      what = tr("Importing");
      break;
    case AnalysisSession::Step::fit:
      what = tr("Fitting");
      break;
    case AnalysisSession::Step::analysis:
      what = tr("Judging the lot");
      break;
    case AnalysisSession::Step::pairing:
      what = tr("Pairing");
      break;
    case AnalysisSession::Step::idle:
      return;
  }
  if (total <= 0) {
    progress_->setRange(0, 0);
  } else {
    // QProgressBar takes int: scale to per mille to keep large lots in range.
    progress_->setRange(0, 1000);
    progress_->setValue(static_cast<int>(1000 * done / total));
    progress_->setFormat(QStringLiteral("%1 / %2").arg(done).arg(total));
  }
  status_text_->setText(what + QStringLiteral("…"));
}

void MainWindow::onImportFinished() {
  const auto result = session_.importResult();
  if (!result) {
    import_log_->clear();
    model_->setLot(nullptr, nullptr);
    curves_->setLot(nullptr, nullptr);
    spread_->setFit(nullptr);
    acceptance_->setLotLoaded(false);
    lot_label_->setText(tr("No lot open"));
    updateCountLabel();
    return;
  }
  fill_diagnostics(import_log_, *result, 5000);
  const int issues = static_cast<int>(result->errors.size() + result->lot.diagnostics.size());
  tabs_->setTabText(4, issues ? tr("Import log (%1)").arg(issues) : tr("Import log"));

  std::shared_ptr<const Lot> lot(result, &result->lot);
  model_->setLot(lot, nullptr);
  curves_->setLot(lot.get(), nullptr);
  spread_->setFit(nullptr);
  QString name = QString::fromStdString(result->lot.name);
  if (name.isEmpty() && !session_.sources().empty()) {
    name = QFileInfo(QString::fromStdString(session_.sources()[0].path)).completeBaseName();
  }
  lot_label_->setText(
      tr("Lot %1 — %n unit(s)", "", static_cast<int>(result->lot.units.size())).arg(name));
  if (!result->errors.empty()) {
    showResult(QString::fromStdString(result->errors.front().message));
    tabs_->setCurrentWidget(import_log_);
  }
  updateCountLabel();
}

void MainWindow::onFitFinished() {
  const auto result = session_.importResult();
  const auto fit = session_.lotFit();
  if (!result) return;
  std::shared_ptr<const Lot> lot(result, &result->lot);
  std::vector<std::string> keep = pending_selection_;
  if (keep.empty()) {
    for (int u : selectedUnits()) keep.push_back(result->lot.units[u].id);
  }
  pending_selection_.clear();
  model_->setLot(lot, fit);
  filter_->sort(table_->horizontalHeader()->sortIndicatorSection(),
                table_->horizontalHeader()->sortIndicatorOrder());
  curves_->setLot(lot.get(), fit.get(), session_.curveSeries());
  spread_->setFit(fit.get());
  pairs_->setFit(fit);
  pairs_->setPairing(nullptr, session_.pairingWanted());
  acceptance_->setLotLoaded(fit != nullptr);
  // Select again what was selected (by unit id), or the first unit of a new lot.
  std::unordered_map<std::string, int> by_id;
  for (std::size_t i = 0; i < result->lot.units.size(); ++i)
    by_id[result->lot.units[i].id] = int(i);
  std::vector<int> units;
  for (const auto& id : keep) {
    if (auto it = by_id.find(id); it != by_id.end()) units.push_back(it->second);
  }
  if (units.empty() && !result->lot.units.empty()) {
    units.push_back(filter_->mapToSource(filter_->index(0, 0)).row());
  }
  selectUnits(units);
  const FitHandling handling{session_.effectiveModelOptions(), bench_profile_name_};
  acceptance_->setFitHandling(describe_fit_handling(fit.get(), handling));
  if (fit) {
    showResult(tr("%1 of %2 units fitted; %3. %4")
                   .arg(fit->fitted_count())
                   .arg(fit->units.size())
                   .arg(brief_fit_handling(*fit, handling), QString::fromStdString(fit->method)));
  }
  updateCountLabel();
}

void MainWindow::onAnalysisFinished() {
  const auto analysis = session_.analysis();
  const Lot* lot = session_.lot();
  const bool spec_loaded = session_.spec().has_value();
  acceptance_->setAnalysis(analysis, lot ? lot->units.size() : 0, spec_loaded);
  pairs_->setSpecLoaded(spec_loaded);
  std::vector<UnitVerdictText> verdicts;
  if (analysis && analysis->verdicts) {
    for (const auto& v : *analysis->verdicts) {
      UnitVerdictText t;
      t.kind = v.verdict == Verdict::conforming ? UnitVerdictKind::conforming
                                                : UnitVerdictKind::nonconforming;
      QStringList reasons;
      for (const auto& r : v.reasons) reasons << QString::fromStdString(r.text);
      t.text = v.verdict == Verdict::conforming
                   ? tr("pass")
                   : tr("fail: %1").arg(reasons.join(QStringLiteral("; ")));
      verdicts.push_back(std::move(t));
    }
  }
  model_->setVerdicts(std::move(verdicts));
  verdict_filter_->setEnabled(model_->verdictsAvailable());
  std::optional<std::pair<double, double>> r10, gamma, r10_ti, gamma_ti;
  if (const auto& spec = session_.spec()) {
    if (spec->r10_ohm.has_min() && spec->r10_ohm.has_max())
      r10 = {{spec->r10_ohm.min, spec->r10_ohm.max}};
    if (spec->gamma.has_min() && spec->gamma.has_max())
      gamma = {{spec->gamma.min, spec->gamma.max}};
  }
  if (analysis) {
    const auto& st = analysis->statistics;
    if (std::isfinite(st.ln_r10.tolerance_interval[0])) {
      r10_ti = {
          {std::exp(st.ln_r10.tolerance_interval[0]), std::exp(st.ln_r10.tolerance_interval[1])}};
    }
    if (std::isfinite(st.gamma.tolerance_interval[0])) {
      gamma_ti = {{st.gamma.tolerance_interval[0], st.gamma.tolerance_interval[1]}};
    }
  }
  curves_->setSpecWindow(r10);
  spread_->setR10Limits(r10);
  spread_->setGammaLimits(gamma);
  spread_->setToleranceIntervals(r10_ti, gamma_ti);
}

void MainWindow::onPairingFinished() {
  pairs_->setPairing(session_.pairing(), false, session_.pairingEligibility());
}

void MainWindow::openSpec() {
  const QString path = QFileDialog::getOpenFileName(this, tr("Open spec"),
                                                    QSettings().value("folders/spec").toString(),
                                                    tr("photolot spec (*.toml);;All files (*)"));
  if (!path.isEmpty()) openSpecFile(path);
}

bool MainWindow::openSpecFile(const QString& path) {
  // Read as the command line reads it: a regular file only (never a pipe), within the limit.
  FileRead read = read_regular_file(path.toStdString(), kMaxSpecFileBytes);
  if (!read.ok()) {
    QMessageBox::critical(this, tr("Open spec"),
                          tr("cannot read '%1': %2")
                              .arg(path, QString::fromStdString(describe(read))));
    return false;
  }
  const std::string text = std::move(read.text);
  SpecLoadResult loaded = parse_spec(text, path.toStdString());
  if (!loaded.ok()) {
    QStringList lines;
    for (const auto& e : loaded.errors) lines << QString::fromStdString(to_string(e));
    QMessageBox::critical(this, tr("Open spec"), lines.join(QLatin1Char('\n')));
    return false;
  }
  QSettings().setValue("folders/spec", QFileInfo(path).absolutePath());
  loaded.spec->source_file = QFileInfo(path).fileName().toStdString();
  acceptance_->showSpec(loaded.spec);
  applySpec(loaded.spec);
  spec_toml_ = text;
  return true;
}

void MainWindow::findPairs() { emit pairs_->findRequested(pairs_->options()); }

void MainWindow::saveSpec() {
  QString problem;
  const auto spec = acceptance_->specFromForm(&problem);
  if (!spec) {
    QMessageBox::warning(this, tr("Save spec"), problem);
    return;
  }
  QString path = QFileDialog::getSaveFileName(this, tr("Save spec"),
                                              QSettings().value("folders/spec").toString(),
                                              tr("photolot spec (*.toml)"));
  if (path.isEmpty()) return;
  if (QFileInfo(path).suffix().isEmpty()) path += QStringLiteral(".toml");
  const std::string text = spec_to_toml(*spec);
  QSaveFile file(path);
  if (!file.open(QIODevice::WriteOnly) || file.write(text.data(), qint64(text.size())) < 0 ||
      !file.commit()) {
    QMessageBox::critical(this, tr("Save spec"),
                          tr("cannot write '%1': %2").arg(path, file.errorString()));
    return;
  }
  QSettings().setValue("folders/spec", QFileInfo(path).absolutePath());
  status_text_->setText(tr("Saved spec %1").arg(QFileInfo(path).fileName()));
}

void MainWindow::applySpec(std::optional<Spec> spec) {
  spec_toml_ = spec ? spec_to_toml(*spec) : std::string();
  session_.setSpec(std::move(spec));
  session_.run();
}

void MainWindow::savePickList() {
  const auto pairing = session_.pairing();
  if (!pairing) return;
  QString path = QFileDialog::getSaveFileName(this, tr("Save pick list"),
                                              QSettings().value("folders/export").toString(),
                                              tr("CSV (*.csv)"));
  if (path.isEmpty()) return;
  if (QFileInfo(path).suffix().isEmpty()) path += QStringLiteral(".csv");
  if (const std::string error = write_pick_list_csv(*pairing, path.toStdString()); !error.empty()) {
    QMessageBox::critical(this, tr("Save pick list"), QString::fromStdString(error));
  }
}

void MainWindow::selectUnits(const std::vector<int>& units) {
  // One range per run of consecutive table rows: a selection of thousands of single rows is
  // slow in Qt's selection model, a few ranges are not.
  std::vector<int> rows;
  rows.reserve(units.size());
  for (int u : units) {
    const QModelIndex proxy = filter_->mapFromSource(model_->index(u, 0));
    if (proxy.isValid()) rows.push_back(proxy.row());
  }
  std::sort(rows.begin(), rows.end());
  QItemSelection selection;
  const int last_column = UnitTableModel::kColumnCount - 1;
  for (std::size_t i = 0; i < rows.size();) {
    std::size_t j = i;
    while (j + 1 < rows.size() && rows[j + 1] <= rows[j] + 1) ++j;
    selection.append(
        QItemSelectionRange(filter_->index(rows[i], 0), filter_->index(rows[j], last_column)));
    i = j + 1;
  }
  table_->selectionModel()->select(selection,
                                   QItemSelectionModel::ClearAndSelect | QItemSelectionModel::Rows);
  // The first row, not selection.indexes(): that lists every cell of every range.
  if (!rows.empty()) table_->scrollTo(filter_->index(rows.front(), 0));
  selection_timer_.stop();
  onSelectionChanged();
}

std::vector<int> MainWindow::selectedUnits() const {
  std::vector<int> units;
  for (const QModelIndex& index : table_->selectionModel()->selectedRows()) {
    units.push_back(filter_->mapToSource(index).row());
  }
  std::sort(units.begin(), units.end());
  return units;
}

void MainWindow::onSelectionChanged() {
  const std::vector<int> units = selectedUnits();
  curves_->setUnits(units);
  spread_->setSelectedUnits(units);
  updateCountLabel();
}

void MainWindow::updateCountLabel() {
  const int shown = filter_->rowCount();
  const int total = model_->rowCount();
  const int selected = static_cast<int>(table_->selectionModel()->selectedRows().size());
  count_label_->setText(
      tr("%1 of %2 units shown, %3 selected").arg(shown).arg(total).arg(selected));
}

void MainWindow::setModified(bool modified) {
  setWindowModified(modified);
  // Unsaved work gets a recovery copy; saved or discarded work needs none.
  if (modified) {
    autosave_->markDirty();
  } else {
    autosave_->discard();
  }
}

void MainWindow::updateTitle() {
  QString name = tr("untitled");
  if (!workspace_path_.isEmpty()) {
    name = QFileInfo(workspace_path_).fileName();
  } else if (!session_.sources().empty()) {
    name = QFileInfo(QString::fromStdString(session_.sources()[0].path)).fileName();
  }
  setWindowTitle(QStringLiteral("%1[*] — photolot").arg(name));
}

void MainWindow::closeEvent(QCloseEvent* event) {
  if (!maybeSave()) {
    event->ignore();
    return;
  }
  session_.cancel();
  QSettings settings;
  settings.setValue("window/geometry", saveGeometry());
  settings.setValue("window/state", saveState());
  settings.setValue("window/splitter", splitter_->saveState());
  settings.setValue("window/unitTableV2", table_->horizontalHeader()->saveState());
  autosave_->discard();  // a clean exit: the work was saved or thrown away on purpose
  event->accept();
}

void MainWindow::dragEnterEvent(QDragEnterEvent* event) {
  if (event->mimeData()->hasUrls()) event->acceptProposedAction();
}

void MainWindow::dropEvent(QDropEvent* event) {
  QStringList paths;
  for (const QUrl& url : event->mimeData()->urls()) {
    if (url.isLocalFile()) paths << url.toLocalFile();
  }
  if (paths.isEmpty()) return;
  event->acceptProposedAction();
  // Dropped logs go through the import dialog, as from the menu; a workspace opens directly.
  if (paths.size() == 1 && QFileInfo(paths[0]).suffix() == kWorkspaceSuffix) {
    openWorkspace(paths[0]);
  } else {
    QTimer::singleShot(0, this, [this, paths] { openLogs(paths, true); });
  }
}

}  // namespace photolot::workbench
