// write_file_atomically: temporary file beside the target, write, fsync, rename, fsync folder.
// POSIX (open/fsync/rename); photolot's supported platforms are Debian and its kin.
#include "photolot/atomic_file.h"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cstring>

namespace photolot {
namespace {

std::string errno_text(int err) { return std::strerror(err); }

// Closes and removes the temporary file unless released.
class TempFile {
 public:
  TempFile(int fd, std::string path) : fd_(fd), path_(std::move(path)) {}
  TempFile(const TempFile&) = delete;
  TempFile& operator=(const TempFile&) = delete;
  ~TempFile() {
    if (fd_ >= 0) ::close(fd_);
    if (!released_) ::unlink(path_.c_str());
  }
  int fd() const { return fd_; }
  const std::string& path() const { return path_; }
  int close() {
    int rc = ::close(fd_);
    fd_ = -1;
    return rc;
  }
  void release() { released_ = true; }

 private:
  int fd_;
  std::string path_;
  bool released_ = false;
};

std::atomic<unsigned> g_counter{0};

}  // namespace

std::optional<WriteError> write_file_atomically(const std::filesystem::path& target,
                                                std::string_view content) {
  auto fail = [&](std::string message) {
    return std::optional<WriteError>(WriteError{target.string(), std::move(message)});
  };
  if (target.empty()) return fail("no file name given");
  std::filesystem::path folder = target.parent_path();
  std::string folder_text = folder.empty() ? "." : folder.string();
  std::string name = target.filename().string();
  if (name.empty() || name == "." || name == "..") return fail("not a file name");

  // Keep the permission bits of a file being replaced; refuse to replace a folder.
  mode_t mode = 0666;
  bool keep_mode = false;
  struct stat st {};
  if (::stat(target.c_str(), &st) == 0) {
    if (S_ISDIR(st.st_mode)) return fail("is a folder");
    mode = st.st_mode & 07777;
    keep_mode = true;
  }

  int fd = -1;
  std::string temp_path;
  for (int attempt = 0; attempt < 100 && fd < 0; ++attempt) {
    temp_path = (folder / fmt::format(".{}.tmp-{}-{}", name, ::getpid(), g_counter++)).string();
    fd = ::open(temp_path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, mode);
    if (fd < 0 && errno != EEXIST) {
      return fail(fmt::format("cannot create a temporary file in '{}': {}", folder_text,
                              errno_text(errno)));
    }
  }
  if (fd < 0) return fail(fmt::format("cannot create a temporary file in '{}'", folder_text));
  TempFile temp(fd, temp_path);
  if (keep_mode) ::fchmod(temp.fd(), mode);  // open() applied the umask; restore the old bits

  const char* data = content.data();
  std::size_t left = content.size();
  while (left > 0) {
    ssize_t n = ::write(temp.fd(), data, left);
    if (n < 0) {
      if (errno == EINTR) continue;
      return fail(fmt::format("cannot write '{}': {}", temp.path(), errno_text(errno)));
    }
    data += n;
    left -= static_cast<std::size_t>(n);
  }
  if (::fsync(temp.fd()) != 0)
    return fail(fmt::format("cannot flush '{}' to disk: {}", temp.path(), errno_text(errno)));
  if (temp.close() != 0)
    return fail(fmt::format("cannot close '{}': {}", temp.path(), errno_text(errno)));
  if (::rename(temp.path().c_str(), target.c_str()) != 0)
    return fail(fmt::format("cannot rename '{}' into place: {}", temp.path(), errno_text(errno)));
  temp.release();

  // Make the rename itself durable; a failure here loses nothing already written.
  int dir_fd = ::open(folder_text.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (dir_fd >= 0) {
    ::fsync(dir_fd);
    ::close(dir_fd);
  }
  return std::nullopt;
}

}  // namespace photolot
