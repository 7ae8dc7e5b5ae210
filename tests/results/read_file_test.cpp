// read_regular_file: every input file is read through it. The refusals are facts of POSIX
// (open(2), fstat(2), mkfifo(3): a pipe opened for reading with O_NONBLOCK returns at once,
// fstat tells a regular file from a pipe or a device); the tests make each case for real.
#include "photolot/read_file.h"

#include <gtest/gtest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <filesystem>
#include <string>

#include "test_support.h"

namespace photolot {
namespace {

namespace fs = std::filesystem;

fs::path make_fifo(const std::string& name) {
  const fs::path p = test::scratch_dir() / name;
  fs::remove(p);  // from an earlier run
  EXPECT_EQ(::mkfifo(p.c_str(), 0600), 0) << p;
  return p;
}

TEST(ReadRegularFile, ReadsTheWholeFileUpToTheLimitExactly) {
  const std::string text(100'000, 'x');
  const fs::path p = test::write_scratch_file("whole.txt", text + "end");
  const FileRead at = read_regular_file(p.string(), text.size() + 3);
  ASSERT_TRUE(at.ok()) << describe(at);
  EXPECT_EQ(at.text, text + "end");
  EXPECT_EQ(at.size, text.size() + 3);
  const FileRead over = read_regular_file(p.string(), text.size() + 2);
  EXPECT_EQ(over.problem, ReadProblem::too_large);
  EXPECT_EQ(over.size, text.size() + 3);
  EXPECT_TRUE(over.text.empty());
}

TEST(ReadRegularFile, ReadsAnEmptyFile) {
  const fs::path p = test::write_scratch_file("empty.txt", "");
  const FileRead r = read_regular_file(p.string(), 10);
  ASSERT_TRUE(r.ok());
  EXPECT_TRUE(r.text.empty());
}

TEST(ReadRegularFile, RefusesAPipeAtOnceWithoutWaitingForAWriter) {
  // Were it opened for a blocking read, this test would hang (ctest's timeout fails it).
  const fs::path p = make_fifo("log.csv");
  const FileRead r = read_regular_file(p.string(), 1 << 20);
  EXPECT_EQ(r.problem, ReadProblem::not_regular);
  EXPECT_NE(describe(r).find("pipe"), std::string::npos) << describe(r);
}

TEST(ReadRegularFile, RefusesADeviceAFolderAndAMissingFile) {
  EXPECT_EQ(read_regular_file("/dev/null", 10).problem, ReadProblem::not_regular);
  EXPECT_EQ(read_regular_file(test::scratch_dir().string(), 10).problem, ReadProblem::folder);
  const FileRead missing = read_regular_file((test::scratch_dir() / "nope.csv").string(), 10);
  EXPECT_EQ(missing.problem, ReadProblem::missing);
  EXPECT_EQ(describe(missing), "no such file");
  const fs::path under_a_file = test::write_scratch_file("plain.txt", "x") / "below.csv";
  EXPECT_EQ(read_regular_file(under_a_file.string(), 10).problem, ReadProblem::missing);
}

TEST(ReadRegularFile, SaysAFileThatCannotBeOpenedIsUnreadable) {
  if (::geteuid() == 0) GTEST_SKIP() << "root reads files whatever their mode";
  const fs::path p = test::write_scratch_file("locked.csv", "x");
  fs::permissions(p, fs::perms::none);
  EXPECT_EQ(read_regular_file(p.string(), 10).problem, ReadProblem::unreadable);
}

}  // namespace
}  // namespace photolot
