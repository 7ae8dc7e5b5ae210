// photolot-cli's lines for the lot statistics, the verdicts and the disposition.
#include "acceptance_text.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace photolot::cli {

namespace {

// Core messages write "Ω"; plain ASCII output says "ohm".
std::string styled(std::string text, const TextStyle& style) {
  if (style.unicode) return text;
  const std::string omega = "\u03a9";
  for (std::size_t at = text.find(omega); at != std::string::npos; at = text.find(omega, at))
    text.replace(at, omega.size(), "ohm");
  return text;
}

}  // namespace

std::string statistics_lines(const LotStatistics& st, const TextStyle& style) {
  if (st.units_fitted == 0) return "lot statistics: no fitted unit\n";
  const Summary& r = st.ln_r10;
  const Summary& g = st.gamma;
  const char* dash = style.unicode ? "\u2013" : "-";
  std::string text = fmt::format("lot statistics over {} fitted units:\n", st.units_fitted);
  const char* times = style.unicode ? "\u00d7" : "x";
  text += fmt::format("  R10    geometric mean {}, spread {}{:.3f} (parts alone {}{:.3f})",
                      format_ohm(std::exp(r.mean), style), times, std::exp(r.sd), times,
                      std::exp(r.sd_without_fit_noise));
  if (std::isfinite(r.tolerance_interval[0]))
    text +=
        fmt::format(", {:g} % of units within {} ({:g} % confidence)", 100 * st.coverage,
                    format_ohm_range(std::exp(r.tolerance_interval[0]),
                                     std::exp(r.tolerance_interval[1]), std::exp(r.mean), style),
                    100 * st.confidence);
  text += "\n";
  text += fmt::format("  gamma  mean {:.3f}, sd {:.3f} (parts alone {:.3f})", g.mean, g.sd,
                      g.sd_without_fit_noise);
  if (std::isfinite(g.tolerance_interval[0]))
    text += fmt::format(", {:g} % of units within {:.3f}{}{:.3f}", 100 * st.coverage,
                        g.tolerance_interval[0], dash, g.tolerance_interval[1]);
  text += "\n";
  auto capability = [&](const char* name, const std::optional<Capability>& c) {
    if (!c || !std::isfinite(c->ppk)) return;
    text += fmt::format("  {} against the spec: Ppk {:.2f}, expected {:.0f} ppm outside\n", name,
                        c->ppk, c->ppm_total);
  };
  capability("R10", st.r10_capability);
  capability("gamma", st.gamma_capability);
  for (const auto& o : st.outliers)
    text += fmt::format("  outlier: {} ({} modified z {:.1f})\n", o.id,
                        o.characteristic == Characteristic::r10 ? "R10" : "gamma", o.modified_z);
  return text;
}

std::string acceptance_lines(const Spec& spec, const std::vector<UnitVerdict>& verdicts,
                             const Acceptance& a, std::size_t max_units, const TextStyle& style) {
  std::string text = fmt::format("spec {}: {} conforming, {} nonconforming\n", spec.part_number,
                                 a.measured - a.nonconforming, a.nonconforming);
  std::size_t shown = 0;
  for (const auto& v : verdicts) {
    if (v.verdict != Verdict::nonconforming) continue;
    if (max_units != 0 && shown == max_units) {
      text +=
          fmt::format("  ... and {} more (all in the results document)\n", a.nonconforming - shown);
      break;
    }
    ++shown;
    std::string reasons;
    for (const auto& r : v.reasons) reasons += (reasons.empty() ? "" : "; ") + r.text;
    text += styled(fmt::format("  {}: {}\n", v.id, reasons), style);
  }
  std::size_t noted = 0;
  for (const auto& v : verdicts) noted += v.notes.empty() ? 0 : 1;
  if (noted > 0)
    text += fmt::format("  {} unit{} not judged on every limit (notes in the results document)\n",
                        noted, noted == 1 ? "" : "s");
  text += fmt::format("disposition (recommendation): {}: {}\n", to_string(a.disposition),
                      styled(a.reason, style));
  text += fmt::format("  rule: {}\n", a.rule);
  text += "  The decision and the signature are the inspector's.\n";
  return text;
}

std::string pairing_lines(const Pairing& p, const TextStyle& style) {
  const PairOptions& o = p.options;
  const char* dash = style.unicode ? "\u2013" : "-";
  std::string text = fmt::format(
      "pairs: {} from {} eligible units ({} tracking over {:g}{}{:g} lx, at most {:g} %)", p.pairs.size(),
      p.counts.eligible, to_string(o.mode), o.lux_lo, dash, o.lux_hi, o.tolerance_pct);
  double worst = 0;
  for (const auto& pair : p.pairs)
    if (std::isfinite(pair.tracking_error_pct)) worst = std::max(worst, pair.tracking_error_pct);
  if (!p.pairs.empty()) text += fmt::format(", worst error {:.2f} %", worst);
  text += fmt::format("; {} left unpaired\n", p.unpaired.size());
  text += fmt::format("  {}: {}\n", to_string(p.proof), p.proof_detail);
  return text;
}

}  // namespace photolot::cli
