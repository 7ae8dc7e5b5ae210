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
  in.pairs = photolot::test::make_pairs(lot, 12, 0.25, 3.0);
  const std::string error = photolot::report::write_lot_summary_pdf(in, argv[1]);
  if (!error.empty()) {
    std::fprintf(stderr, "report_preview: %s\n", error.c_str());
    return 1;
  }
  return 0;
}
