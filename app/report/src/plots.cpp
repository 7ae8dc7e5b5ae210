#include "plots.h"

#include <fmt/format.h>
#include <qcustomplot.h>

#include <QPicture>
#include <algorithm>
#include <cmath>

namespace photolot::report {
namespace {

const QColor kGrid(200, 200, 200);
const QColor kSubGrid(228, 228, 228);
const QColor kConforming(110, 110, 110);
const QColor kBin(215, 215, 215);
constexpr double kLegendPt = 7.0;
constexpr double kTickPt = 7.0;
constexpr double kLabelPt = 7.5;

QFont plot_font(double pt) {
  QFont f("DejaVu Sans");
  // No shaping for Latin text: no "fi"/"fl" ligatures, so the PDF's text searches and copies
  // as typed (unit ids, reasons).
  f.setStyleStrategy(QFont::PreferNoShaping);
  f.setPointSizeF(pt);
  return f;
}

// Log-axis labels as plain numbers with SI prefixes ("100", "1 k", "10 k") instead of 1e+04.
class SiLogTicker : public QCPAxisTickerLog {
 public:
  explicit SiLogTicker(std::string unit) : unit_(std::move(unit)) {}

 protected:
  QString getTickLabel(double tick, const QLocale&, QChar, int) override {
    const double a = std::abs(tick);
    std::string s;
    if (a >= 1e6)
      s = fmt::format("{:g} M", tick / 1e6);
    else if (a >= 1e3)
      s = fmt::format("{:g} k", tick / 1e3);
    else
      s = fmt::format("{:g} ", tick);
    return QString::fromStdString(s + unit_);
  }

