#include "test_support.h"

#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cstdlib>
#include <fstream>
#include <iterator>

namespace photolot::test {

std::filesystem::path source_path(const std::string& relative) {
  return std::filesystem::path(PHOTOLOT_SOURCE_DIR) / relative;
}

std::filesystem::path scratch_dir() {
  const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
  std::string name = info ? std::string(info->test_suite_name()) + "." + info->name() : "no-test";
  auto dir = std::filesystem::temp_directory_path() / "photolot-tests" / name;
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  return dir;
}

std::filesystem::path write_scratch_file(const std::string& name, const std::string& content) {
  const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
  std::string test = info ? std::string(info->test_suite_name()) + "." + info->name() : "no-test";
  auto dir = std::filesystem::temp_directory_path() / "photolot-tests" / test;
  std::filesystem::create_directories(dir);
  auto path = dir / name;
  std::ofstream(path, std::ios::binary) << content;
  return path;
}

std::string read_file(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

int run_in(const std::filesystem::path& dir, const std::string& command) {
  const std::string line = "cd '" + dir.string() + "' && " + command;
  const int status = std::system(line.c_str());
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

std::string slurp(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

std::string collapse_space(const std::string& text) {
  std::string out;
  bool space = false;
  for (char ch : text) {
    if (ch == ' ' || ch == '\n' || ch == '\t' || ch == '\f' || ch == '\r') {
      space = true;
      continue;
    }
    if (space && !out.empty()) out += ' ';
    space = false;
    out += ch;
  }
  return out;
}

std::string shell_quote(const std::string& word) {
  std::string q = "'";
  for (char c : word) q += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return q + "'";
}

CliRun run_program(const std::string& program, const std::vector<std::string>& args,
                   const std::filesystem::path& dir) {
  std::string cmd =
      "cd " + shell_quote(dir.string()) + " && LC_ALL=C.UTF-8 " + shell_quote(program);
  for (const auto& a : args) cmd += " " + shell_quote(a);
  cmd += " >" + shell_quote((dir / "stdout.txt").string()) + " 2>" +
         shell_quote((dir / "stderr.txt").string());
  const int status = std::system(cmd.c_str());
  CliRun r;
  r.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = slurp(dir / "stdout.txt");
  r.err = slurp(dir / "stderr.txt");
  return r;
}

}  // namespace photolot::test
