#include "pairs_view.h"

#include <qcustomplot.h>

#include <QCheckBox>
#include <QComboBox>
#include <QDoubleSpinBox>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QListWidget>
#include <QPushButton>
#include <QSplitter>
#include <QTableView>
#include <QVBoxLayout>
#include <cmath>
#include <limits>

#include "display_format.h"
#include "plot_style.h"

namespace photolot::workbench {

void PairTableModel::setPairing(std::shared_ptr<const Pairing> pairing) {
  beginResetModel();
  pairing_ = std::move(pairing);
  endResetModel();
}

int PairTableModel::rowCount(const QModelIndex& parent) const {
  return parent.isValid() || !pairing_ ? 0 : static_cast<int>(pairing_->pairs.size());
}

int PairTableModel::columnCount(const QModelIndex& parent) const {
  return parent.isValid() ? 0 : 6;
}

QVariant PairTableModel::data(const QModelIndex& index, int role) const {
  if (!pairing_ || !index.isValid()) return {};
  const UnitPair& p = pairing_->pairs[static_cast<std::size_t>(index.row())];
  if (role == Qt::DisplayRole) {
    switch (index.column()) {
      case 0:
        return index.row() + 1;
      case 1:
        return QString::fromStdString(p.a_id);
      case 2:
        return QString::fromStdString(p.b_id);
      case 3:
        return format_number(p.tracking_error_pct, 3);
      case 4:
        return std::isfinite(p.tracking_error_sigma_pct)
                   ? QVariant(format_number(p.tracking_error_sigma_pct, 2))
                   : QVariant();
      case 5:
        return format_number(p.worst_lux, 3);
    }
  }
  if (role == Qt::TextAlignmentRole && index.column() != 1 && index.column() != 2) {
    return static_cast<int>(Qt::AlignRight | Qt::AlignVCenter);
  }
  if (role == Qt::ToolTipRole && (index.column() == 3 || index.column() == 4) &&
      std::isfinite(p.tracking_error_sigma_pct)) {
    return tr("± %1 % (1 sd, from the fits' covariances)")
        .arg(format_number(p.tracking_error_sigma_pct, 2));
  }
  return {};
}

QVariant PairTableModel::headerData(int section, Qt::Orientation orientation, int role) const {
  if (orientation != Qt::Horizontal || role != Qt::DisplayRole) return {};
  switch (section) {
    case 0:
      return tr("Pair");
    case 1:
      return tr("Unit A");
    case 2:
      return tr("Unit B");
    case 3:
      return tr("Error %");
    case 4:
      return tr("± sd %");
    case 5:
      return tr("Worst at lx");
  }
  return {};
}

PairsView::PairsView(QWidget* parent) : QWidget(parent) {
  setObjectName(QStringLiteral("pairsView"));
  lux_lo_ = new QDoubleSpinBox(this);
  lux_lo_->setRange(0.01, 1e5);
  lux_lo_->setDecimals(2);
  lux_lo_->setSuffix(tr(" lx"));
  lux_hi_ = new QDoubleSpinBox(this);
  lux_hi_->setRange(0.01, 1e6);
  lux_hi_->setDecimals(1);
  lux_hi_->setSuffix(tr(" lx"));
  tolerance_ = new QDoubleSpinBox(this);
  tolerance_->setRange(0.01, 100);
  tolerance_->setDecimals(2);
  tolerance_->setSuffix(tr(" %"));
  mode_ = new QComboBox(this);
  mode_->addItem(tr("equal resistance"), static_cast<int>(TrackingMode::absolute));
  mode_->addItem(tr("constant ratio (trimmed)"), static_cast<int>(TrackingMode::trimmable));
  all_fitted_ = new QCheckBox(tr("Include every fitted unit, not only those that conform"), this);
  all_fitted_->setObjectName(QStringLiteral("pairAllFitted"));
  all_fitted_->setToolTip(
      tr("With a spec loaded, only units that conform to it are paired (as "
         "photolot-cli does). Tick to pair every fitted unit instead."));
  all_fitted_->setEnabled(false);
  connect(all_fitted_, &QCheckBox::toggled, this, &PairsView::includeAllFittedChanged);
  find_ = new QPushButton(tr("Find Pairs"), this);
  find_->setObjectName(QStringLiteral("findPairsButton"));
  export_ = new QPushButton(tr("Save Pick List…"), this);
  export_->setEnabled(false);

  auto* form = new QFormLayout;
  form->addRow(tr("Working range from"), lux_lo_);
  form->addRow(tr("to"), lux_hi_);
  form->addRow(tr("Tolerance"), tolerance_);
  form->addRow(tr("Curves must track"), mode_);
  form->addRow(tr("Units"), all_fitted_);
  auto* buttons = new QHBoxLayout;
  buttons->addWidget(find_);
  buttons->addWidget(export_);
  form->addRow(buttons);
  status_ =
      new QLabel(tr("Pairing has not run. Choose the range and tolerance, then Find Pairs."), this);
  status_->setWordWrap(true);

  model_ = new PairTableModel(this);
  table_ = new QTableView(this);
  table_->setObjectName(QStringLiteral("pairTable"));
  table_->setModel(model_);
  table_->setSelectionBehavior(QAbstractItemView::SelectRows);
  table_->setSelectionMode(QAbstractItemView::SingleSelection);
  table_->verticalHeader()->setVisible(false);
  table_->horizontalHeader()->setStretchLastSection(true);
  unpaired_ = new QListWidget(this);
  unpaired_->setObjectName(QStringLiteral("unpairedList"));
  unpaired_->setWordWrap(true);

  auto* left = new QWidget(this);
  auto* left_layout = new QVBoxLayout(left);
  left_layout->setContentsMargins(0, 0, 0, 0);
  left_layout->addLayout(form);
  left_layout->addWidget(status_);
  left_layout->addWidget(table_, 3);
  left_layout->addWidget(new QLabel(tr("Without a partner:"), left));
  left_layout->addWidget(unpaired_, 1);

  plot_ = new QCustomPlot(this);
  plot_->setObjectName(QStringLiteral("pairPlot"));
  plot_->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom);
  auto* split = new QSplitter(this);
  split->addWidget(left);
  split->addWidget(plot_);
  split->setStretchFactor(1, 1);
  auto* layout = new QVBoxLayout(this);
  layout->addWidget(split);

