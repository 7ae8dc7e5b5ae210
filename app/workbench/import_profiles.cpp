#include "import_profiles.h"

#include <QSettings>

#include "photolot/workspace_doc.h"

namespace photolot::workbench {
namespace {
constexpr const char* kGroup = "importProfiles";
}

QStringList ImportProfiles::names() const {
  QSettings settings;
  settings.beginGroup(kGroup);
  QStringList keys = settings.childKeys();
  keys.sort(Qt::CaseInsensitive);
  return keys;
}

std::optional<ImportOptions> ImportProfiles::load(const QString& name) const {
  QSettings settings;
  settings.beginGroup(kGroup);
  const QString text = settings.value(name).toString();
  if (text.isEmpty()) return std::nullopt;
  const auto j = results::Json::parse(text.toStdString(), nullptr, false);
  ImportOptions options;
  if (j.is_discarded() || workspace::from_json(j, options)) return std::nullopt;
  return options;
}

void ImportProfiles::save(const QString& name, const ImportOptions& options) {
  QSettings settings;
  settings.beginGroup(kGroup);
  settings.setValue(name, QString::fromStdString(workspace::to_json(options).dump()));
}

void ImportProfiles::remove(const QString& name) {
  QSettings settings;
  settings.beginGroup(kGroup);
  settings.remove(name);
}

}  // namespace photolot::workbench
