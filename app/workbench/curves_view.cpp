#include "curves_view.h"

#include <qcustomplot.h>

#include <QLabel>
#include <QMouseEvent>
#include <QToolTip>
#include <QVBoxLayout>
#include <cmath>
#include <limits>

#include "display_format.h"
#include "plot_style.h"

namespace photolot::workbench {
namespace {

QVector<double> to_qvector(const std::vector<double>& v) {
  return QVector<double>(v.begin(), v.end());
}

void set_log_axis(QCPAxis* axis) {
  axis->setScaleType(QCPAxis::stLogarithmic);
  QSharedPointer<QCPAxisTickerLog> ticker(new QCPAxisTickerLog);
  axis->setTicker(ticker);
  axis->setNumberFormat(QStringLiteral("eb"));
  axis->setNumberPrecision(0);
}

QCPGraph* add_scatter(QCustomPlot* plot, QCPAxisRect* rect, const QString& name,
                      const QCPScatterStyle& style, const std::vector<double>& x,
                      const std::vector<double>& y, bool legend) {
  QCPGraph* g = plot->addGraph(rect->axis(QCPAxis::atBottom), rect->axis(QCPAxis::atLeft));
  g->setName(name);
  g->setLineStyle(QCPGraph::lsNone);
  g->setScatterStyle(style);
  g->setData(to_qvector(x), to_qvector(y));
  if (!legend) g->removeFromLegend();
  return g;
}

}  // namespace

CurvesView::CurvesView(QWidget* parent) : QWidget(parent) {
  auto* layout = new QVBoxLayout(this);
  layout->setContentsMargins(0, 0, 0, 0);
  caption_ = new QLabel(this);
  caption_->setWordWrap(true);
  caption_->setContentsMargins(8, 4, 8, 0);
  plot_ = new QCustomPlot(this);
  plot_->setObjectName(QStringLiteral("curvesPlot"));
  layout->addWidget(caption_);
  layout->addWidget(plot_, 1);

  plot_->plotLayout()->clear();
  curve_rect_ = new QCPAxisRect(plot_);
  residual_rect_ = new QCPAxisRect(plot_);
  plot_->plotLayout()->addElement(0, 0, curve_rect_);
  plot_->plotLayout()->addElement(1, 0, residual_rect_);
  plot_->plotLayout()->setRowStretchFactor(0, 3);
  plot_->plotLayout()->setRowStretchFactor(1, 1);
  // One margin group keeps the two plots' left edges aligned whatever the tick labels.
  auto* group = new QCPMarginGroup(plot_);
  curve_rect_->setMarginGroup(QCP::msLeft | QCP::msRight, group);
  residual_rect_->setMarginGroup(QCP::msLeft | QCP::msRight, group);

  for (QCPAxisRect* rect : {curve_rect_, residual_rect_}) {
    set_log_axis(rect->axis(QCPAxis::atBottom));
    rect->setRangeDrag(Qt::Horizontal | Qt::Vertical);
    rect->setRangeZoom(Qt::Horizontal | Qt::Vertical);
  }
  set_log_axis(curve_rect_->axis(QCPAxis::atLeft));
  curve_rect_->axis(QCPAxis::atLeft)->setLabel(tr("Resistance (Ω)"));
  residual_rect_->axis(QCPAxis::atBottom)->setLabel(tr("Illuminance (lx)"));
  residual_rect_->axis(QCPAxis::atLeft)->setLabel(tr("Residual, ln R"));
  // The two plots share the lux axis: zooming one zooms both.
  connect(curve_rect_->axis(QCPAxis::atBottom), qOverload<const QCPRange&>(&QCPAxis::rangeChanged),
          residual_rect_->axis(QCPAxis::atBottom), qOverload<const QCPRange&>(&QCPAxis::setRange));
  connect(residual_rect_->axis(QCPAxis::atBottom),
          qOverload<const QCPRange&>(&QCPAxis::rangeChanged), curve_rect_->axis(QCPAxis::atBottom),
          qOverload<const QCPRange&>(&QCPAxis::setRange));

  // Clearing the layout took the default legend with it: the curves get a legend of their own.
  plot_->legend = new QCPLegend;
  curve_rect_->insetLayout()->addElement(plot_->legend, Qt::AlignTop | Qt::AlignRight);
  plot_->legend->setLayer(QStringLiteral("legend"));
  plot_->legend->setVisible(true);
  plot_->legend->setFont(QFont(font().family(), 8));
  plot_->legend->setBrush(QColor(255, 255, 255, 220));
  plot_->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom);
  plot_->setMouseTracking(true);
  plot_->installEventFilter(this);
  rebuild();
}