  setOptions(PairOptions{});
  connect(find_, &QPushButton::clicked, this, [this] { emit findRequested(options()); });
  connect(export_, &QPushButton::clicked, this, &PairsView::exportRequested);
  connect(table_->selectionModel(), &QItemSelectionModel::currentRowChanged, this,
          [this](const QModelIndex& current) {
            showPair(current.row());
            if (current.isValid() && model_->pairing()) {
              const auto& p = model_->pairing()->pairs[static_cast<std::size_t>(current.row())];
              emit pairActivated(p.a, p.b);
            }
          });
  showPair(-1);
}

void PairsView::setOptions(const PairOptions& o) {
  lux_lo_->setValue(o.lux_lo);
  lux_hi_->setValue(o.lux_hi);
  tolerance_->setValue(o.tolerance_pct);
  mode_->setCurrentIndex(mode_->findData(static_cast<int>(o.mode)));
}

PairOptions PairsView::options() const {
  PairOptions o;
  o.lux_lo = lux_lo_->value();
  o.lux_hi = lux_hi_->value();
  o.tolerance_pct = tolerance_->value();
  o.mode = static_cast<TrackingMode>(mode_->currentData().toInt());
  return o;
}

void PairsView::setSpecLoaded(bool loaded) {
  all_fitted_->setEnabled(loaded);
  all_fitted_->setText(loaded ? tr("Include every fitted unit, not only those that conform")
                              : tr("Every fitted unit (no spec loaded)"));
}

bool PairsView::includeAllFitted() const {
  return all_fitted_->isEnabled() && all_fitted_->isChecked();
}

void PairsView::setFit(std::shared_ptr<const LotFit> fit) {
  fit_ = std::move(fit);
  showPair(-1);
}

