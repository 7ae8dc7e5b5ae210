// The results document's `lot_statistics` section. Layout: docs/statistics.md ("JSON").
// gamma is reported as is; R10 on the geometric scale: mean, median, percentiles, min, max and
// the tolerance interval in ohm (exp of the ln R10 figures), sd and sd_without_fit_noise as the
// sd of ln R10, with spread_factor = exp(sd).
#include <fmt/format.h>

#include <cmath>
#include <nlohmann/json.hpp>

#include "photolot/statistics.h"

namespace photolot {

namespace {

nlohmann::json num(double v) { return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(); }

nlohmann::json summary_json(const Summary& s, bool exp_scale) {
  auto f = [&](double v) { return num(exp_scale && std::isfinite(v) ? std::exp(v) : v); };
  nlohmann::json percentiles = nlohmann::json::object();
  for (std::size_t i = 0; i < kPercentileLevels.size(); ++i)
    percentiles[fmt::format("p{}", kPercentileLevels[i])] = f(s.percentiles[i]);
  nlohmann::json j = {
      {"n", s.n},
      {"mean", f(s.mean)},
      {"median", f(s.median)},
      {"sd", num(s.sd)},
      {"percentiles", percentiles},
      {"tolerance_factor", num(s.tolerance_factor)},
      {"tolerance_interval", {f(s.tolerance_interval[0]), f(s.tolerance_interval[1])}},
      {"sd_without_fit_noise", num(s.sd_without_fit_noise)},
      {"min", f(s.min)},
      {"max", f(s.max)}};
  if (exp_scale) {
    j["scale"] = "geometric: mean, median, percentiles, interval, min and max in ohm; sd of ln R10";
    j["spread_factor"] = num(std::isfinite(s.sd) ? std::exp(s.sd) : kNaN);
    j["spread_factor_without_fit_noise"] =
        num(std::isfinite(s.sd_without_fit_noise) ? std::exp(s.sd_without_fit_noise) : kNaN);
  }
  return j;
}

nlohmann::json capability_json(const Capability& c) {
  return {{"cp", num(c.cp)},
          {"cpk", num(c.cpk)},
          {"pp", num(c.pp)},
          {"ppk", num(c.ppk)},
          {"ppm_below", num(c.ppm_below)},
          {"ppm_above", num(c.ppm_above)},
          {"ppm", num(c.ppm_total)}};
}

}  // namespace

nlohmann::json lot_statistics_json(const LotStatistics& st) {
  nlohmann::json j;
  j["units_total"] = st.units_total;
  j["units_fitted"] = st.units_fitted;
  j["coverage"] = st.coverage;
  j["confidence"] = st.confidence;
  j["tolerance_method"] = st.tolerance_method;
  j["percentile_definition"] = "Hyndman-Fan type 7";
  j["r10_ohm"] = summary_json(st.ln_r10, true);
  j["gamma"] = summary_json(st.gamma, false);
  j["correlation_ln_r10_gamma"] = num(st.correlation_ln_r10_gamma);
  if (st.r10_capability) j["r10_ohm"]["capability"] = capability_json(*st.r10_capability);
  if (st.gamma_capability) j["gamma"]["capability"] = capability_json(*st.gamma_capability);
  nlohmann::json outliers = nlohmann::json::array();
  for (const auto& o : st.outliers)
    outliers.push_back({{"id", o.id},
                        {"characteristic", to_string(o.characteristic)},
                        {"value", num(o.value)},
                        {"modified_z", num(o.modified_z)}});
  j["outliers"] = outliers;
  return j;
}

}  // namespace photolot
