#include "report_fixture.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <memory>
#include <sstream>

#include "photolot/curve.h"
#include "photolot/synth.h"

namespace photolot::test {
namespace {

std::string run(const std::string& command) {
  std::string out;
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
  if (!pipe) return out;
  char buf[4096];
  while (std::size_t n = std::fread(buf, 1, sizeof buf, pipe.get())) out.append(buf, n);
  return out;
}

// Single-quoted for the shell (the scratch paths hold no quote).
std::string quoted(const std::filesystem::path& p) {
  std::string out(1, '\'');
  out += p.string();
  out += '\'';
  return out;
}

}  // namespace

report::SummaryInput JudgedLot::input() const {
  report::SummaryInput in;
  in.lot = &lot;
  in.fit = &fit;
  in.spec = &spec;
  in.stats = &stats;
  in.acceptance = &acceptance;
  in.verdicts = &verdicts;
  in.header.part = spec.part_number;
  in.header.lot_id = "L-2611-07";
  in.header.supplier = "Invented Optoparts Ltd (test scenario)";
  in.header.date = "2026-12-01";
  return in;
}

JudgedLot make_judged_lot(std::size_t units, double r10_min_ohm, double r10_max_ohm,
                          std::uint64_t seed) {
  synth::LotSpec ls;
  ls.seed = seed;
  ls.units = units;
  ls.r10_median_ohm = 20e3;
  ls.ln_r10_sd = 0.15;
  ls.gamma_mean = 0.75;
  ls.gamma_sd = 0.03;
  ls.rho = -0.3;
  ls.lux_levels = {1, 10, 100, 1000};
  synth::SimulatedLot sim = synth::simulate(ls);

  JudgedLot j;
  j.lot = std::move(sim.lot);
  j.lot.name = "test-lot";
  j.lot.source_files = {"bench-a.csv"};
  j.spec.part_number = "LDR-5528-T";
  j.spec.description = "5 mm CdS cell (invented part for the tests)";
  j.spec.r10_ohm = {r10_min_ohm, r10_max_ohm};
  j.spec.gamma = {0.6, 0.9};
  j.spec.inspection.lot_size = units;
  j.fit.method = "power law on ln R, Huber loss (scale 1 % of reading), 95 % Student t intervals";
  j.fit.temperature.source = "none";

  for (std::size_t i = 0; i < j.lot.units.size(); ++i) {
    const synth::UnitTruth& t = sim.truth[i];
    UnitFit u;
    u.id = t.id;
    u.status = FitStatus::fitted;
    u.curve = make_power_law(t.r10_ohm, t.gamma);
    u.r10_ohm = t.r10_ohm;
    u.gamma = t.gamma;
    u.gamma_10_100 = t.gamma;
    u.ln_r10_sd = 0.003;  // a bench with 0.5 % reading noise fits about this well
    u.gamma_sd = 0.002;
    u.rms_log_residual = 0.005;
    for (const Reading& r : j.lot.units[i].readings)
      if (r.kind == ReadingKind::normal && r.lux > 0) u.residuals.push_back({0, r.lux, r.ohm});
    u.points = static_cast<int>(u.residuals.size());
    u.levels = u.points;
    j.fit.units.push_back(u);
  }

  // The lot's own steps in core/: the verdicts, statistics and disposition the summary prints.
  j.verdicts = judge(j.fit, j.spec);
  for (const UnitVerdict& v : j.verdicts)
    if (v.verdict == Verdict::nonconforming) j.nonconforming_ids.push_back(v.id);
  StatisticsOptions so;
  so.coverage = j.spec.tolerance_coverage;
  so.confidence = j.spec.tolerance_confidence;
  j.stats = lot_statistics(j.fit, so, &j.spec);
  j.acceptance = decide(j.spec, j.verdicts);
  return j;
}

report::PairsSection make_pairs(const JudgedLot& lot, int pairs, double error_step_pct,
                                double tolerance_pct) {
  report::PairsSection p;
  p.method = "invented example: neighbouring units paired, errors made up for the test";
  p.tolerance_pct = tolerance_pct;
  for (int k = 0; k < pairs; ++k)
    p.rows.push_back({k + 1, lot.fit.units[2 * static_cast<std::size_t>(k)].id,
                      lot.fit.units[2 * static_cast<std::size_t>(k) + 1].id,
                      error_step_pct * (k + 1), 0.1 + 0.01 * k});
  p.unpaired = lot.fit.units.size() - 2 * static_cast<std::size_t>(pairs);
  return p;
}

namespace {

std::optional<std::string> text_of(const std::filesystem::path& pdf, const std::string& pages,
                                   const std::string& suffix) {
  const auto txt = std::filesystem::path(pdf).replace_extension(suffix);
  const std::string cmd =
      "pdftotext -layout " + pages + quoted(pdf) + " " + quoted(txt) + " 2>/dev/null";
  if (std::system(cmd.c_str()) != 0) return std::nullopt;
  std::ifstream in(txt, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

}  // namespace

std::optional<std::string> pdf_text(const std::filesystem::path& pdf) {
  return text_of(pdf, "", ".txt");
}

std::optional<std::string> pdf_page_text(const std::filesystem::path& pdf, int page) {
  return text_of(pdf, fmt::format("-f {} -l {} ", page, page), fmt::format(".page{}.txt", page));
}

PdfInfo pdf_info(const std::filesystem::path& pdf) {
  PdfInfo info;
  std::istringstream lines(run("pdfinfo " + quoted(pdf) + " 2>/dev/null"));
  for (std::string line; std::getline(lines, line);) {
    const auto value = [&](std::string_view key) {
      std::string v = line.substr(key.size());
      v.erase(0, v.find_first_not_of(' '));
      return v;
    };
    if (line.rfind("Pages:", 0) == 0) info.pages = std::stoi(value("Pages:"));
    if (line.rfind("Page size:", 0) == 0) info.page_size = value("Page size:");
  }
  return info;
}

}  // namespace photolot::test
