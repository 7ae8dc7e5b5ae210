#include "spread_view.h"

#include <qcustomplot.h>

#include <QGridLayout>
#include <QLabel>
#include <algorithm>
#include <cmath>

#include "display_format.h"
#include "plot_style.h"

namespace photolot::workbench {

Histogram make_histogram(const std::vector<double>& input) {
  std::vector<double> v;
  for (double x : input)
    if (std::isfinite(x)) v.push_back(x);
  Histogram h;
  if (v.empty()) return h;
  std::sort(v.begin(), v.end());
  const double lo = v.front(), hi = v.back();
  const auto quantile = [&](double q) {
    const double pos = q * static_cast<double>(v.size() - 1);
    const auto i = static_cast<std::size_t>(pos);
    const double f = pos - static_cast<double>(i);
    return i + 1 < v.size() ? v[i] * (1 - f) + v[i + 1] * f : v[i];
  };
  const double iqr = quantile(0.75) - quantile(0.25);
  int bins = 10;
  if (hi > lo && iqr > 0) {
    const double width = 2 * iqr / std::cbrt(static_cast<double>(v.size()));
    bins = static_cast<int>(std::ceil((hi - lo) / width));
  }
  bins = std::clamp(bins, 5, 60);
  const double span = hi > lo ? hi - lo : std::max(1e-9, std::fabs(lo) * 0.01);
  const double start = hi > lo ? lo : lo - span / 2;
  h.width = span / bins;
  h.counts.assign(static_cast<std::size_t>(bins), 0);
  for (int i = 0; i < bins; ++i) h.centres.push_back(start + (i + 0.5) * h.width);
  for (double x : v) {
    int i = static_cast<int>((x - start) / h.width);
    h.counts[static_cast<std::size_t>(std::clamp(i, 0, bins - 1))] += 1;
  }
  return h;
}

namespace {

QCustomPlot* make_plot(QWidget* parent, const QString& name) {
  auto* plot = new QCustomPlot(parent);
  plot->setObjectName(name);
  plot->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom);
  plot->setMinimumSize(260, 200);
  return plot;
}

void vertical_line(QCustomPlot* plot, double x, const QPen& pen, const QString& text) {
  auto* line = new QCPItemStraightLine(plot);
  line->point1->setCoords(x, 0);
  line->point2->setCoords(x, 1);
  line->setPen(pen);
  auto* label = new QCPItemText(plot);
  label->position->setTypeY(QCPItemPosition::ptAxisRectRatio);
  label->position->setCoords(x, 0.02);
  label->setPositionAlignment(Qt::AlignHCenter | Qt::AlignTop);
  label->setText(text);
  label->setColor(pen.color().darker(130));
  label->setFont(QFont(plot->font().family(), 8));
}

}  // namespace

SpreadView::SpreadView(QWidget* parent) : QWidget(parent) {
  auto* grid = new QGridLayout(this);
  caption_ = new QLabel(this);
  caption_->setWordWrap(true);
  r10_plot_ = make_plot(this, QStringLiteral("r10Histogram"));
  gamma_plot_ = make_plot(this, QStringLiteral("gammaHistogram"));
  scatter_plot_ = make_plot(this, QStringLiteral("r10GammaScatter"));
  grid->addWidget(caption_, 0, 0, 1, 2);
  grid->addWidget(r10_plot_, 1, 0);
  grid->addWidget(gamma_plot_, 1, 1);
  grid->addWidget(scatter_plot_, 2, 0, 1, 2);
  grid->setRowStretch(1, 1);
  grid->setRowStretch(2, 2);

  connect(scatter_plot_, &QCustomPlot::plottableClick, this,
          [this](QCPAbstractPlottable* plottable, int data_index, QMouseEvent* event) {
            if (plottable != scatter_plot_->graph(0) || data_index < 0 ||
                data_index >= static_cast<int>(scatter_units_.size())) {
              return;
            }
            const bool add = event && (event->modifiers() & Qt::ControlModifier);
            emit unitClicked(scatter_units_[static_cast<std::size_t>(data_index)], add);
          });
  rebuild_timer_.setSingleShot(true);
  rebuild_timer_.setInterval(0);
  connect(&rebuild_timer_, &QTimer::timeout, this, &SpreadView::updateNow);
  rebuild();
}

void SpreadView::scheduleRebuild() {
  dirty_ = true;
  if (isVisible()) rebuild_timer_.start();  // hidden: showEvent rebuilds
}

void SpreadView::updateNow() {
  rebuild_timer_.stop();
  if (dirty_) rebuild();
}

void SpreadView::showEvent(QShowEvent* event) {
  QWidget::showEvent(event);
  updateNow();
}

void SpreadView::setFit(const LotFit* fit) {
  fit_ = fit;
  scheduleRebuild();
}

