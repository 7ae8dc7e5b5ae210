// What the summary says, as plain strings and numbers, built from the caller's input before
// anything is drawn. The page layout (pdf.cpp) and the plots (plots.cpp) only place it.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "geometry.h"
#include "photolot/curve.h"
#include "photolot/number_format.h"
#include "photolot/report/summary.h"
#include "photolot/spec.h"

namespace photolot::report {

struct KeyValue {
  std::string key;
  std::string value;
};

struct Table {
  std::vector<std::string> headers;
  std::vector<double> widths;       // relative column widths
  std::vector<bool> right_aligned;  // per column
  double width_fraction = 1.0;      // of the text width, from the left margin
  std::vector<std::vector<std::string>> rows;
};

// One unit as the plots draw it.
struct PlotUnit {
  std::string id;
  Curve curve;
  double r10_ohm = kNaN;
  double gamma = kNaN;
  double lux_min = kNaN;  // the unit's measured range, where its curve is drawn
  double lux_max = kNaN;
  bool nonconforming = false;
};

struct Content {
  SummaryHeader header;
  std::string lot_name;
  std::size_t units_logged = 0;
  std::string footer;

  std::string disposition;  // "ACCEPT", "REJECT", "UNDECIDED", "NOT JUDGED"
  std::string disposition_reason;
  std::vector<std::string> disposition_rule;  // sentences: plan and rule

  std::vector<KeyValue> spec;        // the purchase spec
  std::vector<KeyValue> conditions;  // test conditions and what the logs show
  // How the curves were read: the model per unit, the temperature handling, the bench profile.
  std::vector<KeyValue> models;
  Table statistics;
  std::string statistics_note;
  Table nonconforming;
  std::string nonconforming_note;
  std::vector<KeyValue> method;

  // Plot data
  std::vector<PlotUnit> units;
  Limits r10_window_ohm;
  Limits gamma_window;
  double reference_lux = kReferenceLux;
  std::optional<Bivariate> ln_r10_gamma;  // for the tolerance ellipse
  double ellipse_coverage = 0.95;

  std::optional<PairsSection> pairs;
  std::vector<KeyValue> pairs_summary;
  Table pairs_table;

  std::vector<std::string> cautions;
};

Content build_content(const SummaryInput& input);

// Resistances in the tables and the plots' labels: photolot::format_ohm (number_format.h),
// "20.1 kΩ", "4.70 MΩ", "—" for NaN.

}  // namespace photolot::report
