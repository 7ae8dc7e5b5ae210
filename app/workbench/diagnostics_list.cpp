#include "diagnostics_list.h"

#include <QFileInfo>
#include <QObject>
#include <QTreeWidget>

#include <fmt/format.h>

namespace photolot::workbench {

void fill_diagnostics(QTreeWidget* list, const ImportResult& result, std::size_t shown) {
  list->clear();
  // Items are made without a parent and handed over in one call: one insertion for the view
  // instead of thousands (a big lot's over-range readings), and one file name per file.
  QList<QTreeWidgetItem*> items;
  std::string last_file;
  QString last_name;
  auto add = [&](const std::string& file, std::uint32_t line, std::uint32_t column,
                 const QString& severity, const std::string& message) {
    auto* item = new QTreeWidgetItem;
    if (file != last_file || last_name.isEmpty()) {
      last_file = file;
      last_name = QFileInfo(QString::fromStdString(file)).fileName();
    }
    item->setText(0, last_name);
    item->setToolTip(0, QString::fromStdString(file));
    item->setText(1, line ? QString::number(line) : QString());
    item->setText(2, column ? QString::number(column) : QString());
    item->setText(3, severity);
    item->setText(4, QString::fromStdString(message));
    items.append(item);
  };
  for (const auto& e : result.errors) add(e.file, e.line, e.column, QObject::tr("error"), e.message);
  const auto& diagnostics = result.lot.diagnostics;
  for (std::size_t i = 0; i < diagnostics.size() && i < shown; ++i) {
    const auto& d = diagnostics[i];
    add(d.file, d.line, d.column, QString::fromUtf8(to_string(d.severity).data()), d.message);
  }
  if (diagnostics.size() > shown) {
    add({}, 0, 0, QObject::tr("note"), fmt::format("{} more not listed", diagnostics.size() - shown));
  }
  list->addTopLevelItems(items);
  list->resizeColumnToContents(0);
}

}  // namespace photolot::workbench