void SpreadView::setSelectedUnits(const std::vector<int>& units) {
  selected_ = units;
  if (!dirty_) drawSelection();  // else the rebuild draws it
}

void SpreadView::setR10Limits(std::optional<std::pair<double, double>> ohm) {
  r10_limits_ = ohm;
  scheduleRebuild();
}

void SpreadView::setGammaLimits(std::optional<std::pair<double, double>> limits) {
  gamma_limits_ = limits;
  scheduleRebuild();
}

void SpreadView::setToleranceIntervals(std::optional<std::pair<double, double>> r10_ohm,
                                       std::optional<std::pair<double, double>> gamma) {
  r10_ti_ = r10_ohm;
  gamma_ti_ = gamma;
  scheduleRebuild();
}

QString SpreadView::exportTo(const QString& path) {
  updateNow();
  return export_plot(scatter_plot_, path, 1000, 700);
}

void SpreadView::rebuild() {
  dirty_ = false;
  ++rebuilds_;
  for (QCustomPlot* p : {r10_plot_, gamma_plot_, scatter_plot_}) {
    p->clearPlottables();
    p->clearItems();
  }
  scatter_units_.clear();
  std::vector<double> log_r10, gamma;
  if (fit_) {
    for (std::size_t i = 0; i < fit_->units.size(); ++i) {
      const UnitFit& u = fit_->units[i];
      if (!u.ok() || !(u.r10_ohm > 0) || !std::isfinite(u.gamma)) continue;
      scatter_units_.push_back(static_cast<int>(i));
    }
    // QCustomPlot keeps a graph's data sorted by key: order the dots by R10 so that a dot's
    // data index is its place in scatter_units_.
    std::stable_sort(scatter_units_.begin(), scatter_units_.end(), [this](int a, int b) {
      return fit_->units[static_cast<std::size_t>(a)].r10_ohm <
             fit_->units[static_cast<std::size_t>(b)].r10_ohm;
    });
    for (int i : scatter_units_) {
      const UnitFit& u = fit_->units[static_cast<std::size_t>(i)];
      log_r10.push_back(std::log10(u.r10_ohm));
      gamma.push_back(u.gamma);
    }
  }
  QStringList notes;
  notes << tr("%n fitted unit(s).", "", static_cast<int>(scatter_units_.size()));
  if (!r10_limits_ && !gamma_limits_) notes << tr("Spec limits: load a spec to draw them.");
  if (!r10_ti_ && !gamma_ti_) notes << tr("Tolerance intervals: not available yet.");
  notes << tr("Click a dot to select its unit (Ctrl adds to the selection).");
  caption_->setText(notes.join(QLatin1Char(' ')));

  const QPen limit_pen(kSpecColour, 2, Qt::SolidLine);
  const QPen ti_pen(kLimitColour, 1.5, Qt::DashLine);

  // R10: bars on log10(ohm), ticks labelled in ohm.
  {
    const Histogram h = make_histogram(log_r10);
    auto* bars = new QCPBars(r10_plot_->xAxis, r10_plot_->yAxis);
    bars->setName(tr("R10"));
    bars->setWidth(h.width * 0.95);
    bars->setPen(QPen(kAggregateColour.darker(120)));
    bars->setBrush(kAggregateColour.lighter(150));
    bars->setData(QVector<double>(h.centres.begin(), h.centres.end()),
                  QVector<double>(h.counts.begin(), h.counts.end()), true);
    r10_plot_->xAxis->setLabel(tr("R10 (Ω, log scale)"));
    r10_plot_->yAxis->setLabel(tr("units"));
    QSharedPointer<QCPAxisTickerText> ticker(new QCPAxisTickerText);
    if (!h.centres.empty()) {
      const double lo = h.centres.front() - h.width, hi = h.centres.back() + h.width;
      for (double m = std::floor(lo); m <= std::ceil(hi); m += 1) {
        for (double f : {1.0, 2.0, 5.0}) {
          const double t = m + std::log10(f);
          if (t >= lo - 0.5 && t <= hi + 0.5) ticker->addTick(t, format_ohm(std::pow(10, t)));
        }
      }
      r10_plot_->xAxis->setRange(lo, hi);
    }
    r10_plot_->xAxis->setTicker(ticker);
    if (r10_limits_) {
      vertical_line(r10_plot_, std::log10(r10_limits_->first), limit_pen, tr("min"));
      vertical_line(r10_plot_, std::log10(r10_limits_->second), limit_pen, tr("max"));
    }
    if (r10_ti_) {
      vertical_line(r10_plot_, std::log10(r10_ti_->first), ti_pen, tr("TI"));
      vertical_line(r10_plot_, std::log10(r10_ti_->second), ti_pen, tr("TI"));
    }
    r10_plot_->yAxis->rescale();
    r10_plot_->yAxis->setRangeLower(0);
    r10_plot_->yAxis->setRangeUpper(std::max(1.0, r10_plot_->yAxis->range().upper * 1.15));
  }
  {
    const Histogram h = make_histogram(gamma);
    auto* bars = new QCPBars(gamma_plot_->xAxis, gamma_plot_->yAxis);
    bars->setName(tr("gamma"));
    bars->setWidth(h.width * 0.95);
    bars->setPen(QPen(QColor(0xe6, 0x9f, 0x00).darker(130)));
    bars->setBrush(QColor(0xe6, 0x9f, 0x00).lighter(130));
    bars->setData(QVector<double>(h.centres.begin(), h.centres.end()),
                  QVector<double>(h.counts.begin(), h.counts.end()), true);
    gamma_plot_->xAxis->setLabel(tr("gamma"));
    gamma_plot_->yAxis->setLabel(tr("units"));
    if (!h.centres.empty()) {
      gamma_plot_->xAxis->setRange(h.centres.front() - h.width, h.centres.back() + h.width);
    }
    if (gamma_limits_) {
      vertical_line(gamma_plot_, gamma_limits_->first, limit_pen, tr("min"));
      vertical_line(gamma_plot_, gamma_limits_->second, limit_pen, tr("max"));
    }
    if (gamma_ti_) {
      vertical_line(gamma_plot_, gamma_ti_->first, ti_pen, tr("TI"));
      vertical_line(gamma_plot_, gamma_ti_->second, ti_pen, tr("TI"));
    }
    gamma_plot_->yAxis->rescale();
    gamma_plot_->yAxis->setRangeLower(0);
    gamma_plot_->yAxis->setRangeUpper(std::max(1.0, gamma_plot_->yAxis->range().upper * 1.15));
  }
  {
    QCPAxis* x = scatter_plot_->xAxis;
    QCPAxis* y = scatter_plot_->yAxis;
    x->setScaleType(QCPAxis::stLogarithmic);
    x->setTicker(QSharedPointer<QCPAxisTickerLog>(new QCPAxisTickerLog));
    x->setLabel(tr("R10 (Ω)"));
    y->setLabel(tr("gamma"));
    QVector<double> xs, ys;
    for (std::size_t i = 0; i < log_r10.size(); ++i) {
      xs << std::pow(10, log_r10[i]);
      ys << gamma[i];
    }
    QCPGraph* dots = scatter_plot_->addGraph();
    dots->setName(tr("units"));
    dots->setLineStyle(QCPGraph::lsNone);
    QColor c = kAggregateColour;
    c.setAlpha(xs.size() > 500 ? 80 : 180);
    dots->setScatterStyle(reading_style(c, 6));
    dots->setData(xs, ys, true);  // already in key order, see above
    dots->setSelectable(QCP::stSingleData);
    scatter_plot_->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom | QCP::iSelectPlottables);
    QCPGraph* chosen = scatter_plot_->addGraph();
    chosen->setName(tr("selected"));
    chosen->setLineStyle(QCPGraph::lsNone);
    QCPScatterStyle ring(QCPScatterStyle::ssCircle, QPen(Qt::black, 2), Qt::NoBrush, 11);
    chosen->setScatterStyle(ring);
    chosen->setSelectable(QCP::stNone);
    x->rescale();
    y->rescale();
    if (r10_limits_ && gamma_limits_) {
      auto* box = new QCPItemRect(scatter_plot_);
      box->topLeft->setCoords(r10_limits_->first, gamma_limits_->second);
      box->bottomRight->setCoords(r10_limits_->second, gamma_limits_->first);
      box->setPen(limit_pen);
      x->setRange(std::min(x->range().lower, r10_limits_->first),
                  std::max(x->range().upper, r10_limits_->second));
      y->setRange(std::min(y->range().lower, gamma_limits_->first),
                  std::max(y->range().upper, gamma_limits_->second));
    }
    x->scaleRange(1.15, x->range().center());
    y->scaleRange(1.15, y->range().center());
  }
  drawSelection();
  r10_plot_->replot(QCustomPlot::rpQueuedReplot);
  gamma_plot_->replot(QCustomPlot::rpQueuedReplot);
}

void SpreadView::drawSelection() {
  if (scatter_plot_->graphCount() < 2 || !fit_) return;
  QCPGraph* chosen = scatter_plot_->graph(1);
  chosen->data()->clear();
  for (int unit : selected_) {
    if (unit < 0 || unit >= static_cast<int>(fit_->units.size())) continue;
    const UnitFit& u = fit_->units[static_cast<std::size_t>(unit)];
    if (u.ok()) chosen->addData(u.r10_ohm, u.gamma);
  }
  scatter_plot_->replot(QCustomPlot::rpQueuedReplot);
}

}  // namespace photolot::workbench
