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

  std::vector<double> ln_r10, gamma;
  for (std::size_t i = 0; i < j.lot.units.size(); ++i) {
    const synth::UnitTruth& t = sim.truth[i];
    UnitFit u;
    u.id = t.id;
    u.status = FitStatus::fitted;
    u.curve = make_power_law(t.r10_ohm, t.gamma);
    u.r10_ohm = t.r10_ohm;
    u.gamma = t.gamma;
    for (const Reading& r : j.lot.units[i].readings)
      if (r.kind == ReadingKind::normal && r.lux > 0) u.residuals.push_back({0, r.lux, r.ohm});
    j.fit.units.push_back(u);
    ln_r10.push_back(std::log(t.r10_ohm));
    gamma.push_back(t.gamma);

    UnitVerdict v;
    v.id = t.id;
    const Limits& w = j.spec.r10_ohm;
    if (t.r10_ohm < w.min || t.r10_ohm > w.max) {
      const bool low = t.r10_ohm < w.min;
      const double limit = low ? w.min : w.max;
      Reason r;
      r.characteristic = Characteristic::r10;
      r.limit = low ? "min" : "max";
      r.measured = t.r10_ohm;
      r.limit_value = limit;
      r.excess_pct = std::abs(t.r10_ohm - limit) / limit * 100;
      r.text = fmt::format("R10 {:.1f} kohm {} {} {:.1f} kohm", t.r10_ohm / 1e3,
                           low ? "below" : "above", r.limit, limit / 1e3);
      v.verdict = Verdict::nonconforming;
      v.reasons.push_back(r);
      j.nonconforming_ids.push_back(t.id);
    }
    j.verdicts.push_back(v);
  }

  // Plain sample moments of the truth: inputs for the statistics table and the ellipse.
  // Percentiles are order statistics picked by nearest rank: enough for a printout check.
  const auto moments = [](std::vector<double> x, Summary& s) {
    std::sort(x.begin(), x.end());
    s.n = x.size();
    double m = 0;
    for (double v : x) m += v;
    m /= static_cast<double>(x.size());
    double ss = 0;
    for (double v : x) ss += (v - m) * (v - m);
    s.mean = m;
    s.sd = std::sqrt(ss / static_cast<double>(x.size() - 1));
    s.min = x.front();
    s.max = x.back();
    const auto rank = [&](double pct) {
      return x[static_cast<std::size_t>(
          std::lround(pct / 100 * static_cast<double>(x.size() - 1)))];
    };
    s.median = rank(50);
    for (std::size_t k = 0; k < kPercentileLevels.size(); ++k)
      s.percentiles[k] = rank(kPercentileLevels[k]);
  };
  j.stats.units_total = units;
  j.stats.units_fitted = units;
  moments(ln_r10, j.stats.ln_r10);
  moments(gamma, j.stats.gamma);
  j.stats.correlation_ln_r10_gamma = ls.rho;
  j.stats.tolerance_method = "Howe";

  j.spec.inspection.mode = InspectionMode::full;
  j.acceptance.mode = InspectionMode::full;
  j.acceptance.lot_size = units;
  j.acceptance.measured = units;
  j.acceptance.nonconforming = j.nonconforming_ids.size();
  j.acceptance.rejected_units = j.nonconforming_ids;
  // The summary prints the disposition and rule it is given; the tests check that it does.
  const bool reject = j.nonconforming_ids.size() >= 2;
  j.acceptance.disposition = reject ? Disposition::reject : Disposition::accept;
  j.acceptance.reason =
      fmt::format("{} nonconforming of {} measured", j.nonconforming_ids.size(), units);
  j.acceptance.rule =
      "Every unit measured (test scenario's rule): accept with at most one "
      "nonconforming unit, reject with two or more.";
  return j;
}

std::optional<std::string> pdf_text(const std::filesystem::path& pdf) {
  const auto txt = std::filesystem::path(pdf).replace_extension(".txt");
  const std::string cmd = "pdftotext -layout " + quoted(pdf) + " " + quoted(txt) + " 2>/dev/null";
  if (std::system(cmd.c_str()) != 0) return std::nullopt;
  std::ifstream in(txt, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
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

std::string collapse_space(const std::string& text) {
  std::string out;
  bool space = false;
  for (char ch : text) {
    if (ch == ' ' || ch == '\n' || ch == '\t' || ch == '\f' || ch == '\r') {
      space = true;
      continue;
    }
    if (space && !out.empty()) out += ' ';
    space = false;
    out += ch;
  }
  return out;
}

}  // namespace photolot::test
