#include "workbench_fixtures.h"

#include <QCoreApplication>
#include <QElapsedTimer>
#include <QThread>

#include <fstream>

namespace photolot::workbench::test {

synth::LotSpec small_lot_spec() {
  synth::LotSpec spec;
  spec.seed = 7;
  spec.units = 12;
  spec.r10_median_ohm = 20e3;
  spec.gamma_mean = 0.75;
  spec.noise_pct = 0.5;
  return spec;
}

void write_log(const std::filesystem::path& path, const synth::LotSpec& spec) {
  std::filesystem::create_directories(path.parent_path());
  std::ofstream(path, std::ios::binary) << synth::to_csv(synth::simulate(spec).lot);
}

bool wait_idle(AnalysisSession& session, int timeout_ms) {
  QElapsedTimer timer;
  timer.start();
  // A queued result may still be on its way after the worker ends: process events until the
  // session says idle and nothing is pending.
  do {
    QCoreApplication::processEvents(QEventLoop::AllEvents, 20);
    if (!session.busy()) {
      QCoreApplication::processEvents();
      if (!session.busy()) return true;
    }
    QThread::msleep(2);
  } while (timer.elapsed() < timeout_ms);
  return false;
}

std::filesystem::path scratch_root() {
  auto dir = std::filesystem::temp_directory_path() / "photolot-workbench-tests";
  std::filesystem::create_directories(dir);
  return dir;
}

}  // namespace photolot::workbench::test
