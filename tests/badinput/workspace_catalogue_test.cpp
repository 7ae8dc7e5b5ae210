// The workspace rows of docs/bad-input.md (W01...), through core's workspace reader
// (workspace::load, what the workbench's Open Workspace calls) and its look at each source
// before reading (workspace::check_source). A workspace with any problem is refused whole;
// a source that is not a plain file is named and never read; nothing is written.
#include <sys/stat.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <string>

#include "bad_input_support.h"
#include "photolot/workspace_doc.h"
#include "test_support.h"

namespace photolot::test {
namespace {

namespace fs = std::filesystem;

const std::string kHead = R"({"format": "photolot-workspace", "version": 1, )";

std::string naming(const std::string& path_json) {
  return kHead + R"("sources": [{"path": )" + path_json + "}]}";
}

workspace::ParseResult load_text(const std::string& content) {
  return workspace::load(write_scratch_file("lot.photolot", content));
}

// Refused: nothing read, and the message (file, place or member, text) contains `text`.
void expect_refused(const workspace::ParseResult& r, const std::string& text,
                    std::uint32_t line = 0) {
  ASSERT_FALSE(r.ok());
  const std::string shown = workspace::to_string(*r.error, "lot.photolot");
  EXPECT_NE(shown.find(text), std::string::npos) << shown;
  EXPECT_EQ(r.error->line, line) << shown;
  EXPECT_TRUE(r.doc.sources.empty());
}

// The look before reading at the single source of a document that loads.
workspace::SourceCheck look(const std::string& content) {
  const fs::path file = write_scratch_file("lot.photolot", content);
  const auto r = workspace::load(file);
  EXPECT_TRUE(r.ok()) << (r.error ? r.error->message : "");
  EXPECT_EQ(r.doc.sources.size(), 1u);
  if (!r.ok() || r.doc.sources.empty()) return {};
  return workspace::check_source(r.doc.sources[0], file.parent_path());
}

TEST(BadWorkspace, W01EmptyFileIsRefusedAsNotJson) {
  expect_refused(load_text(""), "lot.photolot:1:1: not valid JSON", 1);
}

TEST(BadWorkspace, W02TruncatedFileIsRefusedAtTheCut) {
  expect_refused(load_text(kHead + "\n\"sources\": [{\"path\": \"logs/re"), "lot.photolot:2:", 2);
}

TEST(BadWorkspace, W03BinaryFileIsRefusedAsNotJson) {
  expect_refused(load_text(std::string("\x89PNG\r\n\x1a\n", 8)), "1:1: not valid JSON", 1);
}

TEST(BadWorkspace, W04AResultsDocumentIsRefusedAsNotAWorkspace) {
  expect_refused(load_text(R"({"format": "photolot-results", "version": 1})"),
                 "format is not \"photolot-workspace\": not a photolot workspace");
}

TEST(BadWorkspace, W05NewerVersionIsRefusedNamingIt) {
  expect_refused(load_text(R"({"format": "photolot-workspace", "version": 2})"),
                 "version 2 is not supported (this build reads 1 to 1)");
}

TEST(BadWorkspace, W06WrongTypeIsRefusedNamingTheMemberAndTheType) {
  expect_refused(load_text(R"({"format": "photolot-workspace", "version": 1, "view": {"tab": 3}})"),
                 "view.tab must be a string, not number");
}

TEST(BadWorkspace, W07HugeNumberIsRefusedAtItsPlace) {
  // RFC 8259, 9: a parser may limit the range of numbers; 1e400 is beyond an IEEE 754 double.
  expect_refused(load_text(kHead + "\n\"fit\": {\"confidence\": 1e400}}"),
                 "2:23: not valid JSON: number overflow parsing '1e400'", 2);
}

TEST(BadWorkspace, W08APathClimbingOutOfTheFolderIsMarkedOutside) {
  const auto check = look(naming(R"("../../elsewhere/reel.csv")"));
  EXPECT_TRUE(check.outside_folder);
  EXPECT_EQ(check.state, workspace::SourceState::missing);
}

TEST(BadWorkspace, W09AnAbsolutePathElsewhereIsMarkedOutside) {
  const fs::path dir = scratch_dir();
  const fs::path elsewhere = write_scratch_file("elsewhere.csv", kGoodLog);
  fs::create_directories(dir / "ws");
  const fs::path ws = dir / "ws" / "lot.photolot";
  std::ofstream(ws) << naming("\"" + elsewhere.string() + "\"");
  const auto r = workspace::load(ws);
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.doc.sources.size(), 1u);
  EXPECT_TRUE(r.doc.sources[0].outside_folder);
  const auto check = workspace::check_source(r.doc.sources[0], ws.parent_path());
  EXPECT_TRUE(check.outside_folder);
  EXPECT_EQ(check.state, workspace::SourceState::file);
}

TEST(BadWorkspace, W10ADeviceIsNamedAndNeverRead) {
  const auto check = look(naming(R"("/dev/zero")"));
  EXPECT_EQ(check.state, workspace::SourceState::not_a_file);
  EXPECT_EQ(check.detail, "a device, not a file; never read");
}

TEST(BadWorkspace, W11APipeIsNamedAndNeverRead) {
  const fs::path dir = scratch_dir();
  ASSERT_EQ(mkfifo((dir / "pipe.csv").c_str(), 0600), 0);
  const auto check = look(naming(R"("pipe.csv")"));
  EXPECT_EQ(check.state, workspace::SourceState::not_a_file);
  EXPECT_EQ(check.detail, "a pipe or socket, not a file; never read");
}

TEST(BadWorkspace, W12AVeryLongPathIsRefused) {
  // 4096 bytes: Linux's PATH_MAX (from memory).
  expect_refused(load_text(naming("\"" + std::string(5000, 'a') + "\"")),
                 "sources[0].path is 5000 bytes long; paths over 4096 bytes are refused");
}

TEST(BadWorkspace, W13AVeryLongNameIsRefused) {
  // 255 bytes: Linux's NAME_MAX (from memory).
  expect_refused(load_text(naming("\"logs/" + std::string(300, 'b') + ".csv\"")),
                 "sources[0].path has a name of 304 bytes; names over 255 bytes are refused");
}

TEST(BadWorkspace, W14AControlCharacterInAPathIsRefused) {
  expect_refused(load_text(naming(R"("reel\u001b[2J.csv")")),
                 "sources[0].path holds a control character (byte 0x1b)");
}

TEST(BadWorkspace, W15ASourceListedTwiceIsReadOnce) {
  const auto r =
      load_text(kHead + R"("sources": [{"path": "a.csv"}, {"path": "./logs/../a.csv"}]})");
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.doc.sources.size(), 1u);
  ASSERT_EQ(r.doc.warnings.size(), 1u);
  EXPECT_EQ(r.doc.warnings[0], "sources[1]: './logs/../a.csv' is listed twice; read once");
}

TEST(BadWorkspace, W16ResultsThatDoNotReadAreSetAsideNotFatal) {
  const auto r = load_text(kHead + R"("sources": [{"path": "a.csv"}], "results": {"units": 3}})");
  ASSERT_TRUE(r.ok());
  EXPECT_TRUE(r.doc.results.is_null());
  ASSERT_EQ(r.doc.warnings.size(), 1u);
  EXPECT_NE(r.doc.warnings[0].find("set aside, the lot is fitted again from its logs"),
            std::string::npos)
      << r.doc.warnings[0];
  EXPECT_EQ(r.doc.sources.size(), 1u);  // the lot itself is kept
}

TEST(BadWorkspace, W17DeepNestingIsRefused) {
  expect_refused(
      load_text(kHead + "\"view\": " + std::string(100, '[') + std::string(100, ']') + "}"),
      "nested more than 64 levels deep");
}

TEST(BadWorkspace, W18AFileOverOneGibibyteIsRefusedUnread) {
  const fs::path path = write_scratch_file("lot.photolot", kHead + "}");
  fs::resize_file(path, (std::uint64_t{1} << 30) + 1);  // sparse: fast
  expect_refused(workspace::load(path), "a workspace over 1073741824 bytes is refused unread");
}

TEST(BadWorkspace, W19AFolderOrDeviceGivenAsTheWorkspaceIsRefusedUnread) {
  expect_refused(workspace::load("/dev/zero"), "is not a file (a folder, device or pipe)");
  expect_refused(workspace::load(scratch_dir()), "is not a file (a folder, device or pipe)");
  const fs::path pipe = scratch_dir() / "lot.photolot";
  fs::remove(pipe);  // from an earlier run
  ASSERT_EQ(::mkfifo(pipe.c_str(), 0600), 0);
  expect_refused(workspace::load(pipe), "is not a file (a folder, device or pipe)");
}

TEST(BadWorkspace, W20AnUnknownLossIsRefused) {
  expect_refused(load_text(kHead + R"("fit": {"loss": "l2"}})"),
                 "fit.loss = \"l2\" is not huber, cauchy or none");
}

TEST(BadWorkspace, W21AnImportChoiceOfTheWrongShapeIsRefused) {
  expect_refused(load_text(kHead + R"("import": {"delimiter": ";;"}})"),
                 "import.delimiter must be a string of at most one character");
}

TEST(BadWorkspace, W22AMissingSourceIsNamedBeforeAnythingIsRead) {
  const auto check = look(naming(R"("gone.csv")"));
  EXPECT_EQ(check.state, workspace::SourceState::missing);
  EXPECT_EQ(check.detail, "no such file");
  EXPECT_FALSE(check.outside_folder);
}

TEST(BadWorkspace, W23AHashThatIsNotSha256IsRefused) {
  expect_refused(load_text(kHead + R"("sources": [{"path": "a.csv", "sha256": "abc"}]})"),
                 "sources[0].sha256 must be 64 lowercase hexadecimal digits (SHA-256)");
}

TEST(BadWorkspace, W24ASourceOverTheLogLimitIsRefusedUnread) {
  const fs::path big = write_scratch_file("big.csv", kGoodLog);
  fs::resize_file(big, kMaxLogFileBytes + 1);  // sparse: fast
  const auto check = look(naming(R"("big.csv")"));
  EXPECT_EQ(check.state, workspace::SourceState::too_large);
  EXPECT_NE(check.detail.find("refused unread"), std::string::npos) << check.detail;
}

}  // namespace
}  // namespace photolot::test
