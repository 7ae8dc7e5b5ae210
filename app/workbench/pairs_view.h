// The pairs view: the pairing options (working range, tolerance, tracking mode), the matched
// pairs with their ratio error, the units left without a partner and why, and for the chosen
// pair its two curves and their ratio error across the range.
#pragma once

#include <QAbstractTableModel>
#include <QWidget>
#include <memory>

#include "session.h"

class QCheckBox;
class QComboBox;
class QCustomPlot;
class QDoubleSpinBox;
class QLabel;
class QListWidget;
class QPushButton;
class QTableView;

namespace photolot::workbench {

class PairTableModel : public QAbstractTableModel {
  Q_OBJECT
 public:
  using QAbstractTableModel::QAbstractTableModel;
  void setPairing(std::shared_ptr<const Pairing> pairing);
  const Pairing* pairing() const { return pairing_.get(); }
  int rowCount(const QModelIndex& parent = {}) const override;
  int columnCount(const QModelIndex& parent = {}) const override;
  QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation orientation, int role) const override;

 private:
  std::shared_ptr<const Pairing> pairing_;
};

class PairsView : public QWidget {
  Q_OBJECT
 public:
  explicit PairsView(QWidget* parent = nullptr);
  void setFit(std::shared_ptr<const LotFit> fit);
  // `among` says which units the pairing took part from (shown with its counts).
  void setPairing(std::shared_ptr<const Pairing> pairing, bool stale,
                  PairEligibility among = PairEligibility::fitted);
  // With a spec loaded, pairing takes the conforming units unless the box to include every
  // fitted unit is ticked; without one the box is disabled (every fitted unit takes part).
  void setSpecLoaded(bool loaded);
  bool includeAllFitted() const;
  QCheckBox* allFittedBox() const { return all_fitted_; }
  void setOptions(const PairOptions& options);
  PairOptions options() const;

  PairTableModel* model() const { return model_; }
  QCustomPlot* plot() const { return plot_; }
  QPushButton* findButton() const { return find_; }
  void showPair(int row);

 signals:
  void findRequested(photolot::PairOptions options);
  void pairActivated(std::size_t a, std::size_t b);
  void exportRequested();
  void includeAllFittedChanged(bool all);

 private:
  std::shared_ptr<const LotFit> fit_;
  PairTableModel* model_ = nullptr;
  QTableView* table_ = nullptr;
  QListWidget* unpaired_ = nullptr;
  QLabel* status_ = nullptr;
  QCustomPlot* plot_ = nullptr;
  QDoubleSpinBox* lux_lo_ = nullptr;
  QDoubleSpinBox* lux_hi_ = nullptr;
  QDoubleSpinBox* tolerance_ = nullptr;
  QComboBox* mode_ = nullptr;
  QCheckBox* all_fitted_ = nullptr;
  QPushButton* find_ = nullptr;
  QPushButton* export_ = nullptr;
};

}  // namespace photolot::workbench
