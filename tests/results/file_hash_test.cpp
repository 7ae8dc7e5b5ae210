// FNV-1a 64 fingerprints of the input files.
#include <gtest/gtest.h>

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

TEST(FileHash, DescribesAFileBySizeAndHash) {
  auto path = test::write_scratch_file("log.csv", "foobar");
  auto f = describe_file(path.string());
  ASSERT_TRUE(f);
  EXPECT_EQ(f->path, path.string());
  EXPECT_EQ(f->size_bytes, 6u);
  EXPECT_EQ(f->fnv1a64, "85944171f73967e8");  // FNV-1a 64 of "foobar", as above
  EXPECT_FALSE(describe_file((test::scratch_dir() / "missing.csv").string()));
}

}  // namespace
}  // namespace photolot::results
