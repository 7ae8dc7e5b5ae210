// The one to-string of each enum in the data model.
#include "photolot/curve.h"
#include "photolot/fit_result.h"
#include "photolot/import.h"
#include "photolot/lot.h"

namespace photolot {

std::string_view to_string(ReadingKind kind) {
  switch (kind) {
    case ReadingKind::normal: return "normal";
    case ReadingKind::dark: return "dark";
    case ReadingKind::censored: return "censored";
  }
  return "?";
}

std::string_view to_string(Severity severity) {
  switch (severity) {
    case Severity::note: return "note";
    case Severity::warning: return "warning";
    case Severity::error: return "error";
  }
  return "?";
}

std::string_view to_string(ModelKind kind) {
  switch (kind) {
    case ModelKind::power_law: return "power_law";
    case ModelKind::dark_conductance: return "dark_conductance";
  }
  return "?";
}

std::string_view to_string(FitStatus status) {
  switch (status) {
    case FitStatus::fitted: return "fitted";
    case FitStatus::no_valid_points: return "no_valid_points";
    case FitStatus::too_few_levels: return "too_few_levels";
    case FitStatus::span_too_small: return "span_too_small";
    case FitStatus::solver_failed: return "solver_failed";
  }
  return "?";
}

std::string_view to_string(TemperatureOutcome outcome) {
  switch (outcome) {
    case TemperatureOutcome::not_stated: return "not_stated";
    case TemperatureOutcome::fitted: return "fitted";
    case TemperatureOutcome::not_identifiable: return "not_identifiable";
    case TemperatureOutcome::not_sought: return "not_sought";
  }
  return "?";
}

std::string_view to_string(ColumnRole role) {
  switch (role) {
    case ColumnRole::unit_id: return "unit_id";
    case ColumnRole::lux: return "lux";
    case ColumnRole::ohm: return "ohm";
    case ColumnRole::temp_c: return "temp_c";
    case ColumnRole::ignored: return "ignored";
  }
  return "?";
}

std::size_t LotFit::fitted_count() const {
  std::size_t n = 0;
  for (const auto& u : units) n += u.ok() ? 1 : 0;
  return n;
}

}  // namespace photolot
