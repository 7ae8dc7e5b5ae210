#include "import_dialog.h"

#include <fmt/format.h>

#include <QComboBox>
#include <QDialogButtonBox>
#include <QFileInfo>
#include <QFormLayout>
#include <QGroupBox>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QInputDialog>
#include <QLabel>
#include <QLineEdit>
#include <QPushButton>
#include <QSplitter>
#include <QTableWidget>
#include <QTreeWidget>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>
#include <charconv>
#include <cmath>

#include "diagnostics_list.h"

namespace photolot::workbench {
namespace {

QString char_name(char c) {
  switch (c) {
    case ',':
      return QObject::tr("comma");
    case ';':
      return QObject::tr("semicolon");
    case '\t':
      return QObject::tr("tab");
    case '.':
      return QObject::tr("point");
    case 0:
      return QObject::tr("detect");
    default:
      return QString(QLatin1Char(c));
  }
}

QComboBox* choice_box(QWidget* parent, const std::vector<std::pair<QString, QString>>& items) {
  auto* box = new QComboBox(parent);
  for (const auto& [label, data] : items) box->addItem(label, data);
  return box;
}

void select_data(QComboBox* box, const QString& data) {
  const int i = box->findData(data);
  box->setCurrentIndex(i >= 0 ? i : 0);
}

QString role_name(ColumnRole role) {
  switch (role) {
    case ColumnRole::unit_id:
      return QObject::tr("unit id");
    case ColumnRole::lux:
      return QObject::tr("illuminance");
    case ColumnRole::ohm:
      return QObject::tr("resistance");
    case ColumnRole::temp_c:
      return QObject::tr("temperature");
    case ColumnRole::ignored:
      return QObject::tr("not used");
  }
  return {};
}

}  // namespace

ImportDialog::ImportDialog(std::vector<SourceFile> sources, const ImportOptions& options,
                           QWidget* parent)
    : QDialog(parent), sources_(std::move(sources)) {
  setWindowTitle(tr("Import bench logs"));
  setObjectName(QStringLiteral("importDialog"));
  resize(980, 680);

  file_ = new QComboBox(this);
  for (const auto& s : sources_) {
    file_->addItem(QFileInfo(QString::fromStdString(s.path)).fileName(),
                   QString::fromStdString(s.path));
  }
  profile_ = new QComboBox(this);
  auto* save_profile = new QPushButton(tr("Save as profile…"), this);
  auto* delete_profile = new QPushButton(tr("Delete profile"), this);

  delimiter_ = choice_box(
      this,
      {{tr("detect"), ""}, {tr("comma  ,"), ","}, {tr("semicolon  ;"), ";"}, {tr("tab"), "\t"}});
  decimal_ = choice_box(this, {{tr("detect"), ""}, {tr("point  ."), "."}, {tr("comma  ,"), ","}});
  id_column_ = new QComboBox(this);
  lux_column_ = new QComboBox(this);
  ohm_column_ = new QComboBox(this);
  temp_column_ = new QComboBox(this);
  lux_unit_ =
      choice_box(this, {{tr("detect"), ""}, {tr("lx"), "lx"}, {tr("fc (footcandle)"), "fc"}});
  ohm_unit_ = choice_box(
      this, {{tr("detect"), ""}, {tr("Ω"), "ohm"}, {tr("kΩ"), "kohm"}, {tr("MΩ"), "Mohm"}});
  temp_unit_ = choice_box(this, {{tr("detect"), ""}, {tr("°C"), "degC"}, {tr("K"), "K"}});
  overload_ = new QLineEdit(this);
  overload_->setPlaceholderText(tr("none (ohm, e.g. 20000000)"));
  default_id_ = new QLineEdit(this);
  default_id_->setPlaceholderText(tr("for a log of one unit without an id column"));

  auto* form = new QFormLayout;
  form->addRow(tr("Preview of"), file_);
  form->addRow(tr("Delimiter"), delimiter_);
  form->addRow(tr("Decimal mark"), decimal_);
  form->addRow(tr("Unit id column"), id_column_);
  form->addRow(tr("Illuminance column"), lux_column_);
  form->addRow(tr("  its unit"), lux_unit_);
  form->addRow(tr("Resistance column"), ohm_column_);
  form->addRow(tr("  its unit"), ohm_unit_);
  form->addRow(tr("Temperature column"), temp_column_);
  form->addRow(tr("  its unit"), temp_unit_);
  form->addRow(tr("Over-range bound"), overload_);
  form->addRow(tr("Unit id if none"), default_id_);
  auto* profile_row = new QHBoxLayout;
  profile_row->addWidget(profile_, 1);
  profile_row->addWidget(save_profile);
  profile_row->addWidget(delete_profile);
  form->addRow(tr("Profile"), profile_row);

  auto* choices = new QGroupBox(tr("Choices"), this);
  choices->setLayout(form);

  detected_ = new QLabel(this);
  detected_->setWordWrap(true);
  detected_->setTextInteractionFlags(Qt::TextSelectableByMouse);
  preview_ = new QTableWidget(this);
  preview_->setObjectName(QStringLiteral("importPreview"));
  preview_->setEditTriggers(QAbstractItemView::NoEditTriggers);
  preview_->horizontalHeader()->setDefaultAlignment(Qt::AlignLeft);
  summary_ = new QLabel(this);
  summary_->setWordWrap(true);
  diagnostics_ = new QTreeWidget(this);
  diagnostics_->setObjectName(QStringLiteral("importDiagnostics"));
  diagnostics_->setHeaderLabels(
      {tr("File"), tr("Line"), tr("Column"), tr("Severity"), tr("Message")});
  diagnostics_->setRootIsDecorated(false);

  auto* right = new QWidget(this);
  auto* right_layout = new QVBoxLayout(right);
  right_layout->setContentsMargins(0, 0, 0, 0);
  right_layout->addWidget(detected_);
  right_layout->addWidget(preview_, 3);
  right_layout->addWidget(summary_);
  right_layout->addWidget(diagnostics_, 2);

  auto* split = new QSplitter(this);
  split->addWidget(choices);
  split->addWidget(right);
  split->setStretchFactor(1, 1);

  auto* buttons = new QDialogButtonBox(QDialogButtonBox::Ok | QDialogButtonBox::Cancel, this);
  buttons->button(QDialogButtonBox::Ok)->setText(tr("Import"));
  connect(buttons, &QDialogButtonBox::accepted, this, &QDialog::accept);
  connect(buttons, &QDialogButtonBox::rejected, this, &QDialog::reject);

  auto* layout = new QVBoxLayout(this);
  layout->addWidget(split, 1);
  layout->addWidget(buttons);

  profile_->addItem(tr("(none)"));
  profile_->addItems(profiles_.names());
  connect(profile_, &QComboBox::activated, this, &ImportDialog::applyProfile);
  connect(save_profile, &QPushButton::clicked, this, &ImportDialog::saveProfile);
  connect(delete_profile, &QPushButton::clicked, this, [this] {
    if (profile_->currentIndex() <= 0) return;
    profiles_.remove(profile_->currentText());
    profile_->removeItem(profile_->currentIndex());
  });

  for (QComboBox* box : {file_, delimiter_, decimal_, id_column_, lux_column_, ohm_column_,
                         temp_column_, lux_unit_, ohm_unit_, temp_unit_}) {
    connect(box, &QComboBox::currentIndexChanged, this, [this] {
      if (!updating_) refresh();
    });
  }
  for (QLineEdit* edit : {overload_, default_id_}) {
    connect(edit, &QLineEdit::editingFinished, this, [this] { refresh(); });
  }
  connect(&watcher_, &QFutureWatcher<ImportResult>::finished, this, &ImportDialog::showTrial);

  setOptions(options);
}

ImportDialog::~ImportDialog() { watcher_.waitForFinished(); }

ImportOptions ImportDialog::options() const {
  ImportOptions o;
  const auto first = [](QComboBox* box) {
    const QString s = box->currentData().toString();
    return s.isEmpty() ? char(0) : s.toLatin1().at(0);
  };
  o.delimiter = first(delimiter_);
  o.decimal = first(decimal_);
  o.id_column = id_column_->currentData().toString().toStdString();
  o.lux_column = lux_column_->currentData().toString().toStdString();
  o.ohm_column = ohm_column_->currentData().toString().toStdString();
  o.temp_column = temp_column_->currentData().toString().toStdString();
  o.lux_unit = lux_unit_->currentData().toString().toStdString();
  o.ohm_unit = ohm_unit_->currentData().toString().toStdString();
  o.temp_unit = temp_unit_->currentData().toString().toStdString();
  const std::string bound = overload_->text().trimmed().toStdString();
  double value = kNaN;
  if (!bound.empty()) {
    auto [ptr, ec] = std::from_chars(bound.data(), bound.data() + bound.size(), value);
    if (ec != std::errc() || ptr != bound.data() + bound.size()) value = kNaN;
  }
  o.overload_ohm = value;
  o.default_unit_id = default_id_->text().trimmed().toStdString();
  return o;
}

void ImportDialog::setOptions(const ImportOptions& o) {
  updating_ = true;
  select_data(delimiter_, o.delimiter ? QString(QLatin1Char(o.delimiter)) : QString());
  select_data(decimal_, o.decimal ? QString(QLatin1Char(o.decimal)) : QString());
  select_data(lux_unit_, QString::fromStdString(o.lux_unit));
  select_data(ohm_unit_, QString::fromStdString(o.ohm_unit));
  select_data(temp_unit_, QString::fromStdString(o.temp_unit));
  overload_->setText(std::isfinite(o.overload_ohm)
                         ? QString::fromStdString(fmt::format("{}", o.overload_ohm))
                         : QString());
  default_id_->setText(QString::fromStdString(o.default_unit_id));
  // Columns need the layout's headers first.
  const int f = std::max(0, file_->currentIndex());
  if (!sources_.empty()) layout_ = run_detect(sources_[static_cast<std::size_t>(f)], o);
  fillColumnChoices();
  select_data(id_column_, QString::fromStdString(o.id_column));
  select_data(lux_column_, QString::fromStdString(o.lux_column));
  select_data(ohm_column_, QString::fromStdString(o.ohm_column));
  select_data(temp_column_, QString::fromStdString(o.temp_column));
  updating_ = false;
  refresh();
}

void ImportDialog::fillColumnChoices() {
  for (QComboBox* box : {id_column_, lux_column_, ohm_column_, temp_column_}) {
    const QString keep = box->currentData().toString();
    box->clear();
    box->addItem(tr("detect"), QString());
    for (const auto& c : layout_.columns) {
      box->addItem(QStringLiteral("%1: %2").arg(c.index + 1).arg(QString::fromStdString(c.header)),
                   QString::number(c.index + 1));
    }
    select_data(box, keep);
  }
}

void ImportDialog::refresh() {
  if (sources_.empty()) return;
  const ImportOptions o = options();
  const int f = std::max(0, file_->currentIndex());
  const std::size_t old_columns = layout_.columns.size();
  layout_ = run_detect(sources_[static_cast<std::size_t>(f)], o);
  if (layout_.columns.size() != old_columns) {
    updating_ = true;
    fillColumnChoices();
    updating_ = false;
  }

  {
    QStringList cols;
    for (const auto& c : layout_.columns) {
      if (c.role == ColumnRole::ignored) continue;
      cols << QStringLiteral("%1 → %2%3")
                  .arg(QString::fromStdString(c.header), role_name(c.role),
                       c.unit.empty()
                           ? QString()
                           : QStringLiteral(" (%1)").arg(QString::fromStdString(c.unit)));
    }
    detected_->setText(
        tr("<b>Read as:</b> delimiter %1, decimal mark %2, header on line %3%4.<br>"
           "<b>Columns:</b> %5")
            .arg(char_name(layout_.delimiter), char_name(layout_.decimal))
            .arg(layout_.header_line)
            .arg(layout_.had_bom ? tr(", byte-order mark") : QString())
            .arg(cols.isEmpty() ? tr("none recognised") : cols.join(QStringLiteral(", "))));
  }

  preview_->clear();
  preview_->setColumnCount(static_cast<int>(layout_.columns.size()));
  QStringList headers;
  for (const auto& c : layout_.columns) {
    headers << QStringLiteral("%1\n%2%3")
                   .arg(QString::fromStdString(c.header), role_name(c.role),
                        c.unit.empty()
                            ? QString()
                            : QStringLiteral(", %1").arg(QString::fromStdString(c.unit)));
  }
  preview_->setHorizontalHeaderLabels(headers);
  preview_->setRowCount(static_cast<int>(layout_.preview.size()));
  for (std::size_t r = 0; r < layout_.preview.size(); ++r) {
    const auto& row = layout_.preview[r];
    for (std::size_t c = 0; c < row.size() && c < layout_.columns.size(); ++c) {
      preview_->setItem(static_cast<int>(r), static_cast<int>(c),
                        new QTableWidgetItem(QString::fromStdString(row[c])));
    }
  }
  startTrial();
}

void ImportDialog::startTrial() {
  if (watcher_.isRunning()) {
    trial_pending_ = true;  // the newest choices are tried when this one ends
    return;
  }
  summary_->setText(tr("Checking every row…"));
  watcher_.setFuture(QtConcurrent::run(
      [sources = sources_, options = options()] { return run_import(sources, options); }));
}

void ImportDialog::showTrial() {
  if (trial_pending_) {
    trial_pending_ = false;
    startTrial();
    return;
  }
  const ImportResult result = watcher_.result();
  const auto& c = result.lot.counts;
  summary_->setText(tr("%1 units; %2 rows read, %3 used, %4 skipped, %5 duplicates dropped, "
                       "%6 conflicts, %7 over range, %8 dark.")
                        .arg(result.lot.units.size())
                        .arg(c.rows_read)
                        .arg(c.rows_used)
                        .arg(c.rows_skipped)
                        .arg(c.duplicates_dropped)
                        .arg(c.conflicts)
                        .arg(c.censored)
                        .arg(c.dark));
  fill_diagnostics(diagnostics_, result, 2000);  // the rest are counted, not listed
  emit trialFinished();
}

void ImportDialog::saveProfile() {
  bool ok = false;
  const QString name =
      QInputDialog::getText(this, tr("Save import profile"), tr("Profile name:"), QLineEdit::Normal,
                            profile_->currentIndex() > 0 ? profile_->currentText() : QString(), &ok)
          .trimmed();
  if (!ok || name.isEmpty()) return;
  saveProfileAs(name);
}

void ImportDialog::saveProfileAs(const QString& name) {
  profiles_.save(name, options());
  if (profile_->findText(name) < 0) profile_->addItem(name);
  profile_->setCurrentText(name);
}

bool ImportDialog::chooseProfile(const QString& name) {
  const int index = profile_->findText(name);
  if (index <= 0) return false;
  profile_->setCurrentIndex(index);
  applyProfile(index);
  return true;
}

void ImportDialog::applyProfile(int index) {
  if (index <= 0) return;
  if (auto options = profiles_.load(profile_->itemText(index))) setOptions(*options);
}

}  // namespace photolot::workbench
