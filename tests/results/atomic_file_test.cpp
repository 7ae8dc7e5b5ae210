// write_file_atomically: the new content appears whole, and a failed write leaves the old file
// as it was with no temporary file beside it.
#include "photolot/atomic_file.h"

#include <gtest/gtest.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <unistd.h>

#include <csignal>
#include <fstream>
#include <iterator>

#include "test_support.h"

namespace photolot {
namespace {

std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

std::size_t entries(const std::filesystem::path& dir) {
  return static_cast<std::size_t>(std::distance(std::filesystem::directory_iterator(dir),
                                                std::filesystem::directory_iterator{}));
}

TEST(AtomicFile, CreatesANewFileWithTheContent) {
  auto dir = test::scratch_dir();
  auto target = dir / "out.json";
  EXPECT_FALSE(write_file_atomically(target, "{\"a\": 1}\n"));
  EXPECT_EQ(slurp(target), "{\"a\": 1}\n");
  EXPECT_EQ(entries(dir), 1u);  // no temporary file left beside it
}

TEST(AtomicFile, ReplacesAnOldFileAndKeepsItsPermissions) {
  auto dir = test::scratch_dir();
  auto target = test::write_scratch_file("out.csv", "old content that is longer than the new\n");
  ::chmod(target.c_str(), 0640);
  EXPECT_FALSE(write_file_atomically(target, "new\n"));
  EXPECT_EQ(slurp(target), "new\n");
  struct stat st {};
  ASSERT_EQ(::stat(target.c_str(), &st), 0);
  EXPECT_EQ(st.st_mode & 0777, 0640u);
  EXPECT_EQ(entries(dir), 1u);
}

TEST(AtomicFile, LeavesTheOldFileIntactWhenTheWriteFailsPartWay) {
  // A file-size limit (POSIX setrlimit RLIMIT_FSIZE) makes write() fail with EFBIG after the
  // first bytes, even for root: the failure comes in the middle of writing the temporary file.
  auto dir = test::scratch_dir();
  auto target = test::write_scratch_file("out.json", "old\n");
  struct rlimit old_limit {};
  ASSERT_EQ(::getrlimit(RLIMIT_FSIZE, &old_limit), 0);
  auto old_handler = std::signal(SIGXFSZ, SIG_IGN);
  struct rlimit small = old_limit;
  small.rlim_cur = 1024;
  ASSERT_EQ(::setrlimit(RLIMIT_FSIZE, &small), 0);
  auto err = write_file_atomically(target, std::string(100000, 'x'));
  ::setrlimit(RLIMIT_FSIZE, &old_limit);
  std::signal(SIGXFSZ, old_handler);

  ASSERT_TRUE(err);
  EXPECT_EQ(err->path, target.string());
  EXPECT_NE(err->message.find("cannot write"), std::string::npos) << err->message;
  EXPECT_EQ(slurp(target), "old\n");
  EXPECT_EQ(entries(dir), 1u);
}

TEST(AtomicFile, FailsWithAClearMessageWhenNoTemporaryFileCanBeCreated) {
  // The "folder" is a regular file, so creating anything inside it fails (ENOTDIR).
  auto not_a_folder = test::write_scratch_file("plain-file", "x");
  auto err = write_file_atomically(not_a_folder / "out.json", "data");
  ASSERT_TRUE(err);
  EXPECT_NE(err->message.find("cannot create a temporary file"), std::string::npos) << err->message;
  EXPECT_EQ(slurp(not_a_folder), "x");
}

TEST(AtomicFile, LeavesTheOldFileIntactInAReadOnlyFolder) {
  if (::geteuid() == 0) GTEST_SKIP() << "root ignores folder permissions";
  auto dir = test::scratch_dir();
  auto target = test::write_scratch_file("out.json", "old\n");
  ::chmod(dir.c_str(), 0555);
  auto err = write_file_atomically(target, "new\n");
  ::chmod(dir.c_str(), 0755);
  ASSERT_TRUE(err);
  EXPECT_EQ(slurp(target), "old\n");
  EXPECT_EQ(entries(dir), 1u);
}

TEST(AtomicFile, RefusesToReplaceAFolder) {
  auto dir = test::scratch_dir();
  std::filesystem::create_directory(dir / "sub");
  auto err = write_file_atomically(dir / "sub", "data");
  ASSERT_TRUE(err);
  EXPECT_TRUE(std::filesystem::is_directory(dir / "sub"));
}

}  // namespace
}  // namespace photolot
