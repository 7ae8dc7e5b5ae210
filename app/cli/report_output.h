// photolot-cli --report: the printed lot acceptance summary (app/report, Qt). A build without
// the Qt parts (PHOTOLOT_BUILD_GUI=OFF) has no PDF support and says so.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "option_groups.h"
#include "photolot/acceptance.h"
#include "photolot/bench_profile.h"
#include "photolot/pairing.h"
#include "photolot/statistics.h"

namespace photolot::cli {

// Whether this build can write the summary.
bool report_supported();

// What goes into the summary; pointers may be null for a step that did not run.
struct ReportContent {
  const Lot* lot = nullptr;
  const LotFit* fit = nullptr;
  const Spec* spec = nullptr;
  const LotStatistics* stats = nullptr;
  const Acceptance* acceptance = nullptr;
  const std::vector<UnitVerdict>* verdicts = nullptr;
  const Pairing* pairing = nullptr;
  const BenchProfile* bench = nullptr;  // the --bench profile the fit used, if any
  std::string bench_path;
};

// Writes the summary to args.path (through a temporary file and a rename). Empty on success;
// otherwise a message naming the file and the cause.
std::string write_report(const ReportArgs& args, const ReportContent& content);

}  // namespace photolot::cli
