#include "unit_table_model.h"

#include <QBrush>
#include <QColor>
#include <QFont>
#include <algorithm>
#include <cctype>
#include <cmath>
#include <string_view>

#include "display_format.h"

namespace photolot::workbench {

UnitTableModel::UnitTableModel(QObject* parent) : QAbstractTableModel(parent) {}

void UnitTableModel::setLot(std::shared_ptr<const Lot> lot, std::shared_ptr<const LotFit> fit) {
  beginResetModel();
  lot_ = std::move(lot);
  fit_ = std::move(fit);
  if (fit_ && lot_ && fit_->units.size() != lot_->units.size()) fit_.reset();
  verdicts_.clear();
  endResetModel();
}

void UnitTableModel::setVerdicts(std::vector<UnitVerdictText> verdicts) {
  if (lot_ && !verdicts.empty() && verdicts.size() != lot_->units.size()) verdicts.clear();
  verdicts_ = std::move(verdicts);
  if (rowCount() > 0) {
    emit dataChanged(index(0, kVerdict), index(rowCount() - 1, kVerdict));
  }
  emit headerDataChanged(Qt::Horizontal, kVerdict, kVerdict);
}

const UnitFit* UnitTableModel::unitFit(int unit) const {
  if (!fit_ || unit < 0 || unit >= static_cast<int>(fit_->units.size())) return nullptr;
  return &fit_->units[static_cast<std::size_t>(unit)];
}

bool UnitTableModel::hasFlags(int unit) const {
  const UnitFit* fit = unitFit(unit);
  return fit && !fit->flags.empty();
}

namespace {

bool less_nocase(std::string_view a, std::string_view b) {
  return std::lexicographical_compare(a.begin(), a.end(), b.begin(), b.end(), [](char x, char y) {
    return std::tolower(static_cast<unsigned char>(x)) <
           std::tolower(static_cast<unsigned char>(y));
  });
}

int normal_points(const Unit& unit) {
  int n = 0;
  for (const auto& r : unit.readings) n += r.kind == ReadingKind::normal ? 1 : 0;
  return n;
}

// A numeric column's value for one unit: what the table sorts by and, formatted, shows. NaN
// where the unit has none (not fitted); 0 for the text columns, which sort as text.
double column_number(int column, const Unit& u, const UnitFit* f, const UnitVerdictText* verdict) {
  const bool fitted = f && f->ok();
  switch (column) {
    case UnitTableModel::kPoints:
      return f ? f->points : normal_points(u);
    case UnitTableModel::kR10:
      return fitted ? f->r10_ohm : kNaN;
    case UnitTableModel::kR10Interval:
      return fitted ? f->r10_ci95_ohm[1] / f->r10_ci95_ohm[0] : kNaN;
    case UnitTableModel::kGamma:
      return fitted ? f->gamma : kNaN;
    case UnitTableModel::kGammaInterval:
      return fitted ? f->gamma_ci95[1] - f->gamma_ci95[0] : kNaN;
    case UnitTableModel::kRms:
      return fitted ? f->rms_log_residual : kNaN;
    case UnitTableModel::kModel:
      return fitted ? static_cast<double>(f->curve.model) : kNaN;
    case UnitTableModel::kDarkConductance:
      return fitted ? f->dark_conductance_s : kNaN;
    case UnitTableModel::kTempCoeff:
      return fitted ? f->temp_coeff_pct_per_c : kNaN;
    case UnitTableModel::kFlags:
      return f ? static_cast<double>(f->flags.size()) : 0.0;
    case UnitTableModel::kVerdict:
      return verdict ? static_cast<double>(verdict->kind) : 0.0;
    default:
      return 0.0;
  }
}

}  // namespace

const UnitVerdictText* UnitTableModel::verdictAt(int unit) const {
  return verdicts_.empty() ? nullptr : &verdicts_[static_cast<std::size_t>(unit)];
}

bool UnitTableModel::rowLess(int a, int b, int column, bool ascending) const {
  const auto& ua = lot_->units[static_cast<std::size_t>(a)];
  const auto& ub = lot_->units[static_cast<std::size_t>(b)];
  const UnitFit* fa = unitFit(a);
  const UnitFit* fb = unitFit(b);
  switch (column) {
    case kId:
      return less_nocase(ua.id, ub.id);
    case kStatus: {
      const std::string_view sa = fa ? to_string(fa->status) : std::string_view();
      const std::string_view sb = fb ? to_string(fb->status) : std::string_view();
      return less_nocase(sa, sb);
    }
    default:
      break;
  }
  const double x = column_number(column, ua, fa, verdictAt(a));
  const double y = column_number(column, ub, fb, verdictAt(b));
  if (std::isnan(x) || std::isnan(y)) {
    if (std::isnan(x) && std::isnan(y)) return a < b;
    return ascending ? std::isnan(y) : std::isnan(x);
  }
  return x < y;
}

int UnitTableModel::rowCount(const QModelIndex& parent) const {
  if (parent.isValid() || !lot_) return 0;
  return static_cast<int>(lot_->units.size());
}

int UnitTableModel::columnCount(const QModelIndex& parent) const {
  return parent.isValid() ? 0 : kColumnCount;
}

namespace {

// How the table names a model (plain words; the JSON keeps to_string's names).
QString model_text(ModelKind kind) {
  switch (kind) {
    case ModelKind::power_law:
      return UnitTableModel::tr("power law");
    case ModelKind::dark_conductance:
      return UnitTableModel::tr("dark conductance");
  }
  return {};
}

QString join_flags(const std::vector<std::string>& flags) {
  QStringList list;
  for (const auto& f : flags) list << QString::fromStdString(f);
  return list.join(QStringLiteral(", "));
}

}  // namespace

QVariant UnitTableModel::data(const QModelIndex& index, int role) const {
  if (!index.isValid() || !lot_) return {};
  const int row = index.row();
  const Unit& unit = lot_->units[static_cast<std::size_t>(row)];
  const UnitFit* fit = unitFit(row);
  const bool fitted = fit && fit->ok();
  const UnitVerdictText* verdict = verdictAt(row);

  if (role == kUnitIndexRole) return row;
  if (role == kFittedRole) return fitted;
  if (role == kVerdictRole)
    return static_cast<int>(verdict ? verdict->kind : UnitVerdictKind::unknown);

  const auto column = static_cast<Column>(index.column());
  if (role == kSortRole) {
    switch (column) {
      case kId:
        return QString::fromStdString(unit.id);
      case kStatus:
        return fit ? QString::fromUtf8(to_string(fit->status).data()) : QString();
      default:
        return column_number(column, unit, fit, verdict);
    }
  }

  if (role == Qt::DisplayRole) {
    switch (column) {
      case kId:
        return QString::fromStdString(unit.id);
      case kPoints:
        return static_cast<int>(column_number(column, unit, fit, verdict));
      case kR10:
        return fitted ? format_ohm(fit->r10_ohm) : QStringLiteral("—");
      case kR10Interval:
        return fitted ? format_interval(fit->r10_ci95_ohm, true) : QStringLiteral("—");
      case kGamma:
        return fitted ? format_number(fit->gamma, 3) : QStringLiteral("—");
      case kGammaInterval:
        return fitted ? format_interval(fit->gamma_ci95, false) : QStringLiteral("—");
      case kRms:
        return fitted ? format_number(fit->rms_log_residual, 2) : QStringLiteral("—");
      case kModel:
        return fitted ? model_text(fit->curve.model) : QStringLiteral("—");
      case kDarkConductance:
        return fitted && fit->curve.model == ModelKind::dark_conductance
                   ? format_siemens(fit->dark_conductance_s)
                   : QStringLiteral("—");
      case kTempCoeff:
        return fitted && std::isfinite(fit->temp_coeff_pct_per_c)
                   ? tr("%1 %/°C").arg(format_number(fit->temp_coeff_pct_per_c, 3))
                   : QStringLiteral("—");
      case kStatus:
        if (!fit) return QStringLiteral("not fitted yet");
        return QString::fromUtf8(to_string(fit->status).data()).replace('_', ' ');
      case kFlags:
        return fit ? join_flags(fit->flags) : QString();
      case kVerdict:
        return verdict ? verdict->text : QStringLiteral("—");
      case kColumnCount:
        break;
    }
    return {};
  }
  if (role == Qt::ToolTipRole) {
    if (column == kStatus && fit) return QString::fromStdString(fit->message);
    if (column == kModel && fitted) {
      // The evidence for the choice: AICc of each candidate that was tried (lower wins).
      QStringList tried;
      if (std::isfinite(fit->aicc_power_law)) {
        tried << tr("power law AICc %1").arg(format_number(fit->aicc_power_law, 4));
      }
      if (std::isfinite(fit->aicc_dark_conductance)) {
        tried << tr("dark conductance AICc %1").arg(format_number(fit->aicc_dark_conductance, 4));
      }
      return tried.isEmpty() ? model_text(fit->curve.model) : tried.join(QStringLiteral("; "));
    }
    if (column == kVerdict && !verdict) {
      return tr("Verdicts appear once a spec is loaded and the acceptance step has run.");
    }
    if (column == kVerdict) return verdict->text;
    return {};
  }
  if (role == Qt::TextAlignmentRole) {
    if (column == kPoints || column == kR10 || column == kGamma || column == kRms ||
        column == kDarkConductance || column == kTempCoeff) {
      return static_cast<int>(Qt::AlignRight | Qt::AlignVCenter);
    }
    return {};
  }
  if (role == Qt::ForegroundRole) {
    if (column == kStatus && fit && !fitted) return QBrush(QColor(0xb0, 0x3a, 0x2e));
    if (column == kVerdict && verdict && verdict->kind == UnitVerdictKind::nonconforming) {
      return QBrush(QColor(0xb0, 0x3a, 0x2e));
    }
    return {};
  }
  if (role == Qt::FontRole && column == kVerdict && verdict &&
      verdict->kind == UnitVerdictKind::nonconforming) {
    QFont font;
    font.setBold(true);  // weight as well as colour, for readers who cannot tell the red
    return font;
  }
  return {};
}

QVariant UnitTableModel::headerData(int section, Qt::Orientation orientation, int role) const {
  if (orientation != Qt::Horizontal) return {};
  if (role == Qt::DisplayRole) {
    switch (section) {
      case kId:
        return tr("Unit");
      case kPoints:
        return tr("Points");
      case kR10:
        return tr("R10");
      case kR10Interval:
        return tr("R10 95 %");
      case kGamma:
        return tr("gamma");
      case kGammaInterval:
        return tr("gamma 95 %");
      case kRms:
        return tr("RMS ln");
      case kModel:
        return tr("Model");
      case kDarkConductance:
        return tr("G dark");
      case kTempCoeff:
        return tr("TC");
      case kStatus:
        return tr("Fit");
      case kFlags:
        return tr("Flags");
      case kVerdict:
        return tr("Verdict");
      default:
        return {};
    }
  }
  if (role == Qt::ToolTipRole) {
    switch (section) {
      case kR10:
        return tr("Resistance at 10 lx (25 °C when temperature is handled)");
      case kR10Interval:
        return tr("95 % confidence interval of R10");
      case kGamma:
        return tr("Slope of the log-log curve: R falls by 10^gamma per decade of light");
      case kGammaInterval:
        return tr("95 % confidence interval of gamma");
      case kRms:
        return tr("Root mean square of the fit residuals in ln R (0.01 ≈ 1 %)");
      case kModel:
        return tr(
            "The curve fitted: the power law, or the power law with a dark conductance in "
            "parallel (chosen by AICc when both are tried)");
      case kDarkConductance:
        return tr("The dark conductance in parallel with the photoconductance, where fitted");
      case kTempCoeff:
        return tr(
            "The unit's own temperature coefficient of resistance at 10 lx, where its "
            "readings span enough temperature to fit it");
      case kVerdict:
        return verdictsAvailable() ? tr("Verdict against the spec")
                                   : tr("Verdicts are not available yet: load a spec");
      default:
        return {};
    }
  }
  return {};
}

UnitFilterModel::UnitFilterModel(QObject* parent) : QSortFilterProxyModel(parent) {
  setSortRole(UnitTableModel::kSortRole);
  setDynamicSortFilter(false);  // a 10,000-unit reset sorts once, not on every change
}

void UnitFilterModel::setStatusFilter(StatusFilter filter) {
  status_ = filter;
  invalidateFilter();
}

void UnitFilterModel::setVerdictFilter(VerdictFilter filter) {
  verdict_ = filter;
  invalidateFilter();
}

void UnitFilterModel::setText(const QString& text) {
  text_ = text.trimmed();
  invalidateFilter();
}

bool UnitFilterModel::filterAcceptsRow(int source_row, const QModelIndex& source_parent) const {
  // Nothing to filter on: every row, without building a row's cells (a 10,000-row reset).
  if (status_ == StatusFilter::all && verdict_ == VerdictFilter::all && text_.isEmpty()) {
    return true;
  }
  const auto* model = sourceModel();
  const QModelIndex id = model->index(source_row, UnitTableModel::kId, source_parent);
  const bool fitted = id.data(UnitTableModel::kFittedRole).toBool();
  const auto* units = qobject_cast<const UnitTableModel*>(model);
  switch (status_) {
    case StatusFilter::all:
      break;
    case StatusFilter::fitted:
      if (!fitted) return false;
      break;
    case StatusFilter::not_fitted:
      if (fitted) return false;
      break;
    case StatusFilter::flagged:
      if (units ? !units->hasFlags(source_row)
                : model->index(source_row, UnitTableModel::kFlags, source_parent)
                      .data()
                      .toString()
                      .isEmpty()) {
        return false;
      }
      break;
  }
  const auto verdict = static_cast<UnitVerdictKind>(id.data(UnitTableModel::kVerdictRole).toInt());
  switch (verdict_) {
    case VerdictFilter::all:
      break;
    case VerdictFilter::conforming:
      if (verdict != UnitVerdictKind::conforming) return false;
      break;
    case VerdictFilter::nonconforming:
      if (verdict != UnitVerdictKind::nonconforming) return false;
      break;
    case VerdictFilter::unknown:
      if (verdict != UnitVerdictKind::unknown) return false;
      break;
  }
  if (!text_.isEmpty()) {
    const QString flags =
        model->index(source_row, UnitTableModel::kFlags, source_parent).data().toString();
    return id.data().toString().contains(text_, Qt::CaseInsensitive) ||
           flags.contains(text_, Qt::CaseInsensitive);
  }
  return true;
}

bool UnitFilterModel::lessThan(const QModelIndex& left, const QModelIndex& right) const {
  if (const auto* units = qobject_cast<const UnitTableModel*>(sourceModel());
      units && units->lot()) {
    return units->rowLess(left.row(), right.row(), left.column(),
                          sortOrder() == Qt::AscendingOrder);
  }
  const QVariant a = left.data(sortRole());
  const QVariant b = right.data(sortRole());
  if (a.typeId() == QMetaType::Double || b.typeId() == QMetaType::Double) {
    const double x = a.toDouble(), y = b.toDouble();
    // NaN (not fitted) goes to the end whichever way the column is sorted.
    const bool ascending = sortOrder() == Qt::AscendingOrder;
    if (std::isnan(x) || std::isnan(y)) {
      if (std::isnan(x) && std::isnan(y)) return left.row() < right.row();
      return ascending ? std::isnan(y) : std::isnan(x);
    }
    return x < y;
  }
  if (a.typeId() == QMetaType::QString) {
    return QString::compare(a.toString(), b.toString(), Qt::CaseInsensitive) < 0;
  }
  return a.toLongLong() < b.toLongLong();
}

}  // namespace photolot::workbench
