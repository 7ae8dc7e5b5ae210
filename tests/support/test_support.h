// Test-support helpers shared by every test program: paths to the repository's files and a
// scratch folder per test.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace photolot::test {

// A path inside the source tree, e.g. source_path("sample-data/demo-lot.csv").
std::filesystem::path source_path(const std::string& relative);

// A fresh, empty folder for the running test (removed and re-made on each call).
std::filesystem::path scratch_dir();

// Writes text to a file under scratch_dir() and returns its path.
std::filesystem::path write_scratch_file(const std::string& name, const std::string& content);

// The whole content of a file, as bytes ("" when it cannot be read).
std::string read_file(const std::filesystem::path& path);

// Runs `command` through the shell in folder `dir`; its exit code, or -1 when it did not exit
// (killed by a signal).
int run_in(const std::filesystem::path& dir, const std::string& command);

// A finished run of a program: exit code (-1 when it did not exit normally) and its output.
struct CliRun {
  int code = -1;
  std::string out, err;
};

// The whole content of a file (empty when it cannot be read).
std::string slurp(const std::filesystem::path& path);

// Text with every run of blanks, tabs, line and page breaks made one space (none at either
// end): pdftotext joins or splits words at line ends, so PDF text is compared this way.
std::string collapse_space(const std::string& text);

// Single-quotes a word for the POSIX shell.
std::string shell_quote(const std::string& word);

// Runs `program` with `args` in folder `dir` under the C.UTF-8 locale, as a user would from a
// shell there; stdout and stderr are captured through dir/stdout.txt and dir/stderr.txt.
CliRun run_program(const std::string& program, const std::vector<std::string>& args,
                   const std::filesystem::path& dir);

}  // namespace photolot::test