void PairsView::setPairing(std::shared_ptr<const Pairing> pairing, bool stale,
                           PairEligibility among) {
  model_->setPairing(pairing);
  table_->resizeColumnsToContents();
  unpaired_->clear();
  export_->setEnabled(pairing != nullptr);
  if (!pairing) {
    status_->setText(
        stale ? tr("Finding pairs…")
              : tr("Pairing has not run. Choose the range and tolerance, then Find Pairs."));
    showPair(-1);
    return;
  }
  const auto& c = pairing->counts;
  const QString from = among == PairEligibility::conforming
                           ? tr("%1 units that conform to the spec").arg(c.fitted)
                           : tr("%1 fitted units").arg(c.fitted);
  status_->setText(tr("%1 pairs from %2, %3 without a partner. Total error %4 %; %5 (%6).")
                       .arg(c.pairs)
                       .arg(from)
                       .arg(c.unpaired)
                       .arg(format_number(pairing->total_error_pct, 4))
                       .arg(QString::fromUtf8(to_string(pairing->proof).data()),
                            QString::fromStdString(pairing->proof_detail)));
  constexpr std::size_t kListed = 2000;
  for (std::size_t i = 0; i < pairing->unpaired.size() && i < kListed; ++i) {
    const auto& u = pairing->unpaired[i];
    // The reason names the nearest unit and its error already.
    const QString text = QStringLiteral("%1 — %2").arg(QString::fromStdString(u.id),
                                                       QString::fromStdString(u.reason));
    auto* item = new QListWidgetItem(text, unpaired_);
    item->setToolTip(text);
  }
  if (!pairing->pairs.empty()) {
    table_->selectRow(0);
  } else {
    showPair(-1);
  }
}

