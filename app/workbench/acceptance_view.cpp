#include "acceptance_view.h"

#include <fmt/format.h>

#include <QComboBox>
#include <QFormLayout>
#include <QGroupBox>
#include <QHBoxLayout>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QPushButton>
#include <QScrollArea>
#include <QVBoxLayout>
#include <charconv>
#include <cmath>

#include "display_format.h"
#include "photolot/units.h"

namespace photolot::workbench {
namespace {

QString text_of(double v, bool ohm) {
  if (std::isnan(v)) return {};
  if (ohm) return QString::fromStdString(fmt::format("{}", v));
  return QString::fromStdString(fmt::format("{}", v));
}

// Empty text is "no limit" (NaN); anything else must parse, or the field is named.
bool read_value(const QLineEdit* edit, bool ohm, double& out, const QString& field,
                QString* problem) {
  const std::string text = edit->text().trimmed().toStdString();
  if (text.empty()) {
    out = kNaN;
    return true;
  }
  const auto value = ohm ? parse_resistance(text, '.') : parse_number(text, '.', false);
  if (!value) {
    if (problem)
      *problem =
          QObject::tr("%1: \"%2\" is not a %3")
              .arg(field, edit->text(), ohm ? QObject::tr("resistance") : QObject::tr("number"));
    return false;
  }
  out = *value;
  return true;
}

QLineEdit* edit(QWidget* parent, const QString& placeholder) {
  auto* e = new QLineEdit(parent);
  e->setPlaceholderText(placeholder);
  return e;
}

}  // namespace

bool AcceptanceView::summaryAvailable() {
#if defined(PHOTOLOT_HAVE_REPORT)
  return true;
#else
  return false;
#endif
}

AcceptanceView::AcceptanceView(QWidget* parent) : QWidget(parent) {
  setObjectName(QStringLiteral("acceptanceView"));
  part_ = edit(this, tr("required, e.g. the part number ordered"));
  description_ = edit(this, tr("optional"));
  r10_min_ = edit(this, tr("no limit (e.g. 15k)"));
  r10_max_ = edit(this, tr("no limit (e.g. 27k)"));
  gamma_min_ = edit(this, tr("no limit (e.g. 0.66)"));
  gamma_max_ = edit(this, tr("no limit (e.g. 0.84)"));
  dark_min_ = edit(this, tr("no limit (e.g. 1M)"));
  rms_max_ = edit(this, tr("no limit (e.g. 0.05 ≈ 5 %)"));
  mode_ = new QComboBox(this);
  mode_->addItem(tr("sampling (ISO 2859-1)"), static_cast<int>(InspectionMode::sampling));
  mode_->addItem(tr("100 % (every unit)"), static_cast<int>(InspectionMode::full));
  level_ = new QComboBox(this);
  level_->addItem(QStringLiteral("I"), static_cast<int>(InspectionLevel::level_i));
  level_->addItem(QStringLiteral("II"), static_cast<int>(InspectionLevel::level_ii));
  level_->addItem(QStringLiteral("III"), static_cast<int>(InspectionLevel::level_iii));
  level_->setCurrentIndex(1);
  aql_ = new QComboBox(this);
  for (double a : tabulated_aqls())
    aql_->addItem(QString::fromStdString(fmt::format("{} %", a)), a);
  aql_->setCurrentIndex(std::max(0, aql_->findData(1.0)));
  lot_size_ = edit(this, tr("units in the lot (needed for a sampling plan)"));
  coverage_ = edit(this, QStringLiteral("0.99"));
  confidence_ = edit(this, QStringLiteral("0.95"));
  spec_source_ = new QLabel(tr("No spec loaded."), this);
  spec_source_->setWordWrap(true);

  auto* form = new QFormLayout;
  form->addRow(tr("Part"), part_);
  form->addRow(tr("Description"), description_);
  form->addRow(tr("R10 min (Ω)"), r10_min_);
  form->addRow(tr("R10 max (Ω)"), r10_max_);
  form->addRow(tr("gamma min"), gamma_min_);
  form->addRow(tr("gamma max"), gamma_max_);
  form->addRow(tr("Dark min (Ω)"), dark_min_);
  form->addRow(tr("Max RMS ln R"), rms_max_);
  temp_coeff_ = new QLineEdit(this);
  temp_coeff_->setObjectName(QStringLiteral("specTempCoeff"));
  temp_coeff_->setPlaceholderText(tr("none"));
  temp_coeff_->setToolTip(
      tr("Temperature coefficient of resistance at 10 lx, applied where the "
         "readings do not span enough temperature to fit one"));
  form->addRow(tr("Temp. coeff. (%/°C)"), temp_coeff_);
  form->addRow(tr("Inspection"), mode_);
  form->addRow(tr("Level"), level_);
  form->addRow(tr("AQL"), aql_);
  form->addRow(tr("Lot size"), lot_size_);
  form->addRow(tr("TI coverage"), coverage_);
  form->addRow(tr("TI confidence"), confidence_);
  auto* open = new QPushButton(tr("Open Spec…"), this);
  auto* apply = new QPushButton(tr("Apply"), this);
  apply->setObjectName(QStringLiteral("applySpecButton"));
  apply->setDefault(true);
  auto* save = new QPushButton(tr("Save Spec…"), this);
  auto* clear = new QPushButton(tr("Clear"), this);
  auto* buttons = new QHBoxLayout;
  buttons->addWidget(open);
  buttons->addWidget(apply);
  buttons->addWidget(save);
  buttons->addWidget(clear);
  auto* spec_box = new QGroupBox(tr("Purchase spec"), this);
  auto* spec_layout = new QVBoxLayout(spec_box);
  spec_layout->addWidget(spec_source_);
  spec_layout->addLayout(form);
  spec_layout->addLayout(buttons);
  spec_layout->addStretch(1);

  disposition_ = new QLabel(this);
  disposition_->setObjectName(QStringLiteral("dispositionLabel"));
  QFont big = disposition_->font();
  big.setPointSizeF(big.pointSizeF() * 1.6);
  big.setBold(true);
  disposition_->setFont(big);
  disposition_->setWordWrap(true);
  plan_ = new QLabel(this);
  plan_->setWordWrap(true);
  counts_ = new QLabel(this);
  counts_->setWordWrap(true);
  statistics_ = new QLabel(this);
  statistics_->setWordWrap(true);
  statistics_->setTextFormat(Qt::RichText);
  rejected_ = new QListWidget(this);
  rejected_->setObjectName(QStringLiteral("rejectedUnits"));
  summary_button_ = new QPushButton(tr("Print or Save Lot Summary…"), this);
  summary_button_->setObjectName(QStringLiteral("summaryButton"));
  summary_button_->setEnabled(false);
  if (!summaryAvailable()) {
    summary_button_->setToolTip(tr("The printed lot summary is not available in this build yet."));
  }

  auto* result_box = new QGroupBox(tr("Lot disposition"), this);
  auto* result_layout = new QVBoxLayout(result_box);
  result_layout->addWidget(disposition_);
  result_layout->addWidget(counts_);
  result_layout->addWidget(plan_);
  result_layout->addWidget(statistics_);
  fit_handling_ = new QLabel(this);
  fit_handling_->setObjectName(QStringLiteral("fitHandling"));
  fit_handling_->setWordWrap(true);
  fit_handling_->setTextFormat(Qt::RichText);
  result_layout->addWidget(fit_handling_);
  result_layout->addWidget(new QLabel(tr("Nonconforming units (double-click to select):"), this));
  result_layout->addWidget(rejected_, 1);
  result_layout->addWidget(summary_button_, 0, Qt::AlignLeft);
  auto* note = new QLabel(tr("The disposition is photolot's recommendation from the spec and the "
                             "sampling plan; the decision and the signature are the inspector's."),
                          this);
  note->setWordWrap(true);
  note->setStyleSheet(QStringLiteral("color: palette(mid);"));
  result_layout->addWidget(note);

  auto* layout = new QHBoxLayout(this);
  layout->addWidget(spec_box, 2);
  layout->addWidget(result_box, 3);

  connect(open, &QPushButton::clicked, this, &AcceptanceView::openSpecRequested);
  connect(save, &QPushButton::clicked, this, &AcceptanceView::saveSpecRequested);
  connect(summary_button_, &QPushButton::clicked, this, &AcceptanceView::summaryRequested);
  connect(clear, &QPushButton::clicked, this, [this] {
    showSpec(std::nullopt);
    emit specApplied(std::nullopt);
  });
  connect(apply, &QPushButton::clicked, this, [this] {
    QString problem;
    auto spec = specFromForm(&problem);
    if (!spec) {
      spec_source_->setText(tr("<b>Not applied:</b> %1").arg(problem.toHtmlEscaped()));
      return;
    }
    emit specApplied(spec);
  });
  connect(rejected_, &QListWidget::itemDoubleClicked, this, [this](QListWidgetItem* item) {
    emit unitActivated(item->data(Qt::UserRole).toString());
  });
  setAnalysis(nullptr, 0, false);
}

void AcceptanceView::showSpec(const std::optional<Spec>& spec) {
  const Spec s = spec.value_or(Spec{});
  part_->setText(QString::fromStdString(s.part_number));
  description_->setText(QString::fromStdString(s.description));
  r10_min_->setText(text_of(s.r10_ohm.min, true));
  r10_max_->setText(text_of(s.r10_ohm.max, true));
  gamma_min_->setText(text_of(s.gamma.min, false));
  gamma_max_->setText(text_of(s.gamma.max, false));
  dark_min_->setText(text_of(s.dark_min_ohm, true));
  rms_max_->setText(text_of(s.max_rms_log_residual, false));
  temp_coeff_->setText(text_of(s.temp_coeff_pct_per_c, false));
  mode_->setCurrentIndex(mode_->findData(static_cast<int>(s.inspection.mode)));
  level_->setCurrentIndex(level_->findData(static_cast<int>(s.inspection.level)));
  const int aql = aql_->findData(s.inspection.aql_pct);
  if (aql >= 0) aql_->setCurrentIndex(aql);
  lot_size_->setText(s.inspection.lot_size ? QString::number(*s.inspection.lot_size) : QString());
  coverage_->setText(QString::fromStdString(fmt::format("{}", s.tolerance_coverage)));
  confidence_->setText(QString::fromStdString(fmt::format("{}", s.tolerance_confidence)));
  if (!spec) {
    spec_source_->setText(tr("No spec loaded: open a spec file or fill in the form and Apply."));
  } else {
    spec_source_->setText(s.source_file.empty()
                              ? tr("Spec from the form.")
                              : tr("Spec from %1.").arg(QString::fromStdString(s.source_file)));
  }
}

std::optional<Spec> AcceptanceView::specFromForm(QString* problem) const {
  Spec s;
  s.part_number = part_->text().trimmed().toStdString();
  s.description = description_->text().trimmed().toStdString();
  if (!read_value(r10_min_, true, s.r10_ohm.min, tr("R10 min"), problem) ||
      !read_value(r10_max_, true, s.r10_ohm.max, tr("R10 max"), problem) ||
      !read_value(gamma_min_, false, s.gamma.min, tr("gamma min"), problem) ||
      !read_value(gamma_max_, false, s.gamma.max, tr("gamma max"), problem) ||
      !read_value(dark_min_, true, s.dark_min_ohm, tr("Dark min"), problem) ||
      !read_value(rms_max_, false, s.max_rms_log_residual, tr("Max RMS"), problem) ||
      !read_value(temp_coeff_, false, s.temp_coeff_pct_per_c, tr("Temp. coeff."), problem)) {
    return std::nullopt;
  }
  s.inspection.mode = static_cast<InspectionMode>(mode_->currentData().toInt());
  s.inspection.level = static_cast<InspectionLevel>(level_->currentData().toInt());
  s.inspection.aql_pct = aql_->currentData().toDouble();
  const std::string lot = lot_size_->text().trimmed().toStdString();
  if (!lot.empty()) {
    std::size_t n = 0;
    auto [ptr, ec] = std::from_chars(lot.data(), lot.data() + lot.size(), n);
    if (ec != std::errc() || ptr != lot.data() + lot.size() || n == 0) {
      if (problem)
        *problem = tr("Lot size: \"%1\" is not a whole number of units").arg(lot_size_->text());
      return std::nullopt;
    }
    s.inspection.lot_size = n;
  }
  double coverage = 0.99, confidence = 0.95;
  if (!read_value(coverage_, false, coverage, tr("TI coverage"), problem) ||
      !read_value(confidence_, false, confidence, tr("TI confidence"), problem)) {
    return std::nullopt;
  }
  if (!std::isnan(coverage)) s.tolerance_coverage = coverage;
  if (!std::isnan(confidence)) s.tolerance_confidence = confidence;
  if (const std::string why = s.validate(); !why.empty()) {
    if (problem) *problem = QString::fromStdString(why);
    return std::nullopt;
  }
  return s;
}

void AcceptanceView::setLotLoaded(bool loaded) {
  lot_loaded_ = loaded;
  summary_button_->setEnabled(loaded && summaryAvailable());
}

void AcceptanceView::setFitHandling(const QString& html) { fit_handling_->setText(html); }

void AcceptanceView::setAnalysis(std::shared_ptr<const LotAnalysis> analysis,
                                 std::size_t units_in_lot, bool spec_loaded) {
  rejected_->clear();
  if (!analysis) {
    disposition_->setText(tr("No disposition yet"));
    counts_->setText(lot_loaded_ ? tr("Waiting for the fit.") : tr("Open a lot to judge it."));
    plan_->clear();
    statistics_->clear();
    return;
  }
  const LotStatistics& st = analysis->statistics;
  QStringList lines;
  const auto& r = st.ln_r10;
  if (r.n > 0) {
    lines << tr("<b>R10</b>: geometric mean %1, spread ×%2 (1 sd), range %3 – %4")
                 .arg(format_ohm(std::exp(r.mean)), format_number(std::exp(r.sd), 3),
                      format_ohm(std::exp(r.min)), format_ohm(std::exp(r.max)));
    if (std::isfinite(r.tolerance_interval[0])) {
      lines << tr("&nbsp;&nbsp;tolerance interval (%1 % of units, %2 % confidence): %3 – %4")
                   .arg(format_number(100 * st.coverage, 3), format_number(100 * st.confidence, 3),
                        format_ohm(std::exp(r.tolerance_interval[0])),
                        format_ohm(std::exp(r.tolerance_interval[1])));
    }
  }
  const auto& g = st.gamma;
  if (g.n > 0) {
    lines << tr("<b>gamma</b>: mean %1, sd %2, range %3 – %4")
                 .arg(format_number(g.mean, 3), format_number(g.sd, 2), format_number(g.min, 3),
                      format_number(g.max, 3));
    if (std::isfinite(g.tolerance_interval[0])) {
      lines << tr("&nbsp;&nbsp;tolerance interval: %1 – %2")
                   .arg(format_number(g.tolerance_interval[0], 3),
                        format_number(g.tolerance_interval[1], 3));
    }
  }
  auto capability = [&](const char* name, const std::optional<Capability>& c) {
    if (!c) return;
    lines << tr("<b>%1</b> Ppk %2, Cpk %3, expected outside %4 ppm")
                 .arg(QString::fromLatin1(name), format_number(c->ppk, 3), format_number(c->cpk, 3),
                      format_number(c->ppm_total, 3));
  };
  capability("R10", st.r10_capability);
  capability("gamma", st.gamma_capability);
  statistics_->setText(lines.join(QStringLiteral("<br>")));

  if (!spec_loaded || !analysis->acceptance || !analysis->verdicts) {
    disposition_->setText(tr("No spec: no disposition"));
    counts_->setText(tr("%1 of %2 units fitted. Load a spec to judge them.")
                         .arg(st.units_fitted)
                         .arg(units_in_lot));
    plan_->clear();
    return;
  }
  const Acceptance& a = *analysis->acceptance;
  std::size_t conforming = 0, nonconforming = 0;
  for (const auto& v : *analysis->verdicts)
    (v.verdict == Verdict::conforming ? conforming : nonconforming)++;
  const QString word = a.disposition == Disposition::accept   ? tr("ACCEPT")
                       : a.disposition == Disposition::reject ? tr("REJECT")
                                                              : tr("UNDECIDED");
  disposition_->setText(tr("Recommended: %1").arg(word));
  const QColor colour = a.disposition == Disposition::accept   ? QColor(0x00, 0x6d, 0x4f)
                        : a.disposition == Disposition::reject ? QColor(0xa3, 0x2a, 0x1e)
                                                               : QColor(0x5a, 0x5a, 0x5a);
  disposition_->setStyleSheet(QStringLiteral("color: %1;").arg(colour.name()));
  disposition_->setToolTip(QString::fromStdString(a.rule));
  counts_->setText(tr("%1 conforming, %2 nonconforming of %3 judged. %4")
                       .arg(conforming)
                       .arg(nonconforming)
                       .arg(a.measured)
                       .arg(QString::fromStdString(a.reason)));
  if (a.plan) {
    plan_->setText(tr("<b>Plan</b>: %1<br><b>Rule</b>: %2")
                       .arg(QString::fromStdString(a.plan->description).toHtmlEscaped(),
                            QString::fromStdString(a.rule).toHtmlEscaped()));
  } else {
    plan_->setText(tr("<b>Rule</b>: %1").arg(QString::fromStdString(a.rule).toHtmlEscaped()));
  }
  constexpr int kListed = 2000;
  int listed = 0;
  for (const auto& v : *analysis->verdicts) {
    if (v.verdict != Verdict::nonconforming) continue;
    if (++listed > kListed) break;
    QStringList reasons;
    for (const auto& reason : v.reasons) reasons << QString::fromStdString(reason.text);
    auto* item = new QListWidgetItem(QStringLiteral("%1 — %2").arg(
        QString::fromStdString(v.id), reasons.join(QStringLiteral("; "))));
    item->setData(Qt::UserRole, QString::fromStdString(v.id));
    rejected_->addItem(item);
  }
}

}  // namespace photolot::workbench