 private:
  std::string unit_;
};

void style_axis(QCPAxis* axis, const QString& label) {
  axis->setLabel(label);
  axis->setLabelFont(plot_font(kLabelPt));
  axis->setTickLabelFont(plot_font(kTickPt));
  axis->setBasePen(QPen(Qt::black, 0.8));
  axis->setTickPen(QPen(Qt::black, 0.8));
  axis->setSubTickPen(QPen(Qt::black, 0.5));
  axis->grid()->setPen(QPen(kGrid, 0.5, Qt::SolidLine));
  axis->grid()->setSubGridPen(QPen(kSubGrid, 0.4, Qt::SolidLine));
  axis->grid()->setZeroLinePen(Qt::NoPen);
}

void make_log(QCPAxis* axis, const std::string& unit) {
  axis->setScaleType(QCPAxis::stLogarithmic);
  auto ticker = QSharedPointer<SiLogTicker>::create(unit);
  ticker->setSubTickCount(8);
  axis->setTicker(ticker);
  axis->grid()->setSubGridVisible(true);
}

void integer_ticks(QCPAxis* axis) {
  auto ticker = QSharedPointer<QCPAxisTickerFixed>::create();
  ticker->setTickStep(1.0);
  ticker->setScaleStrategy(QCPAxisTickerFixed::ssMultiples);
  axis->setTicker(ticker);
  axis->setNumberFormat("f");
  axis->setNumberPrecision(0);
}

void setup(QCustomPlot& plot) {
  plot.setBackground(Qt::white);
  plot.axisRect()->setBackground(Qt::white);
  plot.legend->setVisible(true);
  plot.legend->setFont(plot_font(kLegendPt));
  plot.legend->setBorderPen(QPen(QColor(150, 150, 150), 0.5));
  plot.legend->setBrush(QColor(255, 255, 255, 235));
  plot.legend->setIconSize(22, 9);
  plot.legend->setRowSpacing(-2);
  plot.xAxis2->setVisible(true);
  plot.yAxis2->setVisible(true);
  plot.xAxis2->setTickLabels(false);
  plot.yAxis2->setTickLabels(false);
  for (QCPAxis* a : {plot.xAxis2, plot.yAxis2}) {
    a->setBasePen(QPen(Qt::black, 0.8));
    a->setTicks(false);
  }
  plot.axisRect()->setAutoMargins(QCP::msAll);
}

// A legend entry for the grey bins (items have none of their own): an empty bar series.
void bin_legend_entry(QCustomPlot& plot, const QString& name) {
  auto* bars = new QCPBars(plot.xAxis, plot.yAxis);
  bars->setName(name);
  bars->setPen(QPen(Qt::black, 0.6));
  bars->setBrush(kBin);
}

// Grey bins with black outlines; `to_axis` maps a bin edge to the axis' coordinate (exp for
// bins in ln R10). Returns the largest count.
template <typename ToAxis>
std::size_t draw_bins(QCustomPlot& plot, const Histogram& h, ToAxis to_axis) {
  std::size_t max_count = 1;
  for (std::size_t k = 0; k < h.counts.size(); ++k) {
    max_count = std::max(max_count, h.counts[k]);
    if (h.counts[k] == 0) continue;
    auto* rect = new QCPItemRect(&plot);
    rect->topLeft->setCoords(to_axis(h.lo + h.width * static_cast<double>(k)),
                             static_cast<double>(h.counts[k]));
    rect->bottomRight->setCoords(to_axis(h.lo + h.width * static_cast<double>(k + 1)), 0.0);
    rect->setPen(QPen(Qt::black, 0.6));
    rect->setBrush(kBin);
  }
  return max_count;
}

// A graph that only shows a legend entry (for items, which have none).
QCPGraph* legend_entry(QCustomPlot& plot, const QString& name, const QPen& pen,
                       const QBrush& brush = Qt::NoBrush,
                       QCPScatterStyle scatter = QCPScatterStyle()) {
  QCPGraph* g = plot.addGraph();
  g->setName(name);
  g->setPen(pen);
  g->setBrush(brush);
  g->setScatterStyle(scatter);
  return g;
}

QCPItemStraightLine* limit_line(QCustomPlot& plot, bool vertical, double at) {
  auto* line = new QCPItemStraightLine(&plot);
  line->setPen(QPen(Qt::black, 1.3, Qt::DashLine));
  if (vertical) {
    line->point1->setCoords(at, 1);
    line->point2->setCoords(at, 2);
  } else {
    line->point1->setCoords(1, at);
    line->point2->setCoords(2, at);
  }
  return line;
}

void limit_label(QCustomPlot& plot, double x, const QString& text) {
  auto* t = new QCPItemText(&plot);
  t->position->setTypeX(QCPItemPosition::ptPlotCoords);
  t->position->setTypeY(QCPItemPosition::ptAxisRectRatio);
  t->position->setCoords(x, 0.0);
  t->setPositionAlignment(Qt::AlignHCenter | Qt::AlignTop);
  t->setFont(plot_font(6.5));
  t->setText(text);
  t->setBrush(Qt::white);
  t->setPadding(QMargins(1, 0, 1, 0));
}

std::pair<double, double> padded(double lo, double hi, double frac) {
  const double span = hi - lo;
  const double pad = span > 0 ? span * frac : std::max(std::abs(lo) * 0.05, 1e-6);
  return {lo - pad, hi + pad};
}

void curves_plot(QCustomPlot& plot, const Content& c) {
  make_log(plot.xAxis, "lx");
  make_log(plot.yAxis, "\u03a9");
  style_axis(plot.xAxis, "illuminance E");
  style_axis(plot.yAxis, "resistance R");
  double x_lo = INFINITY, x_hi = -INFINITY, y_lo = INFINITY, y_hi = -INFINITY;
  bool named_ok = false, named_bad = false;
  std::size_t ok = 0, bad = 0;
  for (const PlotUnit& u : c.units) (u.nonconforming ? bad : ok)++;
  // Conforming units first, so the dashed nonconforming ones are drawn on top.
  for (int pass = 0; pass < 2; ++pass) {
    for (const PlotUnit& u : c.units) {
      if (u.nonconforming != (pass == 1)) continue;
      const double lo = std::isfinite(u.lux_min) ? u.lux_min : 1.0;
      const double hi = std::isfinite(u.lux_max) && u.lux_max > lo ? u.lux_max : lo * 100;
      QVector<double> xs, ys;
      constexpr int kSteps = 24;
      for (int i = 0; i <= kSteps; ++i) {
        const double lux = lo * std::pow(hi / lo, static_cast<double>(i) / kSteps);
        const double r = u.curve.ohm(lux);
        if (!(r > 0) || !std::isfinite(r)) continue;
        xs.push_back(lux);
        ys.push_back(r);
        y_lo = std::min(y_lo, r);
        y_hi = std::max(y_hi, r);
      }
      x_lo = std::min(x_lo, lo);
      x_hi = std::max(x_hi, hi);
      QCPGraph* g = plot.addGraph();
      g->setData(xs, ys, true);
      if (u.nonconforming) {
        g->setPen(QPen(Qt::black, 1.0, Qt::DashLine));
        g->setName(QString::fromStdString(fmt::format("nonconforming ({})", bad)));
        if (named_bad) g->removeFromLegend();
        named_bad = true;
      } else {
        g->setPen(QPen(kConforming, 0.5));
        g->setName(QString::fromStdString(fmt::format("conforming or not judged ({})", ok)));
        if (named_ok) g->removeFromLegend();
        named_ok = true;
      }
    }
  }
  const Limits& w = c.r10_window_ohm;
  if (w.any()) {
    y_lo = std::min(y_lo, w.has_min() ? w.min : y_lo);
    y_hi = std::max(y_hi, w.has_max() ? w.max : y_hi);
  }
  if (!std::isfinite(x_lo)) {
    x_lo = 1;
    x_hi = 1000;
    y_lo = 1e3;
    y_hi = 1e6;
  }
  x_lo = std::min(x_lo, c.reference_lux);
  x_hi = std::max(x_hi, c.reference_lux);
  plot.xAxis->setRange(x_lo / 1.25, x_hi * 1.25);
  plot.yAxis->setRange(y_lo / 1.4, y_hi * 1.4);
  if (w.any()) {
    const double lo = w.has_min() ? w.min : plot.yAxis->range().lower;
    const double hi = w.has_max() ? w.max : plot.yAxis->range().upper;
    QCPGraph* g = plot.addGraph();
    g->setData(QVector<double>{c.reference_lux, c.reference_lux}, QVector<double>{lo, hi}, true);
    g->setPen(QPen(Qt::black, 3.0, Qt::SolidLine, Qt::FlatCap));
    g->setScatterStyle(
        QCPScatterStyle(QCPScatterStyle::ssPlus, QPen(Qt::black, 1.2), Qt::NoBrush, 12));
    g->setName(QString::fromStdString(fmt::format("R10 window at {:g} lx", c.reference_lux)));
  }
  plot.axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignRight);
}

void histogram_plot(QCustomPlot& plot, const Content& c, bool r10) {
  std::vector<double> values;
  for (const PlotUnit& u : c.units) {
    const double v = r10 ? (u.r10_ohm > 0 ? std::log(u.r10_ohm) : kNaN) : u.gamma;
    if (std::isfinite(v)) values.push_back(v);
  }
  const Limits& lim = r10 ? c.r10_window_ohm : c.gamma_window;
  const auto to_axis = [&](double v) { return r10 ? std::log(v) : v; };
  double lo = INFINITY, hi = -INFINITY;
  for (double v : values) {
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
  if (lim.has_min()) lo = std::min(lo, to_axis(lim.min));
  if (lim.has_max()) hi = std::max(hi, to_axis(lim.max));
  if (!std::isfinite(lo)) {
    lo = r10 ? std::log(1e4) : 0.5;
    hi = r10 ? std::log(1e5) : 1.0;
  }
  const Histogram h = make_histogram(values, lo, hi);
  const auto from_bin = [&](double v) { return r10 ? std::exp(v) : v; };
  if (r10) {
    make_log(plot.xAxis, "\u03a9");
    plot.xAxis->ticker()->setTickCount(4);
    plot.xAxis->grid()->setSubGridVisible(false);
  }
  style_axis(plot.xAxis, r10 ? "R10" : "gamma");
  style_axis(plot.yAxis, "units");
  integer_ticks(plot.yAxis);
  const std::size_t max_count = draw_bins(plot, h, from_bin);
  bin_legend_entry(plot, "units per bin");
  const auto [x_lo, x_hi] =
      padded(h.lo, h.lo + h.width * static_cast<double>(h.counts.size()), 0.04);
  plot.xAxis->setRange(from_bin(x_lo), from_bin(x_hi));
  plot.yAxis->setRange(0, static_cast<double>(max_count) * 1.45 + 0.5);
  if (lim.any()) {
    legend_entry(plot, "spec limit", QPen(Qt::black, 1.3, Qt::DashLine));
    if (lim.has_min()) {
      limit_line(plot, true, lim.min);
      limit_label(plot, lim.min, "min");
    }
    if (lim.has_max()) {
      limit_line(plot, true, lim.max);
      limit_label(plot, lim.max, "max");
    }
  }
  plot.axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignRight);
}

void scatter_plot(QCustomPlot& plot, const Content& c) {
  make_log(plot.xAxis, "\u03a9");
  plot.xAxis->ticker()->setTickCount(6);
  plot.xAxis->grid()->setSubGridVisible(false);
  style_axis(plot.xAxis, "R10");
  style_axis(plot.yAxis, "gamma");
  QVector<double> ok_x, ok_y, bad_x, bad_y;
  double x_lo = INFINITY, x_hi = -INFINITY, y_lo = INFINITY, y_hi = -INFINITY;
  const auto grow = [&](double x, double y) {
    if (!(x > 0) || !std::isfinite(y)) return;
    x_lo = std::min(x_lo, x);
    x_hi = std::max(x_hi, x);
    y_lo = std::min(y_lo, y);
    y_hi = std::max(y_hi, y);
  };
  for (const PlotUnit& u : c.units) {
    if (!(u.r10_ohm > 0) || !std::isfinite(u.gamma)) continue;
    (u.nonconforming ? bad_x : ok_x).push_back(u.r10_ohm);
    (u.nonconforming ? bad_y : ok_y).push_back(u.gamma);
    grow(u.r10_ohm, u.gamma);
  }
  std::vector<std::pair<double, double>> ellipse;
  if (c.ln_r10_gamma)
    ellipse = tolerance_ellipse(*c.ln_r10_gamma, chi_square_2dof_quantile(c.ellipse_coverage));
  for (const auto& [lx, g] : ellipse) grow(std::exp(lx), g);
  const Limits& rw = c.r10_window_ohm;
  const Limits& gw = c.gamma_window;
  if (rw.has_min()) grow(rw.min, y_lo);
  if (rw.has_max()) grow(rw.max, y_lo);
  if (gw.has_min()) grow(x_lo, gw.min);
  if (gw.has_max()) grow(x_lo, gw.max);
  if (!std::isfinite(x_lo)) {
    x_lo = 1e4;
    x_hi = 1e5;
    y_lo = 0.5;
    y_hi = 1.0;
  }
  const double lx_span = std::max(std::log(x_hi / x_lo), 0.05);
  plot.xAxis->setRange(x_lo * std::exp(-0.08 * lx_span), x_hi * std::exp(0.08 * lx_span));
  const auto [ylo, yhi] = padded(y_lo, y_hi, 0.1);
  plot.yAxis->setRange(ylo, yhi + (yhi - ylo) * 0.25);  // room for the legend

  QCPGraph* ok = plot.addGraph();
  ok->setData(ok_x, ok_y);
  ok->setLineStyle(QCPGraph::lsNone);
  ok->setScatterStyle(
      QCPScatterStyle(QCPScatterStyle::ssCircle, QPen(kConforming, 0.8), Qt::white, 5));
  ok->setName(QString::fromStdString(fmt::format("conforming or not judged ({})", ok_x.size())));
  QCPGraph* bad = plot.addGraph();
  bad->setData(bad_x, bad_y);
  bad->setLineStyle(QCPGraph::lsNone);
  bad->setScatterStyle(
      QCPScatterStyle(QCPScatterStyle::ssCross, QPen(Qt::black, 1.2), Qt::NoBrush, 7));
  bad->setName(QString::fromStdString(fmt::format("nonconforming ({})", bad_x.size())));

  if (rw.any() || gw.any()) {
    const double xl = rw.has_min() ? rw.min : plot.xAxis->range().lower;
    const double xh = rw.has_max() ? rw.max : plot.xAxis->range().upper;
    const double yl = gw.has_min() ? gw.min : plot.yAxis->range().lower;
    const double yh = gw.has_max() ? gw.max : plot.yAxis->range().upper;
    auto* box = new QCPCurve(plot.xAxis, plot.yAxis);
    box->setData(QVector<double>{xl, xh, xh, xl, xl}, QVector<double>{yl, yl, yh, yh, yl});
    box->setPen(QPen(Qt::black, 1.3, Qt::DashLine));
    box->setName("spec box (R10 and gamma limits)");
  }
  if (!ellipse.empty()) {
    QVector<double> ex, ey;
    for (const auto& [lx, g] : ellipse) {
      ex.push_back(std::exp(lx));
      ey.push_back(g);
    }
    auto* e = new QCPCurve(plot.xAxis, plot.yAxis);
    e->setData(ex, ey);
    e->setPen(QPen(Qt::black, 1.2, Qt::SolidLine));
    e->setName(QString::fromStdString(
        fmt::format("{:g} % ellipse of (ln R10, gamma)", c.ellipse_coverage * 100)));
  }
  plot.axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignRight);
}