void PairsView::showPair(int row) {
  plot_->clearPlottables();
  plot_->clearItems();
  plot_->plotLayout()->clear();
  // Title above the curves, not on them: a falling curve fills the upper left of its plot.
  auto* title = new QCPTextElement(plot_, QString(), QFont(font().family(), -1, QFont::Bold));
  title->setObjectName(QStringLiteral("pairTitle"));
  // A long title may be cut rather than widen the plot, and with it the window's splitter.
  title->setMinimumSize(1, 0);
  auto* curves = new QCPAxisRect(plot_);
  auto* ratio = new QCPAxisRect(plot_);
  plot_->plotLayout()->addElement(0, 0, title);
  plot_->plotLayout()->addElement(1, 0, curves);
  plot_->plotLayout()->addElement(2, 0, ratio);
  for (QCPAxisRect* rect : {curves, ratio}) {
    QCPAxis* x = rect->axis(QCPAxis::atBottom);
    x->setScaleType(QCPAxis::stLogarithmic);
    x->setTicker(QSharedPointer<QCPAxisTickerLog>(new QCPAxisTickerLog));
  }
  QCPAxis* cy = curves->axis(QCPAxis::atLeft);
  cy->setScaleType(QCPAxis::stLogarithmic);
  cy->setTicker(QSharedPointer<QCPAxisTickerLog>(new QCPAxisTickerLog));
  cy->setLabel(tr("Resistance (Ω)"));
  ratio->axis(QCPAxis::atLeft)->setLabel(tr("R_A / R_B − 1 (%)"));
  ratio->axis(QCPAxis::atBottom)->setLabel(tr("Illuminance (lx)"));

  const Pairing* pairing = model_->pairing();
  if (row < 0 || !pairing || !fit_ || row >= static_cast<int>(pairing->pairs.size())) {
    auto* text = new QCPItemText(plot_);
    text->setClipToAxisRect(false);
    text->position->setAxisRect(curves);
    text->position->setType(QCPItemPosition::ptAxisRectRatio);
    text->position->setCoords(0.5, 0.5);
    text->setText(tr("Choose a pair to see its two curves and their ratio."));
    title->setText(tr("No pair chosen"));
    plot_->replot(QCustomPlot::rpQueuedReplot);
    return;
  }
  const UnitPair& p = pairing->pairs[static_cast<std::size_t>(row)];
  const Curve& a = fit_->units[p.a].curve;
  const Curve& b = fit_->units[p.b].curve;
  const double lo = pairing->options.lux_lo, hi = pairing->options.lux_hi;
  QVector<double> lux, ra, rb, err;
  double d_lo = std::numeric_limits<double>::infinity(), d_hi = -d_lo;  // extremes of ln(R_A/R_B)
  for (int i = 0; i <= 60; ++i) {
    const double e = lo * std::pow(hi / lo, i / 60.0);
    lux << e;
    ra << a.ohm(e);
    rb << b.ohm(e);
    const double d = a.ln_ohm(e) - b.ln_ohm(e);
    d_lo = std::min(d_lo, d);
    d_hi = std::max(d_hi, d);
    err << 100 * std::expm1(d);
  }
  auto line = [&](QCPAxisRect* rect, const QVector<double>& y, const QColor& colour,
                  const QString& name, Qt::PenStyle style) {
    QCPGraph* g = plot_->addGraph(rect->axis(QCPAxis::atBottom), rect->axis(QCPAxis::atLeft));
    g->setData(lux, y, true);
    g->setPen(QPen(colour, 2, style));
    g->setName(name);
    g->rescaleAxes(rect == curves ? false : false);
    return g;
  };
  line(curves, ra, unit_colour(0), QString::fromStdString(p.a_id), Qt::SolidLine);
  line(curves, rb, unit_colour(1), QString::fromStdString(p.b_id), Qt::DashLine);
  line(ratio, err, kAggregateColour, tr("ratio error"), Qt::SolidLine);
  curves->axis(QCPAxis::atBottom)->setRange(lo, hi);
  ratio->axis(QCPAxis::atBottom)->setRange(lo, hi);
  double lo_r = std::min(ra.front(), rb.front()), hi_r = std::max(ra.front(), rb.front());
  for (int i = 0; i < lux.size(); ++i) {
    lo_r = std::min({lo_r, ra[i], rb[i]});
    hi_r = std::max({hi_r, ra[i], rb[i]});
  }
  cy->setRange(lo_r / 1.3, hi_r * 1.3);
  // The tolerance band: for equal resistances R_A / R_B - 1 must stay within +-tol; for a
  // trimmed ratio only its drift counts, so the band is ln(1 + tol) wide about the middle of
  // the ratio's own range (a pair within tolerance fits inside it).
  const double tol = pairing->options.tolerance_pct;
  double band_lo = -tol, band_hi = tol;
  if (pairing->options.mode == TrackingMode::trimmable) {
    const double mid = (d_lo + d_hi) / 2, half = std::log1p(tol / 100) / 2;
    band_lo = 100 * std::expm1(mid - half);
    band_hi = 100 * std::expm1(mid + half);
  }
  double y_lo = band_lo, y_hi = band_hi;
  for (double e : err) y_lo = std::min(y_lo, e), y_hi = std::max(y_hi, e);
  const double pad = 0.2 * (y_hi - y_lo);
  if (pairing->options.mode == TrackingMode::absolute) {
    const double reach = std::max(-y_lo, y_hi) + pad;
    ratio->axis(QCPAxis::atLeft)->setRange(-reach, reach);
  } else {
    ratio->axis(QCPAxis::atLeft)->setRange(y_lo - pad, y_hi + pad);
  }
  for (double t : {band_hi, band_lo}) {
    auto* limit = new QCPItemStraightLine(plot_);
    limit->setObjectName(QStringLiteral("toleranceBand"));
    limit->setClipAxisRect(ratio);
    limit->point1->setAxes(ratio->axis(QCPAxis::atBottom), ratio->axis(QCPAxis::atLeft));
    limit->point2->setAxes(ratio->axis(QCPAxis::atBottom), ratio->axis(QCPAxis::atLeft));
    limit->point1->setCoords(lo, t);
    limit->point2->setCoords(hi, t);
    limit->setPen(QPen(kLimitColour, 1.5, Qt::DashLine));
  }
  // Lower left: the empty corner of two falling curves.
  auto* legend = new QCPLegend;
  curves->insetLayout()->addElement(legend, Qt::AlignBottom | Qt::AlignLeft);
  legend->setLayer(QStringLiteral("legend"));
  legend->addItem(new QCPPlottableLegendItem(legend, plot_->graph(0)));
  legend->addItem(new QCPPlottableLegendItem(legend, plot_->graph(1)));
  QString error = format_number(p.tracking_error_pct, 3) + QStringLiteral(" %");
  if (std::isfinite(p.tracking_error_sigma_pct))
    error += tr(" ± %1").arg(format_number(p.tracking_error_sigma_pct, 2));
  title->setText(pairing->options.mode == TrackingMode::absolute
                     ? tr("Pair %1: %2 and %3\nerror %4, band ±%5 %")
                           .arg(row + 1)
                           .arg(QString::fromStdString(p.a_id), QString::fromStdString(p.b_id),
                                error, format_number(tol, 3))
                     : tr("Pair %1: %2 and %3\ndrift %4, band %5 % wide (ratio trimmed)")
                           .arg(row + 1)
                           .arg(QString::fromStdString(p.a_id), QString::fromStdString(p.b_id),
                                error, format_number(tol, 3)));
  plot_->replot(QCustomPlot::rpQueuedReplot);
}

}  // namespace photolot::workbench
