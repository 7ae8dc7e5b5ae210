// The readings of one unit sorted for the fits: the normal points that enter a curve fit
// (in log space), the censored and dark readings kept apart, and the checks that decide
// whether a curve can be fitted at all. Private to fitting/; the extended models reuse it.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/fitting/fit.h"
#include "photolot/lot.h"

namespace photolot::fitting::detail {

struct UnitPoints {
  // Normal readings with lux > 0 and a finite resistance > 0, in reading order.
  std::vector<std::size_t> reading_index;
  std::vector<double> lux;
  std::vector<double> ohm;
  std::vector<double> x;  // ln(E / 10 lx)
  std::vector<double> y;  // ln R

  int levels = 0;  // distinct illuminance levels among the points
  double lux_min = 0, lux_max = 0;
  double span_decades = 0;  // log10(lux_max / lux_min)
  int censored = 0;         // over-range readings under light (lux > 0)
  int dark = 0;             // readings at 0 lx, censored or not
  int skipped = 0;          // normal readings that could not be used (bad lux or ohm)
  std::vector<double> dark_ohm;
  std::vector<bool> dark_censored;

  std::size_t size() const { return x.size(); }
};

// Sorts a unit's readings. Dark: kind dark, or any reading at lux == 0 (a censored one is a
// lower bound). Censored: kind censored with lux > 0.
UnitPoints collect_points(const Unit& unit);

// A UnitFit with the id and the reading counts filled in, and its status set: `fitted` when a
// curve with `parameters` parameters can be fitted to the points, otherwise the matching
// status and a plain-words message.
UnitFit start_unit_fit(const Unit& unit, const UnitPoints& points, const FitOptions& options,
                       int parameters = 2);

// A UnitFit for a unit not fitted because the options are invalid (`why` from validate()).
UnitFit invalid_options_fit(const Unit& unit, const std::string& why);

}  // namespace photolot::fitting::detail
