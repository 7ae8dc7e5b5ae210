// The curves view: the selected units' readings and fitted lines on log-log axes, with their
// confidence bands, the spec window at 10 lx, and the residuals below on the same lux axis.
// Up to kDetailedUnits units are drawn one colour each with bands and a legend; more are drawn
// together in one colour (every unit still plotted), which keeps a whole lot under a second.
#pragma once

#include <QWidget>
#include <memory>
#include <optional>
#include <utility>
#include <vector>

#include "curve_series.h"

class QCustomPlot;
class QCPAxisRect;
class QLabel;

namespace photolot::workbench {

class CurvesView : public QWidget {
  Q_OBJECT
 public:
  static constexpr int kDetailedUnits = 8;

  explicit CurvesView(QWidget* parent = nullptr);

  // Not owned; call again when they change. `series`, when given, holds every unit's curves
  // in lot order (the session builds them on its worker); without it the view builds the
  // selected units' own.
  void setLot(const Lot* lot, const LotFit* fit,
              std::shared_ptr<const std::vector<UnitSeries>> series = nullptr);
  void setUnits(const std::vector<int>& units);  // indices into Lot::units
  // The spec's R10 window (min, max ohm), drawn at 10 lx; nullopt hides it.
  void setSpecWindow(std::optional<std::pair<double, double>> r10_window_ohm);

  QCustomPlot* plot() const { return plot_; }
  // What is drawn, one entry per selected unit.
  const std::vector<const UnitSeries*>& series() const { return series_; }
  bool detailed() const { return detailed_; }
  QString exportTo(const QString& path);

  // The text a hover at this widget position would show (empty when no point is near).
  QString hoverTextAt(const QPoint& plot_pos) const;

 private:
  struct HoverPoint {
    double lux, value;
    int unit;
    char kind;  // 'r' reading, 'o' outlier, 'c' over range, 'e' residual
  };
  void rebuild();
  bool eventFilter(QObject* watched, QEvent* event) override;

  const Lot* lot_ = nullptr;
  const LotFit* fit_ = nullptr;
  std::vector<int> units_;
  std::optional<std::pair<double, double>> spec_window_;
  std::shared_ptr<const std::vector<UnitSeries>> all_series_;
  std::vector<UnitSeries> own_series_;  // built here when there is no all_series_
  std::vector<const UnitSeries*> series_;
  std::vector<HoverPoint> hover_points_;
  bool detailed_ = true;

  QCustomPlot* plot_ = nullptr;
  QCPAxisRect* curve_rect_ = nullptr;
  QCPAxisRect* residual_rect_ = nullptr;
  QLabel* caption_ = nullptr;
};

}  // namespace photolot::workbench
