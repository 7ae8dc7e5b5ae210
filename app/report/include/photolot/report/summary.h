// The printed lot acceptance summary: a PDF for the inspection file, drawn with Qt's QPdfWriter
// and QPainter, plots by QCustomPlot. Shared by the workbench and photolot-cli; the layout is
// described in docs/report.md.
//
// The caller owns everything the input points to; the summary only reads it. Anything optional
// that is missing (spec, statistics, acceptance, verdicts, pairs) leaves its section saying so
// rather than inventing numbers; blank header fields print as lines to fill in by hand.
//
// Qt: QCustomPlot is a widget, so a QApplication must exist. When the process has no Qt
// application at all, write_lot_summary_pdf makes one for the call on the offscreen platform
// (nothing is shown); when it has a QCoreApplication or QGuiApplication only, it returns an
// error. Call it from the thread that owns the application.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "photolot/acceptance.h"
#include "photolot/bench_profile.h"
#include "photolot/fit_result.h"
#include "photolot/lot.h"
#include "photolot/spec.h"
#include "photolot/statistics.h"

namespace photolot::report {

enum class PageSize : std::uint8_t { a4, letter };
std::string_view to_string(PageSize size);  // "A4", "Letter"

// The hand-filled part of the page head. Blank fields print as a line to write on.
struct SummaryHeader {
  std::string part;    // part number as ordered
  std::string lot_id;  // supplier's lot or date code
  std::string supplier;
  std::string date;  // of inspection, as the user writes it
  std::string inspector;
};

// One row of the pick list of matched pairs (filled by the pairing step's caller).
struct PairRow {
  int pair_no = 0;
  std::string id_a;
  std::string id_b;
  double error_pct = kNaN;  // the pair's tracking error, percent
  double sigma_pct = kNaN;  // its standard uncertainty from the two fits, percent
};

// The optional pairs section: count, error distribution (drawn from the rows) and pick list.
struct PairsSection {
  std::string method;           // one line: how pairs were chosen and the error measure
  std::vector<PairRow> rows;    // in pick order
  std::size_t unpaired = 0;     // fitted units left without a partner
  double tolerance_pct = kNaN;  // the pairing limit on error_pct, when there is one
};

struct SummaryInput {
  const Lot* lot = nullptr;                            // required
  const LotFit* fit = nullptr;                         // required, in the order of lot->units
  const Spec* spec = nullptr;                          // optional
  const LotStatistics* stats = nullptr;                // optional
  const Acceptance* acceptance = nullptr;              // optional: the disposition and its rule
  const std::vector<UnitVerdict>* verdicts = nullptr;  // optional: nonconforming units, reasons
  std::optional<PairsSection> pairs;                   // optional
  // optional: the meters' accuracies the fit weighted the readings by, and the file they came
  // from (printed as its name). Without one the summary says no bench profile was used, unless
  // the fit's method says it used one (then it says the accuracies were not passed on).
  const BenchProfile* bench = nullptr;
  std::string bench_profile_file;

  SummaryHeader header;
  PageSize page_size = PageSize::a4;
  std::string software_version;  // printed in the footer; defaults to PHOTOLOT_VERSION

  // Empty when usable; otherwise names what is missing or inconsistent.
  std::string validate() const;
};

// Writes the summary to a temporary file beside `path` and renames it into place, so an
// existing file at `path` is replaced only by a complete summary. Returns an error message
// (naming the path and the cause), or an empty string on success.
std::string write_lot_summary_pdf(const SummaryInput& input, const std::string& path);

}  // namespace photolot::report
