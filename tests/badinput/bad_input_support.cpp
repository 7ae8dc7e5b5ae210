#include "bad_input_support.h"

#include <fmt/format.h>

#include <fstream>
#include <regex>

#include "test_support.h"

namespace photolot::test {

ImportResult import_beside_good(const std::string& name, const std::string& bad) {
  const auto good = write_scratch_file("good.csv", kGoodLog);
  const auto path = write_scratch_file(name, bad);
  return import_files({good.string(), path.string()});
}

std::string find_message(const ImportResult& r, const std::string& text) {
  for (const auto& e : r.errors)
    if (e.message.find(text) != std::string::npos)
      return fmt::format("{}:{}: {}", e.line, e.column, e.message);
  for (const auto& d : r.lot.diagnostics)
    if (d.message.find(text) != std::string::npos)
      return fmt::format("{}:{}: {}", d.line, d.column, d.message);
  return {};
}

std::size_t readings_of(const ImportResult& r, const std::string& id) {
  for (const auto& u : r.lot.units)
    if (u.id == id) return u.readings.size();
  return 0;
}

std::vector<std::string> catalogue_ids() {
  std::ifstream in(source_path("docs/bad-input.md"));
  std::vector<std::string> ids;
  const std::regex row(R"(^\| ([LSRCW][0-9]{2}) \|)");
  std::smatch m;
  for (std::string line; std::getline(in, line);)
    if (std::regex_search(line, m, row)) ids.push_back(m[1]);
  return ids;
}

}  // namespace photolot::test