void pair_error_plot(QCustomPlot& plot, const Content& c) {
  std::vector<double> values;
  if (c.pairs)
    for (const PairRow& r : c.pairs->rows)
      if (std::isfinite(r.error_pct)) values.push_back(r.error_pct);
  double hi = 0;
  for (double v : values) hi = std::max(hi, v);
  if (c.pairs && std::isfinite(c.pairs->tolerance_pct)) hi = std::max(hi, c.pairs->tolerance_pct);
  if (!(hi > 0)) hi = 1;
  const Histogram h = make_histogram(values, 0.0, hi);
  style_axis(plot.xAxis, "tracking error (%)");
  style_axis(plot.yAxis, "pairs");
  integer_ticks(plot.yAxis);
  const std::size_t max_count = draw_bins(plot, h, [](double v) { return v; });
  bin_legend_entry(plot, "pairs per bin");
  plot.xAxis->setRange(0, hi * 1.05);
  plot.yAxis->setRange(0, static_cast<double>(max_count) * 1.45 + 0.5);
  if (c.pairs && std::isfinite(c.pairs->tolerance_pct)) {
    legend_entry(plot, "pairing limit", QPen(Qt::black, 1.3, Qt::DashLine));
    limit_line(plot, true, c.pairs->tolerance_pct);
  }
  plot.axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignRight);
}

}  // namespace

