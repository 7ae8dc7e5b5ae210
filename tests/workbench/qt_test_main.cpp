// main() of the workbench tests: a QApplication for the widgets (offscreen under ctest), and
// settings kept in a scratch folder so tests never read or change the user's.
#include <QApplication>
#include <QSettings>

#include <gtest/gtest.h>

#include <string>

#include "workbench_fixtures.h"

int main(int argc, char** argv) {
  // Test discovery runs this program without ctest's environment: never ask for a display.
  if (!qEnvironmentVariableIsSet("QT_QPA_PLATFORM")) qputenv("QT_QPA_PLATFORM", "offscreen");
  // Recovery copies (autosave.h) go to a scratch folder, never the user's app-data folder.
  // One folder per test process: the scratch root is shared by every run on the machine.
  const auto recovery = photolot::workbench::test::scratch_root() /
                        ("recovery-" + std::to_string(QCoreApplication::applicationPid()));
  qputenv("PHOTOLOT_RECOVERY_DIR", QByteArray::fromStdString(recovery.string()));
  QApplication app(argc, argv);
  QApplication::setOrganizationName(QStringLiteral("photolot-tests"));
  QApplication::setApplicationName(QStringLiteral("photolot-tests"));
  QSettings::setDefaultFormat(QSettings::IniFormat);
  const auto settings = photolot::workbench::test::scratch_root() / "settings";
  QSettings::setPath(QSettings::IniFormat, QSettings::UserScope,
                     QString::fromStdString(settings.string()));
  QSettings().clear();
  ::testing::InitGoogleTest(&argc, argv);
  return RUN_ALL_TESTS();
}
