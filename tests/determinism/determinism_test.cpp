// Determinism (DEVELOPERS.md: "Results are deterministic whatever the thread count"): the
// results document photolot-cli writes is byte-identical for 1, 2 and 4 worker threads and
// across runs, on a simulated lot that exercises every path of the fit: decade-slip outliers
// (the robust loss), over-range readings (censored), dark readings, and temperature drift;
// and the pairing, whose candidate search and certificate check share the same threads.
// A document that differs in any byte fails, so an order that depends on thread scheduling
// (a merge of per-thread results, a sum in a different order) cannot slip in.
#include <gtest/gtest.h>

#include <filesystem>
#include <string>

#include "test_support.h"

namespace photolot::test {
namespace {

namespace fs = std::filesystem;

int cli(const std::string& args, const fs::path& dir) {
  return run_in(dir, "'" PHOTOLOT_CLI_PATH "' " + args + " >/dev/null 2>&1");
}

// The index of the first byte where a and b differ, for the failure message.
std::size_t first_difference(const std::string& a, const std::string& b) {
  std::size_t i = 0;
  while (i < a.size() && i < b.size() && a[i] == b[i]) ++i;
  return i;
}

TEST(Determinism, ResultsDocumentIsTheSameBytesForOneTwoAndFourThreadsAndAcrossRuns) {
  const fs::path dir = scratch_dir();
  // Invented lot: 600 units, 5 % decade slips, a 1 Mohm meter range, one dark reading each.
  ASSERT_EQ(cli("simulate --out lot.csv --units 600 --seed 20261201 --outliers 0.05 "
                "--censor-above 1M --dark --temp-span 4",
                dir),
            0);
  std::string reference;
  for (const char* run : {"1", "2", "4", "4", "1"}) {
    SCOPED_TRACE(std::string("--threads ") + run);
    fs::remove(dir / "out.json");
    ASSERT_EQ(
        cli(std::string("analyze lot.csv --quiet --residuals --pair --json out.json --threads ") +
                run,
            dir),
        0);
    const std::string doc = read_file(dir / "out.json");
    ASSERT_GT(doc.size(), 100000u);
    if (reference.empty()) {
      reference = doc;
      // The lot must hold what it is meant to exercise, or the comparison proves little.
      EXPECT_NE(doc.find("\"censored\""), std::string::npos);
      EXPECT_NE(doc.find("\"dark\""), std::string::npos);
      EXPECT_NE(doc.find("\"tracking_error_pct\""), std::string::npos);  // some pairs found
      continue;
    }
    EXPECT_TRUE(doc == reference) << "first difference at byte " << first_difference(doc, reference)
                                  << ": ..." << doc.substr(first_difference(doc, reference), 80);
  }
}

}  // namespace
}  // namespace photolot::test
