// Shared helpers of the workbench tests: synthetic bench logs from the project's generator
// (stated parameters, fixed seed) and waiting for the session without blocking the event loop.
#pragma once

#include <QString>

#include <filesystem>
#include <string>

#include "photolot/synth.h"
#include "session.h"

namespace photolot::workbench::test {

// The lot the window tests use: 12 units, R10 median 20 kohm, gamma 0.75, 0.5 % noise.
synth::LotSpec small_lot_spec();
// Writes the synthetic lot as a bench log (comma dialect) to `path`.
void write_log(const std::filesystem::path& path, const synth::LotSpec& spec);
// Spins the event loop until the session is idle, or timeout_ms passes; false on timeout.
bool wait_idle(AnalysisSession& session, int timeout_ms = 60000);
// A folder for the running process' scratch files (not a test's: shared by the fixtures).
std::filesystem::path scratch_root();

}  // namespace photolot::workbench::test
