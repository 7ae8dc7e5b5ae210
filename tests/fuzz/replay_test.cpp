// Replays every kept fuzz input through its entry point with the normal compiler: the crashes
// found by fuzzing (regressions/<target>/, each fixed) and the seed corpora (corpus/<target>/).
// An entry point aborts when a reader breaks a promise its header makes about bad input, so a
// file that crashed once fails this test if the bug comes back.
#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

#include "fuzz_entry.h"

namespace photolot::fuzz {
namespace {

namespace fs = std::filesystem;

std::vector<fs::path> files_under(const fs::path& folder) {
  std::vector<fs::path> out;
  if (!fs::is_directory(folder)) return out;
  for (const auto& entry : fs::directory_iterator(folder))
    if (entry.is_regular_file() && entry.path().filename().string()[0] != '.')
      out.push_back(entry.path());
  std::sort(out.begin(), out.end());
  return out;
}

std::size_t replay(const std::string& target, const std::string& kind) {
  const EntryPoint entry = entry_point(target);
  EXPECT_NE(entry, nullptr) << target;
  std::size_t n = 0;
  for (const auto& path : files_under(fs::path(PHOTOLOT_FUZZ_DIR) / kind / target)) {
    std::ifstream in(path, std::ios::binary);
    const std::string bytes{std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
    SCOPED_TRACE(path.filename().string());
    entry(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
    ++n;
  }
  return n;
}

class FuzzReplay : public ::testing::TestWithParam<const char*> {};

TEST_P(FuzzReplay, SurvivesEveryKeptCrashInput) { replay(GetParam(), "regressions"); }

TEST_P(FuzzReplay, SurvivesEverySeedOfItsCorpus) {
  // A seed corpus that went missing would make the fuzz run start from nothing.
  EXPECT_GT(replay(GetParam(), "corpus"), 0u);
}

INSTANTIATE_TEST_SUITE_P(Targets, FuzzReplay, ::testing::Values("import", "spec", "results", "workspace"));

TEST(FuzzEntry, NamesOnlyTheKnownTargets) { EXPECT_EQ(entry_point("nonsense"), nullptr); }

}  // namespace
}  // namespace photolot::fuzz
