// Writes the lot acceptance summary of an invented lot (the tests' scenario: a reel of a made-up
// 5 mm cell from a made-up supplier, simulated with a fixed seed) so the layout can be looked at.
// Usage: report_preview OUT.pdf [letter]
#include <cstdio>
#include <string>

#include "report_fixture.h"

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fprintf(stderr, "usage: report_preview OUT.pdf [letter]\n");
    return 2;
  }
  const auto lot = photolot::test::make_judged_lot(120, 14e3, 27e3, 3);
  auto in = lot.input();
  in.header.inspector.clear();  // printed as a line to fill in
  if (argc > 2 && std::string(argv[2]) == "letter")
    in.page_size = photolot::report::PageSize::letter;
  photolot::report::PairsSection pairs;
  pairs.method = "invented example: pairs of neighbouring units, error made up for the preview";
  pairs.tolerance_pct = 3.0;
  for (int k = 0; k < 12; ++k)
    pairs.rows.push_back(
        {k + 1, lot.fit.units[2 * k].id, lot.fit.units[2 * k + 1].id, 0.25 * (k + 1)});
  pairs.unpaired = lot.fit.units.size() - 24;
  in.pairs = pairs;
  const std::string error = photolot::report::write_lot_summary_pdf(in, argv[1]);
  if (!error.empty()) {
    std::fprintf(stderr, "report_preview: %s\n", error.c_str());
    return 1;
  }
  return 0;
}
