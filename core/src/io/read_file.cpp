#include "photolot/read_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cstdint>

#include <fmt/format.h>

namespace photolot {
namespace {

// Closes the descriptor on every way out.
struct Descriptor {
  int fd = -1;
  ~Descriptor() {
    if (fd >= 0) ::close(fd);
  }
};

}  // namespace

FileRead read_regular_file(const std::string& path, std::uint64_t max_bytes) {
  FileRead r;
  Descriptor d;
  // O_NONBLOCK: opening a pipe with no writer returns at once instead of waiting; a regular
  // file reads the same either way.
  d.fd = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_NOCTTY | O_CLOEXEC);
  if (d.fd < 0) {
    const int err = errno;
    struct stat st {};
    if (err == ENOENT || err == ENOTDIR) {
      r.problem = ReadProblem::missing;
    } else if (::stat(path.c_str(), &st) == 0 && S_ISDIR(st.st_mode)) {
      r.problem = ReadProblem::folder;
    } else {
      r.problem = ReadProblem::unreadable;
    }
    return r;
  }
  struct stat st {};
  if (::fstat(d.fd, &st) != 0) {
    r.problem = ReadProblem::read_error;
    return r;
  }
  if (S_ISDIR(st.st_mode)) {
    r.problem = ReadProblem::folder;
    return r;
  }
  if (!S_ISREG(st.st_mode)) {
    r.problem = ReadProblem::not_regular;
    return r;
  }
  r.size = static_cast<std::uint64_t>(st.st_size);
  if (r.size > max_bytes) {
    r.problem = ReadProblem::too_large;
    return r;
  }
  // One byte past the limit is enough to tell a file that grew past it while being read.
  const std::uint64_t cap = max_bytes < UINT64_MAX ? max_bytes + 1 : max_bytes;
  r.text.resize(static_cast<std::size_t>(r.size));
  std::size_t got = 0;
  for (;;) {
    if (got == r.text.size()) {
      // The file may have grown since fstat: read on, within the limit.
      if (r.text.size() >= cap) break;
      r.text.resize(static_cast<std::size_t>(
          std::min<std::uint64_t>(cap, std::uint64_t(r.text.size()) + (1u << 16))));
    }
    const ssize_t n = ::read(d.fd, r.text.data() + got, r.text.size() - got);
    if (n < 0) {
      if (errno == EINTR) continue;
      r.problem = ReadProblem::read_error;
      r.text.clear();
      return r;
    }
    if (n == 0) break;
    got += static_cast<std::size_t>(n);
  }
  r.text.resize(got);
  r.size = got;
  if (got > max_bytes) {
    r.problem = ReadProblem::too_large;
    r.text.clear();
  }
  return r;
}

std::string describe(const FileRead& read) {
  switch (read.problem) {
    case ReadProblem::none: return "was read";
    case ReadProblem::missing: return "no such file";
    case ReadProblem::folder: return "is a folder, not a file";
    case ReadProblem::not_regular:
      return "is not a regular file (a device or a pipe); nothing was read";
    case ReadProblem::unreadable: return "cannot be opened for reading";
    case ReadProblem::too_large: return fmt::format("is {} bytes, over the limit", read.size);
    case ReadProblem::read_error: return "could not be read";
  }
  return "?";
}

}  // namespace photolot
