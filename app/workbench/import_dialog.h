// The import dialog: previews the first rows of each log as the importer reads them, shows what
// was detected (delimiter, decimal mark, columns and their units), lets the user override any
// of it, lists the rows that could not be used with file and line, and saves the choices as a
// named profile. The trial import runs off the GUI thread.
#pragma once

#include <QDialog>
#include <QFutureWatcher>
#include <vector>

#include "engine.h"
#include "import_profiles.h"

class QComboBox;
class QLabel;
class QLineEdit;
class QTableWidget;
class QTreeWidget;

namespace photolot::workbench {

class ImportDialog : public QDialog {
  Q_OBJECT
 public:
  ImportDialog(std::vector<SourceFile> sources, const ImportOptions& options,
               QWidget* parent = nullptr);
  ~ImportDialog() override;

  ImportOptions options() const;
  void setOptions(const ImportOptions& options);
  const std::vector<SourceFile>& sources() const { return sources_; }

  // For tests and the status line: what the preview shows now.
  const FileLayout& layout() const { return layout_; }
  QTableWidget* previewTable() const { return preview_; }
  QTreeWidget* diagnosticsList() const { return diagnostics_; }
  QComboBox* delimiterBox() const { return delimiter_; }
  QComboBox* decimalBox() const { return decimal_; }
  QComboBox* luxColumnBox() const { return lux_column_; }
  QComboBox* ohmColumnBox() const { return ohm_column_; }
  QComboBox* ohmUnitBox() const { return ohm_unit_; }
  QComboBox* profileBox() const { return profile_; }
  QLabel* detectedLabel() const { return detected_; }
  QLabel* summaryLabel() const { return summary_; }
  // Saves the current choices as the named profile (what "Save as profile…" does once the
  // name is typed) and shows it as the chosen profile.
  void saveProfileAs(const QString& name);
  // Applies the named saved profile, as choosing it in the list does; false when there is none.
  bool chooseProfile(const QString& name);
  bool trialRunning() const { return watcher_.isRunning(); }

 signals:
  void trialFinished();

 private:
  void refresh();
  void fillColumnChoices();
  void startTrial();
  void showTrial();
  void saveProfile();
  void applyProfile(int index);

  std::vector<SourceFile> sources_;
  FileLayout layout_;
  bool updating_ = false;

  QComboBox* file_ = nullptr;
  QComboBox* profile_ = nullptr;
  QComboBox* delimiter_ = nullptr;
  QComboBox* decimal_ = nullptr;
  QComboBox* id_column_ = nullptr;
  QComboBox* lux_column_ = nullptr;
  QComboBox* ohm_column_ = nullptr;
  QComboBox* temp_column_ = nullptr;
  QComboBox* lux_unit_ = nullptr;
  QComboBox* ohm_unit_ = nullptr;
  QComboBox* temp_unit_ = nullptr;
  QLineEdit* overload_ = nullptr;
  QLineEdit* default_id_ = nullptr;
  QLabel* detected_ = nullptr;
  QLabel* summary_ = nullptr;
  QTableWidget* preview_ = nullptr;
  QTreeWidget* diagnostics_ = nullptr;
  QFutureWatcher<ImportResult> watcher_;
  bool trial_pending_ = false;
  ImportProfiles profiles_;
};

}  // namespace photolot::workbench