void CurvesView::setLot(const Lot* lot, const LotFit* fit,
                        std::shared_ptr<const std::vector<UnitSeries>> series) {
  lot_ = lot;
  fit_ = fit;
  all_series_ = lot && series && series->size() == lot->units.size() ? std::move(series) : nullptr;
  units_.clear();
  rebuild();
}

void CurvesView::setUnits(const std::vector<int>& units) {
  units_ = units;
  rebuild();
}

void CurvesView::setSpecWindow(std::optional<std::pair<double, double>> r10_window_ohm) {
  spec_window_ = r10_window_ohm;
  rebuild();
}

QString CurvesView::exportTo(const QString& path) { return export_plot(plot_, path, 1200, 900); }

void CurvesView::rebuild() {
  plot_->clearPlottables();
  plot_->clearItems();
  hover_points_.clear();
  series_.clear();
  own_series_.clear();
  detailed_ = units_.size() <= static_cast<std::size_t>(kDetailedUnits);
  if (lot_ && all_series_) {
    series_.reserve(units_.size());
    for (int u : units_) {
      if (u >= 0 && u < static_cast<int>(all_series_->size())) {
        series_.push_back(&(*all_series_)[static_cast<std::size_t>(u)]);
      }
    }
  } else if (lot_) {
    CurveSeriesOptions options;
    options.bands = detailed_;
    own_series_ = build_curve_series(*lot_, fit_, units_, options);
    for (const UnitSeries& s : own_series_) series_.push_back(&s);
  }

  if (!lot_) {
    caption_->setText(tr("Open a bench log (File ▸ Open Logs…) to see its curves."));
  } else if (series_.empty()) {
    caption_->setText(tr("Select units in the table to plot their readings and fitted curves."));
  } else if (detailed_) {
    caption_->setText(
        tr("%n unit(s). ● reading  ✕ outlier (down-weighted)  △ over range "
           "(the true value lies above)  shaded: 95 % band of the fitted curve. "
           "Drag to pan, wheel to zoom, hover for values.",
           "", static_cast<int>(series_.size())));
  } else {
    caption_->setText(tr("%n units drawn together (bands and legend from %1 units down). "
                         "● reading  ✕ outlier  △ over range.",
                         "", static_cast<int>(series_.size()))
                          .arg(kDetailedUnits));
  }

  QCPAxis* x = curve_rect_->axis(QCPAxis::atBottom);
  QCPAxis* y = curve_rect_->axis(QCPAxis::atLeft);
  QCPAxis* rx = residual_rect_->axis(QCPAxis::atBottom);
  QCPAxis* ry = residual_rect_->axis(QCPAxis::atLeft);

  auto note_points = [this](const std::vector<double>& lux, const std::vector<double>& v, int unit,
                            char kind) {
    for (std::size_t i = 0; i < lux.size(); ++i)
      hover_points_.push_back({lux[i], v[i], unit, kind});
  };

  if (detailed_) {
    int colour_index = 0;
    for (const UnitSeries* sp : series_) {
      const UnitSeries& s = *sp;
      const QColor colour = unit_colour(colour_index++);
      if (!s.band_low_ohm.empty()) {
        QCPGraph* low = plot_->addGraph(x, y);
        QCPGraph* high = plot_->addGraph(x, y);
        low->setData(to_qvector(s.line_lux), to_qvector(s.band_low_ohm), true);
        high->setData(to_qvector(s.line_lux), to_qvector(s.band_high_ohm), true);
        QColor fill = colour;
        fill.setAlpha(50);
        low->setPen(Qt::NoPen);
        high->setPen(Qt::NoPen);
        high->setBrush(fill);
        high->setChannelFillGraph(low);
        low->setName(s.id + tr(" band"));
        high->setName(s.id + tr(" band"));
        low->removeFromLegend();
        high->removeFromLegend();
      }
      if (!s.line_lux.empty()) {
        QCPGraph* line = plot_->addGraph(x, y);
        line->setName(s.id);
        line->setPen(QPen(colour, 1.8));
        line->setData(to_qvector(s.line_lux), to_qvector(s.line_ohm), true);
      }
      QCPGraph* readings =
          add_scatter(plot_, curve_rect_, s.id + tr(" readings"), reading_style(colour),
                      s.normal_lux, s.normal_ohm, s.line_lux.empty());
      if (s.line_lux.empty()) readings->setName(s.id + tr(" (not fitted)"));
      add_scatter(plot_, curve_rect_, s.id + tr(" outliers"), outlier_style(), s.outlier_lux,
                  s.outlier_ohm, false);
      add_scatter(plot_, curve_rect_, s.id + tr(" over range"), censored_style(), s.censored_lux,
                  s.censored_ohm, false);
      add_scatter(plot_, residual_rect_, s.id + tr(" residuals"), reading_style(colour, 5),
                  s.residual_lux, s.residual_ln, false);
      add_scatter(plot_, residual_rect_, s.id + tr(" outlier residuals"), outlier_style(7),
                  s.outlier_residual_lux, s.outlier_residual_ln, false);
    }
  } else {
    // Whole-lot mode: one graph per kind of point and one curve carrying every fitted line,
    // separated by NaN gaps, so the plot has a handful of plottables whatever the lot size.
    std::vector<double> nl, no, ol, oo, cl, co, rl, rr, orl, orr;
    QVector<double> line_t, line_x, line_y;
    double t = 0;
    for (const UnitSeries* sp : series_) {
      const UnitSeries& s = *sp;
      nl.insert(nl.end(), s.normal_lux.begin(), s.normal_lux.end());
      no.insert(no.end(), s.normal_ohm.begin(), s.normal_ohm.end());
      ol.insert(ol.end(), s.outlier_lux.begin(), s.outlier_lux.end());
      oo.insert(oo.end(), s.outlier_ohm.begin(), s.outlier_ohm.end());
      cl.insert(cl.end(), s.censored_lux.begin(), s.censored_lux.end());
      co.insert(co.end(), s.censored_ohm.begin(), s.censored_ohm.end());
      rl.insert(rl.end(), s.residual_lux.begin(), s.residual_lux.end());
      rr.insert(rr.end(), s.residual_ln.begin(), s.residual_ln.end());
      orl.insert(orl.end(), s.outlier_residual_lux.begin(), s.outlier_residual_lux.end());
      orr.insert(orr.end(), s.outlier_residual_ln.begin(), s.outlier_residual_ln.end());
      // A straight line needs its two ends only; a curved model all its samples.
      const std::size_t n = s.line_lux.size();
      for (std::size_t i = 0; i < n; ++i) {
        if (s.straight && i != 0 && i + 1 != n) continue;
        line_t << t++;
        line_x << s.line_lux[i];
        line_y << s.line_ohm[i];
      }
      line_t << t++;
      line_x << std::numeric_limits<double>::quiet_NaN();
      line_y << std::numeric_limits<double>::quiet_NaN();
      note_points(s.normal_lux, s.normal_ohm, s.unit, 'r');
      note_points(s.outlier_lux, s.outlier_ohm, s.unit, 'o');
      note_points(s.censored_lux, s.censored_ohm, s.unit, 'c');
    }
    QColor line_colour = kAggregateColour;
    line_colour.setAlpha(series_.size() > 200 ? 40 : 110);
    auto* lines = new QCPCurve(x, y);
    lines->setName(tr("fitted curves"));
    lines->setPen(QPen(line_colour, 1));
    lines->setData(line_t, line_x, line_y, true);
    QColor point_colour = kAggregateColour;
    point_colour.setAlpha(series_.size() > 200 ? 90 : 200);
    add_scatter(plot_, curve_rect_, tr("readings"), reading_style(point_colour, 4), nl, no, true);
    add_scatter(plot_, curve_rect_, tr("outliers"), outlier_style(), ol, oo, true);
    add_scatter(plot_, curve_rect_, tr("over range"), censored_style(), cl, co, true);
    add_scatter(plot_, residual_rect_, tr("residuals"), reading_style(point_colour, 3), rl, rr,
                false);
    add_scatter(plot_, residual_rect_, tr("outlier residuals"), outlier_style(6), orl, orr, false);
  }
  if (detailed_) {
    for (const UnitSeries* sp : series_) {
      const UnitSeries& s = *sp;
      note_points(s.normal_lux, s.normal_ohm, s.unit, 'r');
      note_points(s.outlier_lux, s.outlier_ohm, s.unit, 'o');
      note_points(s.censored_lux, s.censored_ohm, s.unit, 'c');
    }
  }
  for (const UnitSeries* sp : series_) {
    const UnitSeries& s = *sp;
    note_points(s.residual_lux, s.residual_ln, s.unit, 'e');
    note_points(s.outlier_residual_lux, s.outlier_residual_ln, s.unit, 'e');
  }
  // The shapes' key, in the legend once, whatever is selected.
  if (detailed_ && !series_.empty()) {
    auto key = [&](const QString& name, const QCPScatterStyle& style) {
      QCPGraph* g = plot_->addGraph(x, y);
      g->setName(name);
      g->setLineStyle(QCPGraph::lsNone);
      g->setScatterStyle(style);
    };
    key(tr("outlier"), outlier_style());
    key(tr("over range (lower bound)"), censored_style());
  }

  // Zero line of the residuals.
  auto* zero = new QCPItemStraightLine(plot_);
  zero->setClipAxisRect(residual_rect_);
  zero->point1->setAxes(rx, ry);
  zero->point2->setAxes(rx, ry);
  zero->point1->setCoords(1, 0);
  zero->point2->setCoords(10, 0);
  zero->setPen(QPen(Qt::gray, 1, Qt::DashLine));

  if (spec_window_) {
    auto* window = new QCPItemLine(plot_);
    window->setClipAxisRect(curve_rect_);
    window->start->setAxes(x, y);
    window->end->setAxes(x, y);
    window->start->setCoords(kReferenceLux, spec_window_->first);
    window->end->setCoords(kReferenceLux, spec_window_->second);
    window->setHead(QCPLineEnding(QCPLineEnding::esBar, 14));
    window->setTail(QCPLineEnding(QCPLineEnding::esBar, 14));
    window->setPen(QPen(kSpecColour, 3));
    auto* label = new QCPItemText(plot_);
    label->setClipAxisRect(curve_rect_);
    label->position->setAxes(x, y);
    label->position->setCoords(kReferenceLux, spec_window_->second);
    label->setPositionAlignment(Qt::AlignLeft | Qt::AlignBottom);
    label->setText(tr("spec R10 %1 – %2")
                       .arg(format_ohm(spec_window_->first), format_ohm(spec_window_->second)));
    label->setColor(kSpecColour.darker(130));
  }

  // Ranges: fit everything drawn, with a little room on the log axes.
  bool found = false;
  QCPRange xr = QCPRange(1, 1000), yr = QCPRange(1e3, 1e6), rr(-0.05, 0.05);
  for (QCPAxisRect* rect : {curve_rect_, residual_rect_}) {
    for (int i = 0; i < plot_->plottableCount(); ++i) {
      QCPAbstractPlottable* p = plot_->plottable(i);
      if (p->keyAxis()->axisRect() != rect) continue;
      bool ok = false;
      const QCPRange k = p->getKeyRange(ok, QCP::sdPositive);
      if (!ok) continue;
      bool vok = false;
      const QCPRange v = p->getValueRange(vok, rect == curve_rect_ ? QCP::sdPositive : QCP::sdBoth);
      if (!vok) continue;
      if (rect == curve_rect_) {
        if (!found) {
          xr = k;
          yr = v;
          found = true;
        } else {
          xr.expand(k);
          yr.expand(v);
        }
      } else {
        rr.expand(v);
      }
    }
  }
  if (spec_window_) {
    yr.expand(spec_window_->first);
    yr.expand(spec_window_->second);
  }
  x->setRange(xr.lower / 1.5, xr.upper * 1.5);
  y->setRange(yr.lower / 1.5, yr.upper * 1.5);
  const double reach = std::max(std::fabs(rr.lower), std::fabs(rr.upper)) * 1.2;
  ry->setRange(-reach, reach);
  rx->setRange(x->range());
  plot_->legend->setVisible(detailed_ ? !series_.empty() : true);
  // A whole lot is hundreds of thousands of markers: unsmoothed, they draw several times faster.
  plot_->setNotAntialiasedElements(detailed_ ? QCP::aeNone : QCP::aeScatters | QCP::aePlottables);
  plot_->replot(QCustomPlot::rpQueuedReplot);
}

