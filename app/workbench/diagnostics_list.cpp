#include "diagnostics_list.h"

#include <QFileInfo>
#include <QObject>
#include <QTreeWidget>

#include <fmt/format.h>

namespace photolot::workbench {

void fill_diagnostics(QTreeWidget* list, const ImportResult& result, std::size_t shown) {
  list->clear();
  auto add = [list](const std::string& file, std::uint32_t line, std::uint32_t column,
                    const QString& severity, const std::string& message) {
    auto* item = new QTreeWidgetItem(list);
    item->setText(0, QFileInfo(QString::fromStdString(file)).fileName());
    item->setToolTip(0, QString::fromStdString(file));
    item->setText(1, line ? QString::number(line) : QString());
    item->setText(2, column ? QString::number(column) : QString());
    item->setText(3, severity);
    item->setText(4, QString::fromStdString(message));
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
  list->resizeColumnToContents(0);
}

}  // namespace photolot::workbench
