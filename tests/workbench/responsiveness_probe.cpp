// Measures how the workbench keeps up with a big lot: a 10,000-unit log (120,000 rows: ten
// light levels, one dark reading and one over-range level per unit) is opened and fitted in
// the window while a 5 ms heartbeat timer records the longest gap between its ticks (the
// longest the event loop was blocked). Then the whole lot is selected and the curves view's
// draw is timed. Prints the figures; asserts no times (docs/performance.md, "## Workbench").
//
//   QT_QPA_PLATFORM=offscreen build/tests/workbench/workbench_responsiveness [units]
#include <QApplication>
#include <QElapsedTimer>
#include <QSettings>
#include <QTableView>
#include <QTimer>

#include <cstdio>
#include <cstdlib>
#include <fstream>

#include <qcustomplot.h>

#include "curves_view.h"
#include "main_window.h"
#include "spread_view.h"
#include "workbench_fixtures.h"

using photolot::workbench::MainWindow;
namespace test = photolot::workbench::test;

namespace {

struct Heartbeat {
  QElapsedTimer clock;
  qint64 last = 0;
  qint64 longest = 0;
  qint64 ticks = 0;
  void start() {
    clock.start();
    last = 0;
    longest = 0;
    ticks = 0;
  }
  void tick() {
    const qint64 now = clock.nsecsElapsed();
    longest = std::max(longest, now - last);
    last = now;
    ++ticks;
  }
};

}  // namespace

int main(int argc, char** argv) {
  // Test discovery runs this program without ctest's environment: never ask for a display.
  if (!qEnvironmentVariableIsSet("QT_QPA_PLATFORM")) qputenv("QT_QPA_PLATFORM", "offscreen");
  QApplication app(argc, argv);
  QApplication::setOrganizationName(QStringLiteral("photolot-probe"));
  QSettings::setDefaultFormat(QSettings::IniFormat);
  QSettings::setPath(QSettings::IniFormat, QSettings::UserScope,
                     QString::fromStdString((test::scratch_root() / "probe-settings").string()));
  const std::size_t units = argc > 1 ? std::strtoul(argv[1], nullptr, 10) : 10000;

  photolot::synth::LotSpec spec;
  spec.seed = 2024;
  spec.units = units;
  spec.dark_readings = true;
  spec.lux_levels = {0.5, 1, 2, 5, 10, 20, 50, 100, 200, 500, 1000};
  spec.meter_max_ohm = 150e3;  // the 0.5 lx reading of most units is over range
  spec.outlier_fraction = 0.005;
  const auto log = test::scratch_root() / "probe-lot.csv";
  test::write_log(log, spec);
  std::size_t rows = 0;
  {
    std::ifstream in(log);
    std::string line;
    while (std::getline(in, line)) ++rows;
  }

  MainWindow window;
  window.resize(1400, 900);
  window.show();
  Heartbeat beat;
  QTimer timer;
  timer.setInterval(5);
  QObject::connect(&timer, &QTimer::timeout, [&] { beat.tick(); });

  QElapsedTimer total;
  beat.start();
  timer.start();
  total.start();
  window.openPaths({QString::fromStdString(log.string())});
  const qint64 open_call_ms = total.elapsed();
  test::wait_idle(*window.session(), 600000);
  // Let the views settle (queued replots) before the heartbeat stops.
  for (int i = 0; i < 20; ++i) {
    QCoreApplication::processEvents(QEventLoop::AllEvents, 10);
  }
  const qint64 open_fit_ms = total.elapsed();
  timer.stop();

  // The curves of the whole lot: selection to a drawn plot.
  QElapsedTimer draw;
  draw.start();
  window.selectUnits([&] {
    std::vector<int> all(window.session()->lot()->units.size());
    for (std::size_t i = 0; i < all.size(); ++i) all[i] = static_cast<int>(i);
    return all;
  }());
  window.curvesView()->plot()->replot(QCustomPlot::rpImmediateRefresh);
  const qint64 curves_ms = draw.elapsed();
  QElapsedTimer redraw;
  redraw.start();
  window.curvesView()->plot()->replot(QCustomPlot::rpImmediateRefresh);
  const qint64 replot_ms = redraw.elapsed();

  const auto fit = window.session()->lotFit();
  std::printf("units %zu, log rows %zu (with header), fitted %zu\n", units, rows,
              fit ? fit->fitted_count() : 0);
  std::printf("open + import + fit + views, wall time: %lld ms (openPaths returned after %lld ms)\n",
              static_cast<long long>(open_fit_ms), static_cast<long long>(open_call_ms));
  std::printf("longest event-loop stall during open and fit: %.1f ms over %lld heartbeats\n",
              beat.longest / 1e6, static_cast<long long>(beat.ticks));
  std::printf("curves view, select all %zu units and draw: %lld ms; redraw: %lld ms\n", units,
              static_cast<long long>(curves_ms), static_cast<long long>(replot_ms));
  return 0;
}
