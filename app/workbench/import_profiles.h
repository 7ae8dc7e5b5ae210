// Named import profiles: an ImportOptions saved under a name the user chose ("bench 2 semicolon
// kohm"), kept in the user's settings so that every log from that bench imports the same way.
#pragma once

#include <QString>
#include <QStringList>

#include <optional>

#include "photolot/import.h"

namespace photolot::workbench {

class ImportProfiles {
 public:
  QStringList names() const;
  std::optional<ImportOptions> load(const QString& name) const;
  void save(const QString& name, const ImportOptions& options);
  void remove(const QString& name);
};

}  // namespace photolot::workbench
