// How the workbench writes numbers on screen: fmt, never the process locale, so a table reads
// the same on every machine and copies cleanly into the CSV the command line writes.
#pragma once

#include <QString>
#include <array>

namespace photolot::workbench {

// Resistance with an SI prefix and 3 significant digits: "20.3 kΩ", "1.50 MΩ"; "—" for NaN
// (photolot::format_ohm, shared with the command line and the summary).
QString format_ohm(double ohm);
// Conductance with an SI prefix and 3 significant digits: "4.20 nS", "1.05 µS"; "—" for NaN.
QString format_siemens(double siemens);
// A plain number to `digits` significant digits; "—" for NaN.
QString format_number(double value, int digits = 3);
// "[a, b]" of two formatted values (ohm when is_ohm).
QString format_interval(const std::array<double, 2>& interval, bool is_ohm, int digits = 3);

}  // namespace photolot::workbench
