// A small judged lot for the summary tests, and helpers that read a PDF back with poppler-utils
// (pdftotext, pdfinfo): the checks read what a printed page says, not our own layout code.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "photolot/acceptance.h"
#include "photolot/fit_result.h"
#include "photolot/lot.h"
#include "photolot/report/summary.h"
#include "photolot/spec.h"
#include "photolot/statistics.h"

namespace photolot::test {

// Everything a summary reads, owned together. The lot comes from the synthetic-lot generator
// (stated parameters, fixed seed); its "fit" is each unit's true curve, because these tests
// check the printout, not the fit. Verdicts, statistics and the disposition come from core's
// judge, lot_statistics and decide under an invented spec (ISO 2859-1 level II, AQL 1 %).
struct JudgedLot {
  Lot lot;
  LotFit fit;
  Spec spec;
  LotStatistics stats;
  std::vector<UnitVerdict> verdicts;
  Acceptance acceptance;
  std::vector<std::string> nonconforming_ids;

  report::SummaryInput input() const;
};

// units: lot size; r10 window tight enough that some units fall outside it.
JudgedLot make_judged_lot(std::size_t units, double r10_min_ohm, double r10_max_ohm,
                          std::uint64_t seed = 7);

// A pairs section over the lot's first 2 * pairs units, taken in order, with made-up errors
// error_step_pct, 2 x error_step_pct, ... (the printout's input, not a pairing).
report::PairsSection make_pairs(const JudgedLot& lot, int pairs, double error_step_pct,
                                double tolerance_pct);

// pdftotext -layout of the file, or nullopt when pdftotext failed.
std::optional<std::string> pdf_text(const std::filesystem::path& pdf);
// The same for one page (1-based).
std::optional<std::string> pdf_page_text(const std::filesystem::path& pdf, int page);
// "Pages:" and "Page size:" from pdfinfo; pages 0 when pdfinfo failed.
struct PdfInfo {
  int pages = 0;
  std::string page_size;  // e.g. "595.276 x 841.89 pts (A4)"
};
PdfInfo pdf_info(const std::filesystem::path& pdf);

// collapse_space (tests/support/test_support.h) evens out pdftotext's line breaks.

}  // namespace photolot::test
