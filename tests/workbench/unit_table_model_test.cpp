// The unit table model on its own, over a hand-built lot and fit.
#include "unit_table_model.h"

#include <gtest/gtest.h>

#include <cmath>

namespace photolot::workbench {
namespace {

// Three units: two fitted power laws and one that could not be fitted.
struct Fixture {
  std::shared_ptr<Lot> lot = std::make_shared<Lot>();
  std::shared_ptr<LotFit> fit = std::make_shared<LotFit>();
  Fixture() {
    const char* ids[] = {"U0003", "U0001", "U0002"};
    const double r10[] = {25e3, 15e3, kNaN};
    const double gamma[] = {0.8, 0.7, kNaN};
    for (int i = 0; i < 3; ++i) {
      Unit u;
      u.id = ids[i];
      for (double lux : {1.0, 10.0, 100.0}) u.readings.push_back({lux, 1e4, kNaN, ReadingKind::normal, {}});
      lot->units.push_back(u);
      UnitFit f;
      f.id = ids[i];
      f.points = 3;
      if (std::isfinite(r10[i])) {
        f.status = FitStatus::fitted;
        f.curve = make_power_law(r10[i], gamma[i]);
        f.r10_ohm = r10[i];
        f.gamma = gamma[i];
        f.rms_log_residual = 0.01;
      } else {
        f.status = FitStatus::too_few_levels;
        f.flags = {"few-levels"};
      }
      fit->units.push_back(f);
    }
  }
};

TEST(UnitTableModel, HasOneRowPerUnitInLotOrder) {
  Fixture f;
  UnitTableModel model;
  model.setLot(f.lot, f.fit);
  ASSERT_EQ(model.rowCount(), 3);
  for (int i = 0; i < 3; ++i) {
    EXPECT_EQ(model.index(i, UnitTableModel::kId).data().toString().toStdString(), f.lot->units[i].id);
  }
}

TEST(UnitTableModel, ShowsR10WithAnSiPrefix) {
  // SI prefix k = 10^3 (SI Brochure, 9th edition, Table 7).
  Fixture f;
  UnitTableModel model;
  model.setLot(f.lot, f.fit);
  EXPECT_EQ(model.index(0, UnitTableModel::kR10).data().toString(), QStringLiteral("25.0 kΩ"));
  EXPECT_EQ(model.index(1, UnitTableModel::kR10).data().toString(), QStringLiteral("15.0 kΩ"));
  EXPECT_EQ(model.index(2, UnitTableModel::kR10).data().toString(), QStringLiteral("—"));
}

TEST(UnitFilterModel, SortsByNumberWithUnfittedUnitsLastBothWays) {
  Fixture f;
  UnitTableModel model;
  model.setLot(f.lot, f.fit);
  UnitFilterModel proxy;
  proxy.setSourceModel(&model);
  proxy.sort(UnitTableModel::kR10, Qt::AscendingOrder);
  EXPECT_EQ(proxy.index(0, 0).data().toString(), QStringLiteral("U0001"));
  EXPECT_EQ(proxy.index(1, 0).data().toString(), QStringLiteral("U0003"));
  EXPECT_EQ(proxy.index(2, 0).data().toString(), QStringLiteral("U0002"));
  proxy.sort(UnitTableModel::kR10, Qt::DescendingOrder);
  EXPECT_EQ(proxy.index(0, 0).data().toString(), QStringLiteral("U0003"));
  EXPECT_EQ(proxy.index(2, 0).data().toString(), QStringLiteral("U0002"));
}

TEST(UnitFilterModel, FiltersByStatusTextAndVerdict) {
  Fixture f;
  UnitTableModel model;
  model.setLot(f.lot, f.fit);
  UnitFilterModel proxy;
  proxy.setSourceModel(&model);
  proxy.setStatusFilter(UnitFilterModel::StatusFilter::not_fitted);
  ASSERT_EQ(proxy.rowCount(), 1);
  EXPECT_EQ(proxy.index(0, 0).data().toString(), QStringLiteral("U0002"));
  proxy.setStatusFilter(UnitFilterModel::StatusFilter::all);
  proxy.setText(QStringLiteral("0003"));
  EXPECT_EQ(proxy.rowCount(), 1);
  proxy.setText(QStringLiteral("few-levels"));  // flags match too
  EXPECT_EQ(proxy.rowCount(), 1);
  proxy.setText({});
  model.setVerdicts({{UnitVerdictKind::nonconforming, QStringLiteral("fail")},
                     {UnitVerdictKind::conforming, QStringLiteral("pass")},
                     {UnitVerdictKind::nonconforming, QStringLiteral("fail")}});
  proxy.setVerdictFilter(UnitFilterModel::VerdictFilter::nonconforming);
  EXPECT_EQ(proxy.rowCount(), 2);
}

}  // namespace
}  // namespace photolot::workbench
