// photolot-cli's exit codes (also in its --help and in the README).
#pragma once

namespace photolot::cli {

inline constexpr int kExitDone = 0;        // done; rows may have been skipped (said on stderr)
inline constexpr int kExitInputError = 1;  // a file could not be read or written: no output written
inline constexpr int kExitUsageError = 2;  // a bad option or argument

}  // namespace photolot::cli
