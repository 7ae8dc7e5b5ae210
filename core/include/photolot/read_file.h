// Reading a whole input file (a bench log, a spec, a bench profile, a workspace, a file to
// hash) in one place. Only a regular file is read: a folder, a device or a pipe is refused
// without blocking, and the test is made on the opened descriptor, so a path swapped for a
// pipe between a check and the open cannot make the program wait for a writer.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

namespace photolot {

enum class ReadProblem {
  none,
  missing,      // no such file
  folder,       // a folder, not a file
  not_regular,  // a device, a pipe or a socket
  unreadable,   // exists, but cannot be opened for reading
  too_large,    // over the caller's limit: left unread (`size` says how large)
  read_error,   // the read itself failed
};

struct FileRead {
  ReadProblem problem = ReadProblem::none;
  std::uint64_t size = 0;  // bytes, when known
  std::string text;        // the whole file, when problem is none
  bool ok() const { return problem == ReadProblem::none; }
};

// Reads all of regular file `path` if it holds at most `max_bytes`.
FileRead read_regular_file(const std::string& path, std::uint64_t max_bytes);

// Words for a problem, to follow the file's name: "no such file", "is a folder, not a file", ...
std::string describe(const FileRead& read);

}  // namespace photolot
