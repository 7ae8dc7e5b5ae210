// The acceptance view: the purchase spec in a form (open a spec file, edit, apply, save), the
// verdict counts, the ISO 2859-1 sampling plan, the lot's disposition and its rule, the lot
// statistics against the limits, and the lot summary (print or save as PDF).
#pragma once

#include <QWidget>
#include <optional>

#include "session.h"

class QComboBox;
class QLabel;
class QLineEdit;
class QListWidget;
class QPushButton;

namespace photolot::workbench {

class AcceptanceView : public QWidget {
  Q_OBJECT
 public:
  explicit AcceptanceView(QWidget* parent = nullptr);

  // Whether the printed summary is part of this build (the report library has landed).
  static bool summaryAvailable();

  // Fills the form from a spec (or clears it) without applying it.
  void showSpec(const std::optional<Spec>& spec);
  // Builds a spec from the form; on a problem returns nullopt and sets `problem`.
  std::optional<Spec> specFromForm(QString* problem) const;
  void setAnalysis(std::shared_ptr<const LotAnalysis> analysis, std::size_t units_in_lot,
                   bool spec_loaded);
  void setLotLoaded(bool loaded);
  // How the lot was fitted: model, over-range readings, bench profile, temperature (HTML).
  void setFitHandling(const QString& html);
  QLabel* fitHandlingLabel() const { return fit_handling_; }

  QLabel* dispositionLabel() const { return disposition_; }
  QPushButton* summaryButton() const { return summary_button_; }

 signals:
  void specApplied(std::optional<photolot::Spec> spec);
  void openSpecRequested();
  void saveSpecRequested();
  void summaryRequested();
  void unitActivated(const QString& id);

 private:
  QLineEdit* part_ = nullptr;
  QLineEdit* description_ = nullptr;
  QLineEdit* r10_min_ = nullptr;
  QLineEdit* r10_max_ = nullptr;
  QLineEdit* gamma_min_ = nullptr;
  QLineEdit* gamma_max_ = nullptr;
  QLineEdit* dark_min_ = nullptr;
  QLineEdit* rms_max_ = nullptr;
  QLineEdit* temp_coeff_ = nullptr;
  QComboBox* mode_ = nullptr;
  QComboBox* level_ = nullptr;
  QComboBox* aql_ = nullptr;
  QLineEdit* lot_size_ = nullptr;
  QLineEdit* coverage_ = nullptr;
  QLineEdit* confidence_ = nullptr;
  QLabel* spec_source_ = nullptr;

  QLabel* disposition_ = nullptr;
  QLabel* plan_ = nullptr;
  QLabel* counts_ = nullptr;
  QLabel* statistics_ = nullptr;
  QLabel* fit_handling_ = nullptr;
  QListWidget* rejected_ = nullptr;
  QPushButton* summary_button_ = nullptr;
  bool lot_loaded_ = false;
};

}  // namespace photolot::workbench
