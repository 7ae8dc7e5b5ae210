// The fuzz entry points: plain functions taking a byte buffer, so the same code runs under
// libFuzzer (the fuzz_* programs, PHOTOLOT_FUZZ=ON) and under GoogleTest with the normal
// compiler (test_fuzz replays tests/fuzz/regressions/ and the seed corpora through them).
// Each feeds the bytes to one of photolot's readers through its public entry point and checks
// what the reader promises about bad input; a broken promise aborts (a crash to libFuzzer).
#pragma once

#include <cstddef>
#include <cstdint>
#include <string_view>

namespace photolot::fuzz {

// The CSV bench-log importer (import_buffers), the bytes as one file; also with the first byte
// choosing the delimiter and decimal options, and as two files merged into one lot.
void import_csv(const std::uint8_t* data, std::size_t size);
// The spec loader (parse_spec).
void spec_toml(const std::uint8_t* data, std::size_t size);
// The results-document reader (results::from_json_text); a document it accepts is written back
// and read again, and must give the same text.
void results_json(const std::uint8_t* data, std::size_t size);

// The workspace reader (workspace::parse), as the workbench's loader calls it: a document it
// accepts has resolved, bounded source paths and valid choices; written back and read again it
// gives the same text.
void workspace_json(const std::uint8_t* data, std::size_t size);

// A fuzz target's name ("import", "spec", "results", "workspace") to its entry point; nullptr if unknown.
using EntryPoint = void (*)(const std::uint8_t*, std::size_t);
EntryPoint entry_point(std::string_view target);

}  // namespace photolot::fuzz
