// Internal to core: recognising a bench log's columns from its header cells.
#pragma once

#include <string>
#include <vector>

#include "photolot/import.h"

namespace photolot::detail {

// What one header cell says: its role and unit, found from common names, case-insensitive,
// with the unit in brackets or parentheses ("Resistance (kΩ)", "E [fc]"), after a slash
// ("E / lx"), as a trailing word ("temp_c", "r_kohm"), or as the whole text ("ohm", "lux").
// A name with digits in it ("R10", "E100") is not a role name: in the resistor letter code
// R10 means 0.10 ohm, and a column so named is a summary, not a reading.
DetectedColumn recognise_column(std::size_t index, const std::string& header);

// The columns of a header row, with the options' explicit choices applied. Only the first
// column of each role keeps it. `problem` is set when an option names no column.
std::vector<DetectedColumn> resolve_columns(const std::vector<std::string>& headers,
                                            const ImportOptions& options, std::string& problem);

// Index of the column with this role, or npos.
std::size_t find_role(const std::vector<DetectedColumn>& columns, ColumnRole role);

}  // namespace photolot::detail
