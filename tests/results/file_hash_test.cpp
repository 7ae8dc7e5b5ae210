// FNV-1a 64 fingerprints of the input files.
#include <gtest/gtest.h>

#include "photolot/import.h"
#include "photolot/results.h"
#include "test_support.h"

namespace photolot::results {
namespace {

TEST(FileHash, MatchesThePublishedFnv1a64TestVectors) {
  // Test vectors of the FNV reference code (Noll, fnv/test_fnv.c, FNV-1a 64), from memory.
  EXPECT_EQ(fnv1a64(""), 0xcbf29ce484222325ULL);
  EXPECT_EQ(fnv1a64("a"), 0xaf63dc4c8601ec8cULL);
  EXPECT_EQ(fnv1a64("foobar"), 0x85944171f73967e8ULL);
  EXPECT_EQ(fnv1a64_hex("a"), "af63dc4c8601ec8c");
}

TEST(FileHash, DescribesAFileBySizeAndHashOfTheBytesGiven) {
  const InputFile f = describe_content("logs/a.csv", "foobar");
  EXPECT_EQ(f.path, "logs/a.csv");
  EXPECT_EQ(f.size_bytes, 6u);
  EXPECT_EQ(f.fnv1a64, "85944171f73967e8");  // FNV-1a 64 of "foobar", as above
}

TEST(FileHash, TheImportHandsOverExactlyTheBytesItRead) {
  // import_files' on_read sees each readable file once, in order, with its whole content, and
  // never a file it could not read.
  const std::string a = "unit,lux,ohm\nA1,10,4700\nA1,100,900\n";
  const std::string b = "unit,lux,ohm\nB1,10,5100\nB1,100,990\n";
  const auto pa = test::write_scratch_file("a.csv", a);
  const auto pb = test::write_scratch_file("b.csv", b);
  const std::string missing = (pa.parent_path() / "missing.csv").string();
  std::vector<InputFile> seen;
  const ImportResult r = import_files(
      {pa.string(), missing, pb.string()}, {},
      [&](const std::string& path, std::string_view content) {
        seen.push_back(describe_content(path, content));
      });
  EXPECT_EQ(r.errors.size(), 1u);
  ASSERT_EQ(seen.size(), 2u);
  EXPECT_EQ(seen[0].path, pa.string());
  EXPECT_EQ(seen[0].size_bytes, a.size());
  EXPECT_EQ(seen[0].fnv1a64, fnv1a64_hex(a));
  EXPECT_EQ(seen[1].path, pb.string());
  EXPECT_EQ(seen[1].fnv1a64, fnv1a64_hex(b));
}

}  // namespace
}  // namespace photolot::results
