// The printed summary read back the way a person or a script would: pdftotext and pdfinfo
// (poppler-utils) say what the pages hold; the writer's own layout code is not consulted.
#include "photolot/report/summary.h"

#include <fmt/format.h>
#include <gtest/gtest.h>
#include <sys/resource.h>

#include <algorithm>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <initializer_list>
#include <sstream>

#include "report_fixture.h"
#include "test_support.h"

namespace fs = std::filesystem;
using photolot::report::write_lot_summary_pdf;
using photolot::test::collapse_space;
using photolot::test::make_judged_lot;
using photolot::test::pdf_info;
using photolot::test::pdf_text;

namespace {

std::string read_bytes(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

// Writes the summary into the test's scratch folder; an empty path when writing failed.
fs::path write_summary(const photolot::report::SummaryInput& in,
                       const std::string& name = "summary.pdf") {
  const fs::path pdf = photolot::test::scratch_dir() / name;
  const std::string error = write_lot_summary_pdf(in, pdf.string());
  EXPECT_EQ(error, "");
  return error.empty() ? pdf : fs::path();
}

// The written summary's text, whitespace collapsed; empty when writing or reading failed.
std::string summary_text(const photolot::report::SummaryInput& in) {
  const fs::path pdf = write_summary(in);
  return pdf.empty() ? std::string() : collapse_space(pdf_text(pdf).value_or(""));
}

// Every phrase must appear in the text (whitespace collapsed).
void expect_all(const std::string& flat, std::initializer_list<std::string_view> phrases) {
  for (std::string_view p : phrases) EXPECT_NE(flat.find(p), std::string::npos) << p;
}

std::size_t files_in(const fs::path& dir) {
  std::size_t n = 0;
  for ([[maybe_unused]] const auto& e : fs::directory_iterator(dir)) ++n;
  return n;
}

}  // namespace

TEST(LotSummaryPdf, PrintsDispositionPartAndEachNonconformingUnitWithItsReason) {
  // A window of 17-23 kohm around a median of 20 kohm with a 15 % spread leaves several of 60
  // units outside (about 30 % of a lognormal with sd 0.15 lies beyond +-0.14 in ln).
  const auto lot = make_judged_lot(60, 17e3, 23e3);
  ASSERT_GE(lot.nonconforming_ids.size(), 2u);
  // ISO 2859-1: 60 units at level II is code letter E (n 13); at AQL 1.0 % Table II-A sends E
  // to Ac 0 / Re 1, so nonconforming units reject the lot.
  ASSERT_EQ(lot.acceptance.disposition, photolot::Disposition::reject);
  const fs::path pdf = write_summary(lot.input());
  ASSERT_FALSE(pdf.empty());

  const auto text = pdf_text(pdf);
  ASSERT_TRUE(text.has_value()) << "pdftotext could not read the summary";
  const std::string flat = collapse_space(*text);
  EXPECT_NE(flat.find("REJECT"), std::string::npos);
  EXPECT_NE(flat.find(lot.acceptance.reason), std::string::npos);
  EXPECT_NE(flat.find("LDR-5528-T"), std::string::npos);
  EXPECT_NE(flat.find("L-2611-07"), std::string::npos);
  for (const auto& v : lot.verdicts) {
    if (v.reasons.empty()) continue;
    EXPECT_NE(flat.find(v.id), std::string::npos) << v.id;
    EXPECT_NE(flat.find(v.reasons.front().text), std::string::npos) << v.reasons.front().text;
  }
  // The cautions a bench needs (cadmium, mains) and the lines to sign on.
  expect_all(flat, {"cadmium", "IEC 61140", "Signature"});
}

TEST(LotSummaryPdf, PutsTheDispositionAndTheHeadOnTheFirstPage) {
  const auto lot = make_judged_lot(60, 17e3, 23e3);
  const fs::path pdf = write_summary(lot.input());
  ASSERT_FALSE(pdf.empty());
  const std::string first = collapse_space(photolot::test::pdf_page_text(pdf, 1).value_or(""));
  expect_all(first, {"REJECT", "LDR-5528-T", "Invented Optoparts", "Purchase spec"});
}

TEST(LotSummaryPdf, DrawsThePlotsAsVectorsWithTheirAxesAndLegends) {
  // Plots drawn as vector graphics keep their text, so pdftotext finds axis titles and legend
  // entries; a raster image or a missing plot would hold none.
  const auto lot = make_judged_lot(60, 17e3, 23e3);
  const std::string flat = summary_text(lot.input());
  ASSERT_FALSE(flat.empty());
  expect_all(flat, {"illuminance E", "resistance R", "R10 window at 10 lx", "units per bin",
                    "spec limit", "spec box", "ellipse of (ln R10, gamma)"});
}

TEST(LotSummaryPdf, NumbersEveryPageAsPageNOfTheCountPdfinfoReports) {
  const auto lot = make_judged_lot(40, 17e3, 23e3);
  const fs::path pdf = write_summary(lot.input());
  ASSERT_FALSE(pdf.empty());
  const auto info = pdf_info(pdf);
  ASSERT_GE(info.pages, 3);  // page 1 summary, page 2 plots, then the lists and signatures
  const std::string flat = collapse_space(pdf_text(pdf).value_or(""));
  for (int k = 1; k <= info.pages; ++k)
    EXPECT_NE(flat.find(fmt::format("page {} of {}", k, info.pages)), std::string::npos) << k;
  EXPECT_EQ(flat.find(fmt::format("page {} of", info.pages + 1)), std::string::npos);
}

TEST(LotSummaryPdf, LongNonconformingListFlowsOverPagesWithEveryUnitListed) {
  // A window that most of a 400-unit lot misses: the list cannot fit on one page.
  const auto lot = make_judged_lot(400, 19.5e3, 20.5e3);
  ASSERT_GT(lot.nonconforming_ids.size(), 200u);
  const fs::path pdf = write_summary(lot.input());
  ASSERT_FALSE(pdf.empty());
  const auto small = make_judged_lot(40, 17e3, 23e3);
  const fs::path small_pdf = pdf.parent_path() / "small.pdf";
  ASSERT_EQ(write_lot_summary_pdf(small.input(), small_pdf.string()), "");
  EXPECT_GT(pdf_info(pdf).pages, pdf_info(small_pdf).pages + 2);

  const std::string flat = collapse_space(pdf_text(pdf).value_or(""));
  EXPECT_NE(flat.find("(continued)"), std::string::npos);
  for (const auto& id : lot.nonconforming_ids) EXPECT_NE(flat.find(id), std::string::npos) << id;
}

TEST(LotSummaryPdf, UsesTheIso216A4AndTheUsLetterSheet) {
  // A4 is 210 x 297 mm (ISO 216) = 595.3 x 841.9 pt; Letter is 8.5 x 11 in = 612 x 792 pt.
  // pdfinfo prints "W x H pts (name)"; a writer may round to whole points.
  auto lot = make_judged_lot(20, 17e3, 23e3);
  const fs::path dir = photolot::test::scratch_dir();
  auto in = lot.input();
  ASSERT_EQ(write_lot_summary_pdf(in, (dir / "a4.pdf").string()), "");
  in.page_size = photolot::report::PageSize::letter;
  ASSERT_EQ(write_lot_summary_pdf(in, (dir / "letter.pdf").string()), "");
  const auto size_pt = [](const fs::path& pdf) {
    double w = 0, h = 0;
    std::sscanf(pdf_info(pdf).page_size.c_str(), "%lf x %lf", &w, &h);
    return std::pair{w, h};
  };
  const auto [a4_w, a4_h] = size_pt(dir / "a4.pdf");
  EXPECT_NEAR(a4_w, 210 / 25.4 * 72, 1.0);
  EXPECT_NEAR(a4_h, 297 / 25.4 * 72, 1.0);
  const auto [letter_w, letter_h] = size_pt(dir / "letter.pdf");
  EXPECT_NEAR(letter_w, 8.5 * 72, 1.0);
  EXPECT_NEAR(letter_h, 11 * 72, 1.0);
}

TEST(LotSummaryPdf, LotWithoutSpecIsMarkedNotJudgedAndKeepsBlankFieldsToFillIn) {
  auto lot = make_judged_lot(30, 17e3, 23e3);
  photolot::report::SummaryInput in;
  in.lot = &lot.lot;
  in.fit = &lot.fit;
  const std::string flat = summary_text(in);
  ASSERT_FALSE(flat.empty());
  EXPECT_NE(flat.find("NOT JUDGED"), std::string::npos);
  EXPECT_NE(flat.find("No purchase spec was given"), std::string::npos);
  EXPECT_EQ(flat.find("REJECT"), std::string::npos);
  EXPECT_EQ(flat.find("ACCEPT"), std::string::npos);
  EXPECT_NE(flat.find("Supplier"), std::string::npos);
  EXPECT_NE(flat.find("Inspector"), std::string::npos);
}

TEST(LotSummaryPdf, PrintsThePairsPickListWhenGiven) {
  auto lot = make_judged_lot(30, 17e3, 23e3);
  auto in = lot.input();
  const auto pairs = photolot::test::make_pairs(lot, 10, 0.2, 2.0);
  in.pairs = pairs;
  const std::string flat = summary_text(in);
  ASSERT_FALSE(flat.empty());
  EXPECT_NE(flat.find("Matched pairs"), std::string::npos);
  EXPECT_NE(flat.find("Error % ± sd %"), std::string::npos) << flat;
  for (const auto& r : pairs.rows) {
    // Each row as read off the page: number, the two ids, the error and its sd beside it.
    const std::string row =
        fmt::format("{} {} {} {:.2f} {:.2f}", r.pair_no, r.id_a, r.id_b, r.error_pct, r.sigma_pct);
    EXPECT_NE(flat.find(row), std::string::npos) << row;
  }
}

TEST(LotSummaryPdf, UnwritableTargetGivesAnErrorAndLeavesNoFile) {
  const fs::path dir = photolot::test::scratch_dir();
  // A regular file stands where the folder should be, so nothing can be created under it.
  std::ofstream(dir / "not-a-folder") << "x";
  const fs::path pdf = dir / "not-a-folder" / "summary.pdf";
  const auto lot = make_judged_lot(20, 17e3, 23e3);
  const std::string error = write_lot_summary_pdf(lot.input(), pdf.string());
  EXPECT_NE(error, "");
  EXPECT_NE(error.find("summary.pdf"), std::string::npos) << error;
  EXPECT_FALSE(fs::exists(pdf));
  EXPECT_EQ(files_in(dir), 1u);  // only the blocking file: no temporary left behind
}

TEST(LotSummaryPdf, FailedWriteLeavesThePreviousFileIntact) {
  const fs::path dir = photolot::test::scratch_dir();
  const fs::path pdf = dir / "summary.pdf";
  const auto first = make_judged_lot(20, 17e3, 23e3);
  ASSERT_EQ(write_lot_summary_pdf(first.input(), pdf.string()), "");
  const std::string before = read_bytes(pdf);

  // The file-size limit makes the operating system refuse writes past 4 KiB part-way through
  // the PDF (EFBIG): a real failure in the middle of writing, even for root.
  rlimit old{};
  ASSERT_EQ(getrlimit(RLIMIT_FSIZE, &old), 0);
  auto* previous_handler = std::signal(SIGXFSZ, SIG_IGN);
  rlimit tight = old;
  tight.rlim_cur = 4096;
  ASSERT_EQ(setrlimit(RLIMIT_FSIZE, &tight), 0);
  const auto second = make_judged_lot(60, 19e3, 21e3, 11);
  const std::string error = write_lot_summary_pdf(second.input(), pdf.string());
  setrlimit(RLIMIT_FSIZE, &old);
  std::signal(SIGXFSZ, previous_handler);

  EXPECT_NE(error.find("summary.pdf"), std::string::npos) << error;
  EXPECT_EQ(read_bytes(pdf), before);
  EXPECT_EQ(files_in(dir), 1u);  // the temporary was removed
}

TEST(LotSummaryPdf, RefusesInputWithoutAFit) {
  const auto lot = make_judged_lot(5, 17e3, 23e3);
  photolot::report::SummaryInput in;
  in.lot = &lot.lot;
  const fs::path pdf = photolot::test::scratch_dir() / "summary.pdf";
  EXPECT_NE(write_lot_summary_pdf(in, pdf.string()), "");
  EXPECT_FALSE(fs::exists(pdf));
}

TEST(LotSummaryPdf, LotWithNoFittedUnitStillPrintsAndSaysWhyEachWasNotFitted) {
  // Without a spec or verdicts, units that could not be fitted are the list of problems.
  auto lot = make_judged_lot(8, 17e3, 23e3);
  for (auto& u : lot.fit.units) {
    u.status = photolot::FitStatus::too_few_levels;
    u.message = "2 illuminance levels, 3 needed";
  }
  photolot::report::SummaryInput in;
  in.lot = &lot.lot;
  in.fit = &lot.fit;
  const std::string flat = summary_text(in);
  ASSERT_FALSE(flat.empty());
  for (const auto& u : lot.fit.units) EXPECT_NE(flat.find(u.id), std::string::npos) << u.id;
  EXPECT_NE(flat.find("not fitted: 2 illuminance levels, 3 needed"), std::string::npos);
  EXPECT_NE(flat.find("0 of 8"), std::string::npos);  // units fitted
}

// ---- what the fit's models add (issue 6): curve model, temperature, bench profile ----

TEST(LotSummaryPdf, CountsEachCurveModelAndNamesItBesideEachNonconformingUnit) {
  // Give every nonconforming unit of the invented lot a dark-conductance curve (a 10 Mohm leak,
  // 1e-7 S, in parallel with the same photoconductance), so the counts on the page must be the
  // fixture's own tally.
  auto lot = make_judged_lot(60, 17e3, 23e3);
  ASSERT_GE(lot.nonconforming_ids.size(), 2u);
  std::size_t dark = 0;
  for (auto& u : lot.fit.units) {
    const bool bad = std::find(lot.nonconforming_ids.begin(), lot.nonconforming_ids.end(), u.id) !=
                     lot.nonconforming_ids.end();
    if (!bad) continue;
    u.curve.model = photolot::ModelKind::dark_conductance;
    u.curve.params = {-std::log(u.r10_ohm), u.gamma, 1e-7};
    u.curve.covariance.clear();
    u.aicc_power_law = 10;
    u.aicc_dark_conductance = 2;
    ++dark;
  }
  const std::size_t power = lot.fit.units.size() - dark;
  const std::string flat = summary_text(lot.input());
  ASSERT_FALSE(flat.empty());
  expect_all(flat, {"Curve model, temperature and meters",
                    fmt::format("{} power law, {} dark conductance", power, dark),
                    "chosen per unit by the lower AICc"});
  for (const auto& id : lot.nonconforming_ids)
    EXPECT_NE(flat.find(id + " dark conductance"), std::string::npos) << id;
}

TEST(LotSummaryPdf, SaysWhenTheTemperatureEffectWasNotIdentifiableAndWhatWasApplied) {
  auto lot = make_judged_lot(30, 17e3, 23e3);
  lot.fit.temperature.identifiable = false;
  lot.fit.temperature.span_c = 0;
  lot.fit.temperature.source = "none";
  lot.fit.temperature.outcome = photolot::TemperatureOutcome::not_identifiable;
  lot.fit.temperature.reason = "the readings span 0.00 degC, at least 5 needed";
  lot.fit.temperature.message =
      "not identifiable: the readings span 0.00 degC, at least 5 needed; no coefficient applied";
  const std::string flat = summary_text(lot.input());
  ASSERT_FALSE(flat.empty());
  expect_all(flat, {"Temperature effect not identifiable from these readings",
                    "the readings span 0.00 \u00b0C", "Coefficient applied none",
                    "R10 and gamma stated at the bench temperature (no correction)",
                    "R10 and gamma are at the bench temperature"});
  EXPECT_EQ(flat.find("stated at 25"), std::string::npos);
}

TEST(LotSummaryPdf, PrintsTheFittedCoefficientItsSlopeAndSpanAndThat25DegreesIsTheBasis) {
  // The invented lot's readings are said to span 15 degC around 25 degC; the coefficient and
  // its slope are stated values, printed to 3 decimals in %/degC.
  auto lot = make_judged_lot(30, 17e3, 23e3);
  for (std::size_t i = 0; i < lot.lot.units.size(); ++i)
    for (auto& r : lot.lot.units[i].readings) r.temp_c = 17.5 + 15.0 * static_cast<double>(i % 2);
  auto& t = lot.fit.temperature;
  t.outcome = photolot::TemperatureOutcome::fitted;
  t.identifiable = true;
  t.span_c = 15;
  t.coefficient_pct_per_c = -0.41;
  t.slope_pct_per_c_per_decade = 0.05;
  t.source = "fitted";
  const std::string flat = summary_text(lot.input());
  ASSERT_FALSE(flat.empty());
  expect_all(flat, {"Temperature effect identifiable", "17.5 to 32.5 \u00b0C, a span of 15.0",
                    "Coefficient at 10 lx -0.410 %/\u00b0C", "+0.050 %/\u00b0C per decade",
                    "Coefficient applied fitted", "R10 and gamma stated at 25 \u00b0C",
                    "R10 and gamma are stated at 25 \u00b0C."});
  // The spec's coefficient, applied where the readings did not identify one.
  t = {};
  t.source = "spec";
  t.coefficient_pct_per_c = -0.3;
  t.slope_pct_per_c_per_decade = 0;
  const std::string spec_flat = summary_text(lot.input());
  expect_all(spec_flat, {"Coefficient applied the spec's coefficient, -0.300 %/\u00b0C at 10 lx",
                         "R10 and gamma stated at 25 \u00b0C"});
}

TEST(LotSummaryPdf, SaysTheTemperatureEffectWasNotSoughtWhenTheRunAppliedAGivenCoefficient) {
  // A run set to apply the spec's coefficient never looks for the lot's own: the summary must
  // not call it "not identifiable" (the readings were never asked).
  auto lot = make_judged_lot(20, 17e3, 23e3);
  auto& t = lot.fit.temperature;
  t.outcome = photolot::TemperatureOutcome::not_sought;
  t.reason = "the run applies a given coefficient instead of fitting one";
  t.source = "spec";
  t.coefficient_pct_per_c = -0.3;
  t.slope_pct_per_c_per_decade = 0;
  const std::string flat = summary_text(lot.input());
  ASSERT_FALSE(flat.empty());
  expect_all(flat, {"Temperature effect not sought: the run applies a given coefficient",
                    "Coefficient applied the spec's coefficient, -0.300 %/\u00b0C at 10 lx"});
  EXPECT_EQ(flat.find("not identifiable"), std::string::npos) << flat;
}

TEST(LotSummaryPdf, ListsTheBenchProfilesMeterAccuraciesOrSaysThereWasNone) {
  auto lot = make_judged_lot(20, 17e3, 23e3);
  EXPECT_NE(summary_text(lot.input()).find("Bench profile none"), std::string::npos);

  // An invented bench: a 2 kohm range good to 0.5 % + 2 counts of 0.1 ohm, a 20 Mohm range to
  // 0.8 % + 3 counts of 1 kohm, and a 3 % lux meter.
  photolot::BenchProfile bench;
  bench.ohm_ranges = {{20e6, 0.8, 3, 1e3}, {2e3, 0.5, 2, 0.1}};
  bench.lux_pct = 3;
  auto in = lot.input();
  in.bench = &bench;
  in.bench_profile_file = "profiles/bench-2.toml";
  const std::string flat = summary_text(in);
  expect_all(flat, {"Bench profile bench-2.toml",
                    "range 2.00 k\u03a9: 0.5 % of reading + 2 digits of 100 m\u03a9",
                    "range 20.0 M\u03a9: 0.8 % of reading + 3 digits of 1.00 k\u03a9",
                    "Lux meter 3 % of reading"});

  // A fit that says it used a profile the summary was not given must not print "none".
  lot.fit.method += ", weights from the bench profile";
  const std::string unknown = summary_text(lot.input());
  EXPECT_EQ(unknown.find("Bench profile none"), std::string::npos);
  EXPECT_NE(unknown.find("were not passed to this summary"), std::string::npos);
}

TEST(LotSummaryPdf, RefusesABenchProfileThatIsNotValid) {
  const auto lot = make_judged_lot(5, 17e3, 23e3);
  photolot::BenchProfile bench;
  bench.lux_pct = -1;
  auto in = lot.input();
  in.bench = &bench;
  const fs::path pdf = photolot::test::scratch_dir() / "summary.pdf";
  EXPECT_NE(write_lot_summary_pdf(in, pdf.string()).find("bench profile"), std::string::npos);
  EXPECT_FALSE(fs::exists(pdf));
}
