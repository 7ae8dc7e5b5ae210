#include "columns.h"

#include <fmt/format.h>

#include <optional>

#include "../units/value_scan.h"
#include "photolot/units.h"

namespace photolot::detail {
namespace {

std::string lower(std::string_view s) {
  std::string out(s);
  for (char& c : out)
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  return out;
}

struct SplitHeader {
  std::string_view name;
  std::string_view unit;  // empty when none is written
};

// "Resistance (kΩ)" -> {"Resistance", "kΩ"}; "E [fc]"; "E / lx" -> {"E", "lx"}.
SplitHeader split_header(std::string_view h) {
  h = trim(h);
  if (!h.empty() && (h.back() == ')' || h.back() == ']')) {
    const char open = h.back() == ')' ? '(' : '[';
    const std::size_t at = h.rfind(open);
    if (at != std::string_view::npos)
      return {trim(h.substr(0, at)), trim(h.substr(at + 1, h.size() - at - 2))};
  }
  const std::size_t slash = h.rfind('/');
  if (slash != std::string_view::npos && slash > 0 && lower(h) != "s/n") {
    const std::string_view unit = trim(h.substr(slash + 1));
    if (find_unit(unit)) return {trim(h.substr(0, slash)), unit};
  }
  return {h, {}};
}

std::vector<std::string> words_of(std::string_view name) {
  std::vector<std::string> words;
  std::string word;
  for (char c : name) {
    if (c == ' ' || c == '_' || c == '-' || c == '.' || c == ':' || c == '#' || c == '\t') {
      if (!word.empty()) words.push_back(lower(word));
      word.clear();
    } else {
      word.push_back(c);
    }
  }
  if (!word.empty()) words.push_back(lower(word));
  return words;
}

std::optional<ColumnRole> role_of_word(const std::string& w) {
  for (std::string_view id : {"unit", "id", "serial", "sn", "s/n", "part", "cell", "dut", "sample",
                              "device", "unitid", "serialno", "partno"})
    if (w == id) return ColumnRole::unit_id;
  for (std::string_view lux :
       {"lux", "lx", "illuminance", "illumination", "illum", "e", "ev", "light"})
    if (w == lux) return ColumnRole::lux;
  for (std::string_view ohm : {"resistance", "r", "res", "ohm", "ohms"})
    if (w == ohm) return ColumnRole::ohm;
  for (std::string_view temp : {"temp", "temperature", "t", "tamb"})
    if (w == temp) return ColumnRole::temp_c;
  return std::nullopt;
}

// R10, R100, E10: summary quantities (and R10 is 0.10 ohm in the letter code), never readings.
bool is_summary_word(const std::string& w) {
  if (w == "gamma") return true;
  if (w.size() < 2 || (w[0] != 'r' && w[0] != 'e')) return false;
  for (std::size_t i = 1; i < w.size(); ++i)
    if (w[i] < '0' || w[i] > '9') return false;
  return true;
}

std::optional<ColumnRole> role_of_quantity(Quantity q) {
  switch (q) {
    case Quantity::illuminance:
      return ColumnRole::lux;
    case Quantity::resistance:
      return ColumnRole::ohm;
    case Quantity::temperature:
      return ColumnRole::temp_c;
  }
  return std::nullopt;
}

std::optional<Quantity> quantity_of_role(ColumnRole role) {
  switch (role) {
    case ColumnRole::lux:
      return Quantity::illuminance;
    case ColumnRole::ohm:
      return Quantity::resistance;
    case ColumnRole::temp_c:
      return Quantity::temperature;
    default:
      return std::nullopt;
  }
}

void set_unit(DetectedColumn& c, const UnitInfo& u) {
  c.unit = std::string(u.canonical);
  c.scale = u.scale;
  c.offset = u.offset;
}

void set_default_unit(DetectedColumn& c) {
  c.unit.clear();
  c.scale = 1;
  c.offset = 0;
  if (c.role == ColumnRole::lux) c.unit = "lx";
  if (c.role == ColumnRole::ohm) c.unit = "ohm";
  if (c.role == ColumnRole::temp_c) c.unit = "degC";
}

// The unit the header writes for this role's quantity, if any.
std::optional<UnitInfo> header_unit_for(const std::string& header, ColumnRole role) {
  const auto q = quantity_of_role(role);
  if (!q) return std::nullopt;
  const SplitHeader s = split_header(header);
  if (!s.unit.empty()) {
    const auto u = find_unit(s.unit);
    if (u && u->quantity == *q) return u;
    return std::nullopt;
  }
  if (const auto u = find_unit(s.name); u && u->quantity == *q) return u;
  for (const auto& w : words_of(s.name))
    if (const auto u = find_unit(w); u && u->quantity == *q) return u;
  return std::nullopt;
}

}  // namespace

DetectedColumn recognise_column(std::size_t index, const std::string& header) {
  DetectedColumn c;
  c.index = index;
  c.header = header;
  const SplitHeader s = split_header(header);
  std::optional<UnitInfo> unit;
  if (!s.unit.empty()) {
    unit = find_unit(s.unit);
    if (!unit) {
      // A unit we do not know ("V", "s", "mΩ"): only a unit id column may carry one.
      const auto words = words_of(s.name);
      for (const auto& w : words)
        if (role_of_word(w) == ColumnRole::unit_id) c.role = ColumnRole::unit_id;
      return c;
    }
  }
  const auto words = words_of(s.name);
  for (const auto& w : words)
    if (is_summary_word(w)) return c;

  std::optional<ColumnRole> role;
  // The whole name as a unit ("ohm", "lux", "kΩ", "°C"); bare one-letter units (c, k, f) only
  // as trailing words ("temp_c").
  if (s.unit.empty() && trim(s.name).size() > 1) {
    if (const auto u = find_unit(s.name)) {
      role = role_of_quantity(u->quantity);
      unit = u;
    }
  }
  if (!role) {
    // A quantity word wins over an id word: "Cell temp" is a temperature.
    std::optional<ColumnRole> id_role;
    for (const auto& w : words) {
      const auto r = role_of_word(w);
      if (!r) continue;
      if (*r == ColumnRole::unit_id) {
        id_role = r;
        continue;
      }
      role = r;
      break;
    }
    if (!role) role = id_role;
  }
  if (!role && unit) role = role_of_quantity(unit->quantity);  // "Reading (kΩ)"
  if (!role) return c;
  c.role = *role;
  if (c.role == ColumnRole::unit_id) return c;
  if (unit && unit->quantity != *quantity_of_role(c.role)) {
    c.role = ColumnRole::ignored;  // "T [s]" is a time, not a temperature
    return c;
  }
  if (!unit) unit = header_unit_for(header, c.role);
  if (unit)
    set_unit(c, *unit);
  else
    set_default_unit(c);
  return c;
}

std::size_t find_role(const std::vector<DetectedColumn>& columns, ColumnRole role) {
  for (std::size_t i = 0; i < columns.size(); ++i)
    if (columns[i].role == role) return i;
  return static_cast<std::size_t>(-1);
}

std::vector<DetectedColumn> resolve_columns(const std::vector<std::string>& headers,
                                            const ImportOptions& options, std::string& problem) {
  std::vector<DetectedColumn> cols;
  cols.reserve(headers.size());
  for (std::size_t i = 0; i < headers.size(); ++i) cols.push_back(recognise_column(i, headers[i]));
  // Only the first column of each role keeps it.
  bool seen[5] = {};
  for (auto& c : cols) {
    if (c.role == ColumnRole::ignored) continue;
    auto& s = seen[static_cast<int>(c.role)];
    if (s) {
      c.role = ColumnRole::ignored;
      set_default_unit(c);
    }
    s = true;
  }

  struct Choice {
    const std::string& option;
    const char* field;
    ColumnRole role;
  };
  const Choice choices[] = {{options.id_column, "id_column", ColumnRole::unit_id},
                            {options.lux_column, "lux_column", ColumnRole::lux},
                            {options.ohm_column, "ohm_column", ColumnRole::ohm},
                            {options.temp_column, "temp_column", ColumnRole::temp_c}};
  for (const auto& choice : choices) {
    if (choice.option.empty()) continue;
    std::size_t index = static_cast<std::size_t>(-1);
    const std::string_view wanted = trim(choice.option);
    const bool numeric = !wanted.empty() && wanted.size() <= 6 &&
                         wanted.find_first_not_of("0123456789") == std::string_view::npos;
    if (numeric) {
      const std::size_t number = std::stoul(std::string(wanted));
      if (number >= 1 && number <= cols.size()) index = number - 1;
      if (index == static_cast<std::size_t>(-1)) {
        problem = fmt::format("{} = '{}' but the header has {} columns", choice.field,
                              choice.option, cols.size());
        continue;
      }
    } else {
      const std::string key = lower(wanted);
      for (std::size_t i = 0; i < cols.size(); ++i)
        if (lower(trim(headers[i])) == key) index = i;
      if (index == static_cast<std::size_t>(-1)) {
        std::string names;
        for (const auto& h : headers) names += fmt::format("{}'{}'", names.empty() ? "" : ", ", h);
        problem = fmt::format("{} = '{}' names no column of the header ({})", choice.field,
                              choice.option, names);
        continue;
      }
    }
    for (auto& c : cols)
      if (c.role == choice.role) {
        c.role = ColumnRole::ignored;
        set_default_unit(c);
      }
    DetectedColumn& c = cols[index];
    c.role = choice.role;
    if (const auto u = header_unit_for(c.header, c.role))
      set_unit(c, *u);
    else
      set_default_unit(c);
  }

  struct UnitChoice {
    const std::string& option;
    ColumnRole role;
  };
  for (const auto& uc : {UnitChoice{options.lux_unit, ColumnRole::lux},
                         UnitChoice{options.ohm_unit, ColumnRole::ohm},
                         UnitChoice{options.temp_unit, ColumnRole::temp_c}}) {
    if (uc.option.empty()) continue;
    const std::size_t i = find_role(cols, uc.role);
    if (i == static_cast<std::size_t>(-1)) continue;
    if (const auto u = find_unit(uc.option)) set_unit(cols[i], *u);  // validate() checked it
  }
  return cols;
}

}  // namespace photolot::detail
