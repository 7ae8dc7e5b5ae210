// The acceptance and pairs views. Their steps (spec, statistics and acceptance; pairing) are
// built by other parts of photolot; until they are in this build, each view says plainly what
// it will show and that it is not available yet, and offers what already works.
#pragma once

#include <QWidget>

class QLabel;
class QPushButton;

namespace photolot::workbench {

class AcceptanceView : public QWidget {
  Q_OBJECT
 public:
  explicit AcceptanceView(QWidget* parent = nullptr);
  // Whether the summary can be printed in this build (the report step has landed).
  static bool summaryAvailable();
  QPushButton* summaryButton() const { return summary_button_; }
  void setLotLoaded(bool loaded);

 signals:
  void summaryRequested();

 private:
  QLabel* text_ = nullptr;
  QPushButton* summary_button_ = nullptr;
};

class PairsView : public QWidget {
  Q_OBJECT
 public:
  explicit PairsView(QWidget* parent = nullptr);
};

}  // namespace photolot::workbench
