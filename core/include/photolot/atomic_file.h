// Writing an output file so that nothing is lost: the content goes to a temporary file beside
// the target (same folder, so the rename stays on one file system), is flushed to disk
// (fsync), and is then renamed over the target in one step. A reader sees either the old file
// or the new one, never half of either. On any failure the old file is left as it was and the
// temporary file is removed.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <string_view>

namespace photolot {

struct WriteError {
  std::string path;  // the target, as given
  std::string
      message;  // what failed, e.g. "cannot create a temporary file in 'out': Permission denied"
};

// Writes `content` to `target` atomically. nullopt on success. A new file gets the usual
// permissions (0666 less the umask); a replaced file keeps its permission bits.
std::optional<WriteError> write_file_atomically(const std::filesystem::path& target,
                                                std::string_view content);

}  // namespace photolot
