#include "source_check_dialog.h"

#include <fmt/format.h>

#include <QDialogButtonBox>
#include <QFileInfo>
#include <QHeaderView>
#include <QLabel>
#include <QLocale>
#include <QPushButton>
#include <QTreeWidget>
#include <QVBoxLayout>

namespace photolot::workbench {

std::vector<SourceRow> look_at_sources(const Workspace& workspace, const QString& folder) {
  std::vector<SourceRow> rows;
  const std::filesystem::path dir(folder.toStdString());
  for (const auto& s : workspace.sources) {
    workspace::Source source;
    source.path = std::filesystem::path(s.path);
    source.outside_folder = s.outside_folder;
    rows.push_back({s, workspace::check_source(source, dir)});
  }
  return rows;
}

QString where_text(const SourceRow& row) {
  return row.check.outside_folder ? QObject::tr("OUTSIDE the workspace's folder")
                                  : QObject::tr("in the workspace's folder");
}

QString state_text(const SourceRow& row) {
  if (row.usable()) {
    return QObject::tr("file, %1")
        .arg(QLocale::c().formattedDataSize(static_cast<qint64>(row.check.bytes), 1,
                                            QLocale::DataSizeSIFormat));
  }
  return QString::fromStdString(row.check.detail);
}

SourceCheckDialog::SourceCheckDialog(const QString& workspace_path,
                                     const std::vector<SourceRow>& rows,
                                     const std::vector<std::string>& warnings, QWidget* parent)
    : QDialog(parent) {
  setObjectName(QStringLiteral("sourceCheckDialog"));
  setWindowTitle(tr("Open workspace: the files it reads"));
  resize(860, 360);
  auto* layout = new QVBoxLayout(this);
  int outside = 0, unusable = 0;
  for (const auto& r : rows) {
    outside += r.check.outside_folder;
    unusable += !r.usable();
  }
  auto* intro =
      new QLabel(tr("<b>%1</b> names these bench logs. None has been read yet: check them before "
                    "photolot opens any.")
                     .arg(QFileInfo(workspace_path).fileName().toHtmlEscaped()),
                 this);
  intro->setWordWrap(true);
  layout->addWidget(intro);

  list_ = new QTreeWidget(this);
  list_->setObjectName(QStringLiteral("sourceList"));
  list_->setRootIsDecorated(false);
  list_->setHeaderLabels({tr("File"), tr("Where"), tr("On disk"), tr("As written")});
  list_->header()->setSectionResizeMode(0, QHeaderView::Stretch);
  for (const auto& r : rows) {
    auto* item = new QTreeWidgetItem(list_);
    QString shown = QString::fromStdString(r.source.path);
    const QString real = QString::fromStdString(r.check.real_path.string());
    if (!real.isEmpty() && real != shown) shown += QStringLiteral("  →  ") + real;
    item->setText(0, shown);
    item->setText(1, where_text(r));
    item->setText(2, state_text(r));
    item->setText(3, QString::fromStdString(r.source.stored_path));
    item->setToolTip(0, shown);
    if (r.check.outside_folder) {
      QFont bold = item->font(1);
      bold.setBold(true);
      item->setFont(1, bold);
      item->setForeground(1, QColor(0xa0, 0x50, 0x00));
    }
    if (!r.usable()) item->setForeground(2, QColor(0xb0, 0x00, 0x20));
  }
  layout->addWidget(list_, 1);

  QStringList notes;
  if (rows.empty()) notes << tr("The workspace names no bench logs.");
  if (outside) {
    notes << tr(
        "%n file(s) lie outside the workspace's folder: open them only if you expected "
        "this workspace to read them.",
        "", outside);
  }
  if (unusable) {
    notes << tr(
        "%n file(s) cannot be read (shown in red). Put them back beside the workspace, "
        "or open the logs themselves.",
        "", unusable);
  }
  for (const auto& w : warnings) notes << QString::fromStdString(w);
  summary_ = new QLabel(notes.join(QLatin1Char('\n')), this);
  summary_->setObjectName(QStringLiteral("sourceSummary"));
  summary_->setWordWrap(true);
  summary_->setTextInteractionFlags(Qt::TextSelectableByMouse);
  layout->addWidget(summary_);

  auto* buttons = new QDialogButtonBox(this);
  read_ = buttons->addButton(tr("Read These Files"), QDialogButtonBox::AcceptRole);
  read_->setObjectName(QStringLiteral("readSourcesButton"));
  read_->setEnabled(unusable == 0);
  auto* cancel = buttons->addButton(QDialogButtonBox::Cancel);
  // Enter reads only a list with nothing to look at twice.
  const bool plain = unusable == 0 && outside == 0;
  read_->setDefault(plain);
  cancel->setDefault(!plain);
  connect(buttons, &QDialogButtonBox::accepted, this, &QDialog::accept);
  connect(buttons, &QDialogButtonBox::rejected, this, &QDialog::reject);
  layout->addWidget(buttons);
}

}  // namespace photolot::workbench
