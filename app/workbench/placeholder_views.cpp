#include "placeholder_views.h"

#include <QLabel>
#include <QPushButton>
#include <QVBoxLayout>

namespace photolot::workbench {
namespace {

QLabel* notice(QWidget* parent, const QString& html) {
  auto* label = new QLabel(html, parent);
  label->setWordWrap(true);
  label->setTextFormat(Qt::RichText);
  label->setAlignment(Qt::AlignTop | Qt::AlignLeft);
  label->setMargin(16);
  label->setMaximumWidth(720);
  return label;
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
  auto* layout = new QVBoxLayout(this);
  text_ = notice(
      this,
      tr("<h3>Acceptance</h3>"
         "<p><b>Not available yet.</b> This view will hold the purchase spec (open it, edit it "
         "in a form, save it), the count of conforming and nonconforming units, the ISO 2859-1 "
         "sampling plan for the lot size and AQL, and the lot's disposition. The steps that "
         "judge units against a spec and choose the plan are not part of this build yet.</p>"
         "<p>Until then the unit table's <i>Verdict</i> column stays empty, and the curves and "
         "spread views draw no spec window.</p>"));
  summary_button_ = new QPushButton(tr("Print or save the lot summary…"), this);
  summary_button_->setObjectName(QStringLiteral("summaryButton"));
  summary_button_->setEnabled(false);
  if (!summaryAvailable()) {
    summary_button_->setToolTip(tr("The printed lot summary is not available in this build yet."));
  }
  connect(summary_button_, &QPushButton::clicked, this, &AcceptanceView::summaryRequested);
  layout->addWidget(text_);
  layout->addWidget(summary_button_, 0, Qt::AlignLeft);
  layout->addStretch(1);
  layout->setContentsMargins(8, 8, 8, 8);
}

void AcceptanceView::setLotLoaded(bool loaded) {
  summary_button_->setEnabled(loaded && summaryAvailable());
}

PairsView::PairsView(QWidget* parent) : QWidget(parent) {
  setObjectName(QStringLiteral("pairsView"));
  auto* layout = new QVBoxLayout(this);
  layout->addWidget(notice(
      this,
      tr("<h3>Pairs</h3>"
         "<p><b>Not available yet.</b> This view will list matched pairs of units whose "
         "log-log curves track each other, with each pair's ratio error over the illuminance "
         "range, the two curves of the chosen pair on one plot, and the units left without a "
         "partner and why. The pairing step is not part of this build yet.</p>"
         "<p>Meanwhile you can compare candidates by selecting two units in the table: the "
         "curves view plots them together.</p>")));
  layout->addStretch(1);
}

}  // namespace photolot::workbench
