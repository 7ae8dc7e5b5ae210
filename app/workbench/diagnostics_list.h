// Lists an import's file errors and row diagnostics in a tree widget (file, line, column,
// severity, message), as the import dialog and the window's import log both show them.
#pragma once

#include <cstddef>

#include "photolot/import.h"

class QTreeWidget;

namespace photolot::workbench {

// Clears `list` and fills it; lists at most `shown` row diagnostics and a note for the rest.
void fill_diagnostics(QTreeWidget* list, const ImportResult& result, std::size_t shown);

}  // namespace photolot::workbench