QString CurvesView::hoverTextAt(const QPoint& pos) const {
  const HoverPoint* best = nullptr;
  double best_d2 = 8.0 * 8.0;  // within 8 px
  for (const HoverPoint& p : hover_points_) {
    QCPAxisRect* rect = p.kind == 'e' ? residual_rect_ : curve_rect_;
    const double px = rect->axis(QCPAxis::atBottom)->coordToPixel(p.lux);
    const double py = rect->axis(QCPAxis::atLeft)->coordToPixel(p.value);
    const double d2 = (px - pos.x()) * (px - pos.x()) + (py - pos.y()) * (py - pos.y());
    if (d2 < best_d2) {
      best_d2 = d2;
      best = &p;
    }
  }
  if (!best || !lot_) return {};
  const QString id = QString::fromStdString(lot_->units[static_cast<std::size_t>(best->unit)].id);
  const QString lux = format_number(best->lux, 3);
  switch (best->kind) {
    case 'r':
      return tr("%1: %2 lx, %3").arg(id, lux, format_ohm(best->value));
    case 'o':
      return tr("%1: %2 lx, %3 (outlier)").arg(id, lux, format_ohm(best->value));
    case 'c':
      return tr("%1: %2 lx, over range (> %3)").arg(id, lux, format_ohm(best->value));
    default:
      return tr("%1: %2 lx, residual %3 in ln R (%4 %)")
          .arg(id, lux, format_number(best->value, 2),
               format_number(100 * std::expm1(best->value), 2));
  }
}

bool CurvesView::eventFilter(QObject* watched, QEvent* event) {
  if (watched == plot_ && event->type() == QEvent::MouseMove) {
    auto* mouse = static_cast<QMouseEvent*>(event);
    if (mouse->buttons() == Qt::NoButton) {
      const QString text = hoverTextAt(mouse->position().toPoint());
      if (text.isEmpty()) {
        QToolTip::hideText();
      } else {
        QToolTip::showText(mouse->globalPosition().toPoint(), text, plot_);
      }
    }
  }
  return QWidget::eventFilter(watched, event);
}

}  // namespace photolot::workbench
