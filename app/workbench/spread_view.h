// The spread of the lot: histograms of R10 (on a log axis: R10 spreads multiply) and of gamma,
// and R10 against gamma, one dot per fitted unit. Spec limits and tolerance intervals are drawn
// when the spec and statistics steps provide them. Clicking a dot selects that unit.
#pragma once

#include <QTimer>
#include <QWidget>
#include <optional>
#include <utility>
#include <vector>

#include "photolot/fit_result.h"

class QCustomPlot;
class QLabel;

namespace photolot::workbench {

struct Histogram {
  std::vector<double> centres;  // bin centres (log10 of ohm for R10)
  std::vector<double> counts;
  double width = 0;
};
// Equal-width bins over [min, max] of the finite values; bins from the Freedman-Diaconis rule
// (width 2 IQR n^-1/3), clamped to 5..60 bins.
Histogram make_histogram(const std::vector<double>& values);

class SpreadView : public QWidget {
  Q_OBJECT
 public:
  explicit SpreadView(QWidget* parent = nullptr);
  void setFit(const LotFit* fit);  // not owned
  void setSelectedUnits(const std::vector<int>& units);
  void setR10Limits(std::optional<std::pair<double, double>> ohm);
  void setGammaLimits(std::optional<std::pair<double, double>> limits);
  void setToleranceIntervals(std::optional<std::pair<double, double>> r10_ohm,
                             std::optional<std::pair<double, double>> gamma);
  // The setters above only note a change; the plots are rebuilt once, on the next turn of
  // the event loop while the view is shown, or when it is next shown. updateNow() rebuilds at
  // once if something changed (tests, export); rebuilds() counts the rebuilds so far.
  void updateNow();
  int rebuilds() const { return rebuilds_; }
  bool pending() const { return dirty_; }

  QCustomPlot* r10Plot() const { return r10_plot_; }
  QCustomPlot* gammaPlot() const { return gamma_plot_; }
  QCustomPlot* scatterPlot() const { return scatter_plot_; }
  // The units behind the scatter's dots, in dot order (fitted units only).
  const std::vector<int>& scatterUnits() const { return scatter_units_; }
  QString exportTo(const QString& path);

 signals:
  void unitClicked(int unit, bool add_to_selection);

 private:
  void scheduleRebuild();
  void rebuild();
  void drawSelection();
  void showEvent(QShowEvent* event) override;

  const LotFit* fit_ = nullptr;
  std::vector<int> selected_;
  std::vector<int> scatter_units_;
  std::optional<std::pair<double, double>> r10_limits_, gamma_limits_, r10_ti_, gamma_ti_;
  QCustomPlot* r10_plot_ = nullptr;
  QCustomPlot* gamma_plot_ = nullptr;
  QCustomPlot* scatter_plot_ = nullptr;
  QLabel* caption_ = nullptr;
  QTimer rebuild_timer_;
  bool dirty_ = true;
  int rebuilds_ = 0;
};

}  // namespace photolot::workbench
