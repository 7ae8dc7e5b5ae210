// The unit table: one row per unit of the lot, with its fit summary and verdict. Adapts the
// session's Lot and LotFit (read-only snapshots) to Qt's model/view; announces a new lot or fit
// with a model reset so views and proxies follow.
#pragma once

#include <QAbstractTableModel>
#include <QSortFilterProxyModel>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/lot.h"

namespace photolot::workbench {

// Whether a unit conforms, as the acceptance step says; unknown until that step has run.
enum class UnitVerdictKind : std::uint8_t { unknown, conforming, nonconforming };

struct UnitVerdictText {
  UnitVerdictKind kind = UnitVerdictKind::unknown;
  QString text;  // "pass", "fail: R10 above 30 kΩ", ...
};

class UnitTableModel : public QAbstractTableModel {
  Q_OBJECT
 public:
  enum Column {
    kId,
    kPoints,
    kR10,
    kR10Interval,
    kGamma,
    kGammaInterval,
    kModel,
    kDarkConductance,
    kTempCoeff,
    kRms,
    kStatus,
    kFlags,
    kVerdict,
    kColumnCount
  };
  // Data roles beyond Qt's: the raw number for sorting (NaN sorts last), the unit's index.
  static constexpr int kSortRole = Qt::UserRole + 1;
  static constexpr int kUnitIndexRole = Qt::UserRole + 2;
  static constexpr int kFittedRole = Qt::UserRole + 3;
  static constexpr int kVerdictRole = Qt::UserRole + 4;  // int(UnitVerdictKind)

  explicit UnitTableModel(QObject* parent = nullptr);

  void setLot(std::shared_ptr<const Lot> lot, std::shared_ptr<const LotFit> fit);
  void setVerdicts(std::vector<UnitVerdictText> verdicts);  // in lot order, or empty
  bool verdictsAvailable() const { return !verdicts_.empty(); }

  const Lot* lot() const { return lot_.get(); }
  const LotFit* fit() const { return fit_.get(); }
  const UnitFit* unitFit(int unit) const;
  // The table's sort order on a column, straight from the lot (no QVariant, no QString): what
  // the filter model sorts with, so a 10,000-row sort stays a few milliseconds. Numbers compare
  // as numbers with NaN (not fitted) last in either order; text case-insensitively.
  bool rowLess(int a, int b, int column, bool ascending) const;
  bool hasFlags(int unit) const;

  int rowCount(const QModelIndex& parent = {}) const override;
  int columnCount(const QModelIndex& parent = {}) const override;
  QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation orientation,
                      int role = Qt::DisplayRole) const override;

 private:
  const UnitVerdictText* verdictAt(int unit) const;  // nullptr before verdicts are set

  std::shared_ptr<const Lot> lot_;
  std::shared_ptr<const LotFit> fit_;
  std::vector<UnitVerdictText> verdicts_;
};

// Filters the unit table by fit status, verdict and a text (matched against id and flags),
// and sorts numerically on kSortRole with NaN last in either order.
class UnitFilterModel : public QSortFilterProxyModel {
  Q_OBJECT
 public:
  enum class StatusFilter { all, fitted, not_fitted, flagged };
  enum class VerdictFilter { all, conforming, nonconforming, unknown };

  explicit UnitFilterModel(QObject* parent = nullptr);
  void setStatusFilter(StatusFilter filter);
  void setVerdictFilter(VerdictFilter filter);
  void setText(const QString& text);

 protected:
  bool filterAcceptsRow(int source_row, const QModelIndex& source_parent) const override;
  bool lessThan(const QModelIndex& left, const QModelIndex& right) const override;

 private:
  StatusFilter status_ = StatusFilter::all;
  VerdictFilter verdict_ = VerdictFilter::all;
  QString text_;
};

}  // namespace photolot::workbench
