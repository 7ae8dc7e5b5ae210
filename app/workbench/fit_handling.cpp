#include "fit_handling.h"

#include <QCoreApplication>
#include <cmath>

#include "display_format.h"

namespace photolot::workbench {
namespace {

QString tr(const char* text, const char* disambiguation = nullptr, int n = -1) {
  return QCoreApplication::translate("FitHandling", text, disambiguation, n);
}

QString coefficient_text(double tc10, double slope) {
  QString text = tr("%1 %/°C at 10 lx").arg(format_number(tc10, 3));
  if (std::isfinite(slope) && slope != 0) {
    text += tr(", changing by %1 %/°C per decade of light").arg(format_number(slope, 2));
  }
  return text;
}

}  // namespace

fitting::ExtendedFitOptions default_model_options() {
  fitting::ExtendedFitOptions o;
  o.model = fitting::ModelChoice::power_law;  // as photolot-cli analyze (docs/cli.md says why)
  return o;
}

QString describe_fit_handling(const LotFit* fit, const FitHandling& handling) {
  if (!fit) return {};
  const fitting::ExtendedFitOptions& m = handling.model;
  QStringList lines;

  // The model, and what each unit took.
  std::size_t power = 0, dark = 0;
  for (const UnitFit& u : fit->units) {
    if (!u.ok()) continue;
    (u.curve.model == ModelKind::dark_conductance ? dark : power) += 1;
  }
  QString model;
  switch (m.model) {
    case fitting::ModelChoice::power_law:
      model = tr("the power law R10 (E/10 lx)^-gamma");
      break;
    case fitting::ModelChoice::dark_conductance:
      model = tr("the power law with a dark conductance in parallel");
      break;
    case fitting::ModelChoice::choose:
      model = tr("both the power law and the dark-conductance model, the lower AICc kept");
      break;
  }
  lines << tr("<b>Curve model</b>: %1. Fitted units: %2 power law, %3 dark conductance.")
               .arg(model)
               .arg(power)
               .arg(dark);
  lines << (m.censored_terms
                ? tr("<b>Over-range readings</b>: each a one-sided bound (the curve may not fall "
                     "below it).")
                : tr("<b>Over-range readings</b>: left out of the curves (counted and flagged)."));

  // The bench profile.
  if (m.bench) {
    const QString name = handling.bench_profile_name.empty()
                             ? tr("from the workspace")
                             : QString::fromStdString(handling.bench_profile_name);
    lines << tr("<b>Bench profile</b>: %1 — lux meter %2 % of reading, %n resistance range(s); "
                "each reading weighted by its meter uncertainty.",
                "", static_cast<int>(m.bench->ohm_ranges.size()))
                 .arg(name, format_number(m.bench->lux_pct, 3));
  } else {
    lines << tr(
        "<b>Bench profile</b>: none; every reading weighted alike (the meter accuracy of "
        "the fit options).");
  }

  // Temperature.
  const LotTemperature& t = fit->temperature;
  QString temp;
  if (m.temperature == fitting::TemperatureMode::off) {
    temp = tr("off; the curves describe R at the bench's temperature");
  } else if (t.identifiable) {
    temp = tr("identifiable (the readings span %1 °C); fitted across the lot: %2; R10 and gamma "
              "stated at 25 °C")
               .arg(format_number(t.span_c, 3),
                    coefficient_text(t.coefficient_pct_per_c, t.slope_pct_per_c_per_decade));
  } else {
    temp = t.outcome == TemperatureOutcome::not_sought
               ? tr("not sought (the run applies a given coefficient instead of fitting one)")
               : tr("not identifiable (the readings span %1 °C)").arg(format_number(t.span_c, 3));
    if (t.source == "spec") {
      temp += tr("; applied the spec's coefficient, %1; R10 and gamma stated at 25 °C")
                  .arg(coefficient_text(t.coefficient_pct_per_c, t.slope_pct_per_c_per_decade));
    } else {
      temp +=
          tr("; no coefficient applied (the spec gives none): R10 and gamma are at the "
             "bench's temperature");
    }
  }
  std::size_t own = 0;
  for (const UnitFit& u : fit->units) own += u.ok() && std::isfinite(u.temp_coeff_pct_per_c);
  if (own > 0) temp += tr(". %n unit(s) with their own coefficient (TC column)", "", int(own));
  lines << tr("<b>Temperature</b>: %1.").arg(temp);
  return lines.join(QStringLiteral("<br>"));
}

QString brief_fit_handling(const LotFit& fit, const FitHandling& handling) {
  const LotTemperature& t = fit.temperature;
  QString temp;
  if (handling.model.temperature == fitting::TemperatureMode::off) {
    temp = tr("temperature off");
  } else if (t.identifiable) {
    temp = tr("temperature fitted, %1 %/°C").arg(format_number(t.coefficient_pct_per_c, 3));
  } else if (t.source == "spec") {
    temp = (t.outcome == TemperatureOutcome::not_sought
                ? tr("temperature not sought, spec's %1 %/°C applied")
                : tr("temperature not identifiable, spec's %1 %/°C applied"))
               .arg(format_number(t.coefficient_pct_per_c, 3));
  } else {
    temp = t.outcome == TemperatureOutcome::not_sought
               ? tr("temperature not sought, none applied")
               : tr("temperature not identifiable, none applied");
  }
  const QString bench = handling.model.bench
                            ? tr("bench profile %1")
                                  .arg(QString::fromStdString(handling.bench_profile_name.empty()
                                                                  ? std::string("(workspace)")
                                                                  : handling.bench_profile_name))
                            : tr("no bench profile");
  return temp + QStringLiteral("; ") + bench;
}

nlohmann::json to_json(const FitHandling& h) {
  const auto& o = h.model;
  nlohmann::json j = nlohmann::json::object();
  j["model"] = std::string(fitting::to_string(o.model));
  j["over_range_bounds"] = o.censored_terms;
  j["use_dark_readings"] = o.use_dark_readings;
  j["temperature"] = std::string(fitting::to_string(o.temperature));
  j["bench_profile"] =
      h.bench_profile_name.empty() ? nlohmann::json(nullptr) : nlohmann::json(h.bench_profile_name);
  j["bench"] = o.bench ? nlohmann::json(bench_profile_json(*o.bench)) : nlohmann::json(nullptr);
  return j;
}

std::optional<std::string> from_json(const nlohmann::json& j, FitHandling& h) {
  if (!j.is_object()) return "model must be an object";
  auto& o = h.model;
  if (j.contains("model")) {
    if (!j["model"].is_string()) return "model.model must be a string";
    const std::string m = j["model"];
    if (m == "power_law") {
      o.model = fitting::ModelChoice::power_law;
    } else if (m == "dark_conductance") {
      o.model = fitting::ModelChoice::dark_conductance;
    } else if (m == "choose") {
      o.model = fitting::ModelChoice::choose;
    } else {
      return "model.model = \"" + m + "\" is not power_law, dark_conductance or choose";
    }
  }
  for (const char* key : {"over_range_bounds", "use_dark_readings"}) {
    if (!j.contains(key)) continue;
    if (!j[key].is_boolean()) return std::string("model.") + key + " must be true or false";
  }
  if (j.contains("over_range_bounds")) o.censored_terms = j["over_range_bounds"];
  if (j.contains("use_dark_readings")) o.use_dark_readings = j["use_dark_readings"];
  if (j.contains("temperature")) {
    if (!j["temperature"].is_string()) return "model.temperature must be a string";
    const std::string t = j["temperature"];
    if (t == "fit") {
      o.temperature = fitting::TemperatureMode::fit;
    } else if (t == "apply") {
      o.temperature = fitting::TemperatureMode::apply;
    } else if (t == "off") {
      o.temperature = fitting::TemperatureMode::off;
    } else {
      return "model.temperature = \"" + t + "\" is not fit, apply or off";
    }
  }
  if (j.contains("bench_profile") && !j["bench_profile"].is_null()) {
    if (!j["bench_profile"].is_string()) return "model.bench_profile must be a string or null";
    h.bench_profile_name = j["bench_profile"];
  }
  if (j.contains("bench") && !j["bench"].is_null()) {
    BenchProfile profile;
    if (std::string why = bench_profile_from_json(nlohmann::ordered_json(j["bench"]), profile);
        !why.empty())
      return "model.bench: " + why;
    o.bench = std::move(profile);
  }
  return std::nullopt;
}

}  // namespace photolot::workbench
