// The pairs view on its own: the pick list with the error's uncertainty beside it, the units
// left without a partner, and the tolerance band drawn against R_A / R_B - 1 for both
// measures. The lot is three hand-placed power laws (invented), paired by core.
#include "pairs_view.h"

#include <gtest/gtest.h>
#include <qcustomplot.h>

#include <QListWidget>
#include <QTableView>
#include <algorithm>
#include <cmath>
#include <memory>

#include "../pairing/pairing_support.h"
#include "display_format.h"

namespace photolot::workbench {
namespace {

// U1 and U2 keep a ratio of 1.10 that drifts by 0.5 % in ln over 1-1000 lx; U3 drifts far.
std::shared_ptr<LotFit> three_units() {
  auto fit = std::make_shared<LotFit>();
  const double lo = std::log(100e3), hi = std::log(1e3), ratio = std::log(1.10);
  fit->units.push_back(test::unit_through("U1", lo, hi));
  fit->units.push_back(test::unit_through("U2", lo + ratio, hi + ratio + 0.005));
  fit->units.push_back(test::unit_through("U3", lo + 0.3, hi + 0.8));
  return fit;
}

std::vector<double> band_of(const QCustomPlot& plot) {
  std::vector<double> ys;
  for (auto* line : plot.findChildren<QCPItemStraightLine*>(QStringLiteral("toleranceBand")))
    ys.push_back(line->point1->coords().y());
  std::sort(ys.begin(), ys.end());
  return ys;
}

// R_A / R_B - 1 in percent, straight from the two curves.
double ratio_pct(const LotFit& fit, const UnitPair& p, double lux) {
  return 100 * std::expm1(fit.units[p.a].curve.ln_ohm(lux) - fit.units[p.b].curve.ln_ohm(lux));
}

TEST(PairsView, TrimmedRatioBandIsTheToleranceWideAndHoldsThePairsRatio) {
  const auto fit = three_units();
  PairOptions o;
  o.mode = TrackingMode::trimmable;
  const auto pairing = std::make_shared<Pairing>(pair_units(*fit, o));
  ASSERT_EQ(pairing->pairs.size(), 1u);
  const UnitPair& p = pairing->pairs[0];
  // Definition (docs/pairing.md): 100 (exp(max d - min d) - 1), here 100 (exp(0.005) - 1).
  EXPECT_NEAR(p.tracking_error_pct,
              test::dense_error_pct(fit->units[0].curve, fit->units[1].curve, true), 1e-6);

  PairsView view;
  view.setFit(fit);
  view.setPairing(pairing, false);
  // A row, with the error's uncertainty (1 sd; 0 here, the units carry no covariance) beside it.
  auto* table = view.findChild<QTableView*>(QStringLiteral("pairTable"));
  ASSERT_TRUE(table);
  const auto* model = table->model();
  ASSERT_EQ(model->rowCount(), 1);
  EXPECT_EQ(model->headerData(4, Qt::Horizontal).toString(), QStringLiteral("± sd %"));
  EXPECT_EQ(model->index(0, 3).data().toString(), format_number(p.tracking_error_pct, 3));
  EXPECT_EQ(model->index(0, 4).data().toString(), format_number(p.tracking_error_sigma_pct, 2));

  const auto band = band_of(*view.plot());
  ASSERT_EQ(band.size(), 2u);
  // The band is ln(1 + tol) wide in ln(R_A / R_B) ...
  EXPECT_NEAR(std::log1p(band[1] / 100) - std::log1p(band[0] / 100), std::log1p(0.02), 1e-12);
  // ... and about the ratio's own middle (10 % off here, trimmed out): the pair's ratio stays
  // inside it over the whole range.
  for (double lux : {1.0, 3.0, 10.0, 100.0, 1000.0}) {
    const double r = ratio_pct(*fit, p, lux);
    EXPECT_GT(r, band[0]) << lux;
    EXPECT_LT(r, band[1]) << lux;
  }

  // The unit left over is listed once, with its nearest unit named once.
  auto* list = view.findChild<QListWidget*>(QStringLiteral("unpairedList"));
  ASSERT_TRUE(list);
  ASSERT_EQ(list->count(), 1);
  const QString text = list->item(0)->text();
  EXPECT_TRUE(text.startsWith(QStringLiteral("U3 — "))) << text.toStdString();
  EXPECT_EQ(text.count(QStringLiteral("nearest")), 1) << text.toStdString();
}

TEST(PairsView, EqualResistanceBandIsPlusMinusTheTolerance) {
  const auto fit = std::make_shared<LotFit>();
  const double lo = std::log(100e3), hi = std::log(1e3);
  fit->units.push_back(test::unit_through("A", lo, hi));
  fit->units.push_back(test::unit_through("B", lo + 0.01, hi - 0.005));
  PairOptions o;
  o.tolerance_pct = 1.5;
  const auto pairing = std::make_shared<Pairing>(pair_units(*fit, o));
  ASSERT_EQ(pairing->pairs.size(), 1u);
  PairsView view;
  view.setFit(fit);
  view.setPairing(pairing, false);
  const auto band = band_of(*view.plot());
  ASSERT_EQ(band.size(), 2u);
  EXPECT_DOUBLE_EQ(band[0], -1.5);
  EXPECT_DOUBLE_EQ(band[1], 1.5);
  // The plot's ratio axis shows the band and the ratio (its largest is 100 (exp(0.01) - 1)).
  const QCPRange shown = view.plot()->axisRect(1)->axis(QCPAxis::atLeft)->range();
  EXPECT_LT(shown.lower, -1.5);
  EXPECT_GT(shown.upper, 1.5);
}

}  // namespace
}  // namespace photolot::workbench
