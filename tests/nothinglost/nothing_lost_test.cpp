// Nothing lost when a save is killed: a child process writes a large file through photolot's
// atomic writer (the one photolot-cli writes --json and --units-csv with) onto an existing file
// and is killed with SIGKILL, which no program can catch or clean up after, at several moments.
// Every time the file on disk is the previous one byte for byte, or (only when the kill came
// after the rename) the complete new one; never a mix. The next save removes the temporary
// files the killed writers left (core/include/photolot/atomic_file.h).
#include <gtest/gtest.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <filesystem>
#include <fstream>
#include <string>
#include <thread>
#include <vector>

#include "test_support.h"

namespace photolot::test {
namespace {

namespace fs = std::filesystem;
using namespace std::chrono_literals;

constexpr int kSizeMb = 48;

pid_t start_writer(const fs::path& target, char fill) {
  const std::string size = std::to_string(kSizeMb);
  const std::string fill_text(1, fill);
  const pid_t pid = ::fork();
  if (pid == 0) {
    ::execl(PHOTOLOT_ATOMIC_WRITER, "atomic_writer", target.c_str(), size.c_str(),
            fill_text.c_str(), static_cast<char*>(nullptr));
    ::_exit(127);
  }
  return pid;
}

std::vector<fs::path> temporaries(const fs::path& dir) {
  std::vector<fs::path> out;
  for (const auto& e : fs::directory_iterator(dir))
    if (e.path().filename().string().rfind(".out.json.tmp-", 0) == 0) out.push_back(e.path());
  return out;
}

// Waits until the writer's temporary file holds at least `bytes` (or a second has passed).
void wait_for_temporary(const fs::path& dir, std::uintmax_t bytes) {
  const auto until = std::chrono::steady_clock::now() + 1s;
  while (std::chrono::steady_clock::now() < until) {
    for (const auto& t : temporaries(dir)) {
      std::error_code ec;
      if (fs::file_size(t, ec) >= bytes && !ec) return;
    }
    std::this_thread::sleep_for(100us);
  }
}

int kill_and_reap(pid_t pid) {
  ::kill(pid, SIGKILL);
  int status = 0;
  ::waitpid(pid, &status, 0);
  return status;
}

TEST(NothingLost, KilledSaveLeavesThePreviousFileWholeEveryTime) {
  const fs::path dir = scratch_dir();
  const fs::path target = dir / "out.json";
  const std::string previous = "{\"the previous\": \"results document\"}\n";
  const std::string complete(std::size_t{kSizeMb} << 20, 'n');
  std::ofstream(target, std::ios::binary) << previous;

  // The moments: at once; when the temporary file appears; a quarter and three quarters
  // written; after fixed delays (these may land after the rename on a fast disk).
  struct Moment {
    const char* name;
    std::uintmax_t temp_bytes;  // wait for the temporary to reach this size; 0: use delay
    std::chrono::milliseconds delay;
    bool must_be_previous;
  };
  const Moment moments[] = {
      {"at once", 0, 0ms, true},
      {"temporary created", 1, 0ms, false},
      {"a quarter written", complete.size() / 4, 0ms, false},
      {"three quarters written", complete.size() / 4 * 3, 0ms, false},
      {"after 5 ms", 0, 5ms, false},
      {"after 30 ms", 0, 30ms, false},
      {"after 120 ms", 0, 120ms, false},
  };
  int killed_mid_write = 0;
  for (const Moment& m : moments) {
    SCOPED_TRACE(m.name);
    const pid_t pid = start_writer(target, 'n');
    ASSERT_GT(pid, 0);
    if (m.temp_bytes > 0) wait_for_temporary(dir, m.temp_bytes);
    if (m.delay.count() > 0) std::this_thread::sleep_for(m.delay);
    const int status = kill_and_reap(pid);
    const bool was_killed = WIFSIGNALED(status);
    const std::string now = read_file(target);
    if (now == previous) {
      if (was_killed) ++killed_mid_write;
    } else {
      // Only a writer that got as far as its rename may have replaced the file, and then whole.
      EXPECT_FALSE(m.must_be_previous);
      EXPECT_EQ(now.size(), complete.size());
      EXPECT_TRUE(now == complete) << "the file holds a mix of old and new";
      std::ofstream(target, std::ios::binary | std::ios::trunc) << previous;
    }
  }
  // At least the kills before the temporary was complete hit a writer mid-save.
  EXPECT_GE(killed_mid_write, 1);

  // The next save replaces the file and leaves no temporary file behind: its own is renamed,
  // the killed writers' are removed as their processes are gone.
  const pid_t pid = start_writer(target, 'n');
  int status = 0;
  ::waitpid(pid, &status, 0);
  ASSERT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0);
  EXPECT_TRUE(read_file(target) == complete);
  EXPECT_TRUE(temporaries(dir).empty()) << temporaries(dir).front();
}

TEST(NothingLost, TemporaryOfAWriterStillRunningIsLeftAlone) {
  // A second writer of the same file must not delete the temporary of one that is still working.
  const fs::path dir = scratch_dir();
  const fs::path mine = dir / (".out.json.tmp-" + std::to_string(::getppid()) + "-0");
  std::ofstream(mine) << "in progress";
  const pid_t pid = start_writer(dir / "out.json", 'x');
  int status = 0;
  ::waitpid(pid, &status, 0);
  ASSERT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0);
  EXPECT_TRUE(fs::exists(mine));
}

}  // namespace
}  // namespace photolot::test
