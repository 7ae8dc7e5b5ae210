// photolot-cli --report, over photolot::report when the build has it.
#include "report_output.h"

#include <fmt/format.h>

#if PHOTOLOT_CLI_HAS_REPORT
#include "photolot/report/summary.h"
#endif

namespace photolot::cli {

#if PHOTOLOT_CLI_HAS_REPORT

bool report_supported() { return true; }

std::string write_report(const ReportArgs& args, const ReportContent& c) {
  report::SummaryInput in;
  in.lot = c.lot;
  in.fit = c.fit;
  in.spec = c.spec;
  in.stats = c.stats;
  in.acceptance = c.acceptance;
  in.verdicts = c.verdicts;
  in.bench = c.bench;
  in.bench_profile_file = c.bench_path;
  in.page_size = args.paper == "letter" ? report::PageSize::letter : report::PageSize::a4;
  // The part number as ordered is the spec's unless the command line gives one.
  in.header.part = !args.part.empty() ? args.part : (c.spec ? c.spec->part_number : "");
  in.header.lot_id = args.lot_id;
  in.header.supplier = args.supplier;
  in.header.inspector = args.inspector;
  in.header.date = args.date;
  if (c.pairing) {
    const Pairing& p = *c.pairing;
    report::PairsSection section;
    section.method = fmt::format(
        "{} tracking over {:g}\u2013{:g} lx, at most {:g} %; most pairs, then the smallest total "
        "error ({})",
        to_string(p.options.mode), p.options.lux_lo, p.options.lux_hi, p.options.tolerance_pct,
        to_string(p.proof));
    int n = 0;
    for (const auto& pair : p.pairs)
      section.rows.push_back(report::PairRow{++n, pair.a_id, pair.b_id, pair.tracking_error_pct,
                                             pair.tracking_error_sigma_pct});
    section.unpaired = p.unpaired.size();
    section.tolerance_pct = p.options.tolerance_pct;
    in.pairs = std::move(section);
  }
  if (auto why = in.validate(); !why.empty())
    return fmt::format("{}: error: cannot write the summary: {}", args.path, why);
  return report::write_lot_summary_pdf(in, args.path);
}

#else

bool report_supported() { return false; }

std::string write_report(const ReportArgs& args, const ReportContent&) {
  return fmt::format("{}: error: this build of photolot-cli has no PDF support", args.path);
}

#endif

}  // namespace photolot::cli