void draw_plot(QPainter& painter, const QRectF& target, double device_dpi, PlotKind kind,
               const Content& content) {
  QCustomPlot plot;
  setup(plot);
  switch (kind) {
    case PlotKind::curves:
      curves_plot(plot, content);
      break;
    case PlotKind::r10_histogram:
      histogram_plot(plot, content, true);
      break;
    case PlotKind::gamma_histogram:
      histogram_plot(plot, content, false);
      break;
    case PlotKind::r10_gamma:
      scatter_plot(plot, content);
      break;
    case PlotKind::pair_errors:
      pair_error_plot(plot, content);
      break;
  }
  // Render into a picture at its own resolution, then scale it onto the page: the plot keeps
  // its vectors and text, and point sizes stay point sizes.
  QPicture picture;
  const double picture_dpi = picture.logicalDpiX();
  const int w = static_cast<int>(std::lround(target.width() / device_dpi * picture_dpi));
  const int h = static_cast<int>(std::lround(target.height() / device_dpi * picture_dpi));
  plot.resize(w, h);
  QCPPainter qp;
  qp.begin(&picture);
  qp.setMode(QCPPainter::pmVectorized);
  qp.setMode(QCPPainter::pmNoCaching);
  qp.setMode(QCPPainter::pmNonCosmetic);
  plot.toPainter(&qp, w, h);
  qp.end();
  // drawPicture already scales by device_dpi / picture_dpi; only the rounding is left.
  painter.save();
  painter.translate(target.topLeft());
  painter.scale(target.width() / w * picture_dpi / device_dpi,
                target.height() / h * picture_dpi / device_dpi);
  painter.drawPicture(0, 0, picture);
  painter.restore();
}

std::string plot_caption(PlotKind kind, const Content& c) {
  switch (kind) {
    case PlotKind::curves:
      return fmt::format(
          "Fitted curves of {} units over each unit's measured range. Solid grey: conforming or "
          "not judged; dashed black: nonconforming; thick bar: the spec's R10 window at {:g} lx.",
          c.units.size(), c.reference_lux);
    case PlotKind::r10_histogram:
      return "R10 in bins of equal width in ln R10; dashed lines: spec limits.";
    case PlotKind::gamma_histogram:
      return "Fitted gamma; dashed lines: spec limits.";
    case PlotKind::r10_gamma:
      return fmt::format(
          "Each unit's R10 and gamma. Circles: conforming or not judged; crosses: nonconforming; "
          "dashed box: spec limits; solid ellipse: where {:g} % of units fall if (ln R10, gamma) "
          "is bivariate normal with the lot's means, sds and correlation (chi-square, 2 degrees "
          "of freedom, {:.3f}).",
          c.ellipse_coverage * 100, chi_square_2dof_quantile(c.ellipse_coverage));
    case PlotKind::pair_errors:
      return "Tracking error of the pairs; dashed line: pairing limit.";
  }
  return {};
}

}  // namespace photolot::report
