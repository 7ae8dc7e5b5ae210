// photolot: the desktop workbench. `photolot [FILE...]` opens logs or a workspace.
#include <QApplication>
#include <QCommandLineParser>
#include <QIcon>
#include <QTimer>

#include <QDir>
#include <QScreen>

#include "import_dialog.h"
#include "main_window.h"
#include "session.h"

namespace {

// --snapshot DIR: once the lot is fitted, saves a picture of each view and of the import
// dialog into DIR and quits (scripts/screenshots.sh, for docs/images/).
void snapshot_when_idle(photolot::workbench::MainWindow* window, const QString& dir) {
  auto* session = window->session();
  if (session->busy() || !session->lotFit()) {
    QTimer::singleShot(200, window, [window, dir] { snapshot_when_idle(window, dir); });
    return;
  }
  QDir().mkpath(dir);
  static const char* kNames[] = {"curves", "spread", "acceptance", "pairs", "import-log"};
  const std::vector<int> first = {0, 1, 2};
  window->selectUnits(first);
  for (int i = 0; i < window->tabs()->count() && i < 5; ++i) {
    window->tabs()->setCurrentIndex(i);
    if (i == 3) {
      window->findPairs();
      while (session->busy()) QCoreApplication::processEvents(QEventLoop::AllEvents, 50);
    }
    for (int k = 0; k < 10; ++k) QCoreApplication::processEvents(QEventLoop::AllEvents, 20);
    window->grab().save(QStringLiteral("%1/workbench-%2.png").arg(dir, QString::fromLatin1(kNames[i])));
  }
  photolot::workbench::ImportDialog dialog(session->sources(), session->importOptions(), window);
  dialog.show();
  for (int k = 0; k < 40; ++k) QCoreApplication::processEvents(QEventLoop::AllEvents, 20);
  dialog.grab().save(QStringLiteral("%1/workbench-import-dialog.png").arg(dir));
  QCoreApplication::exit(0);
}

}  // namespace

int main(int argc, char** argv) {
  QApplication app(argc, argv);
  QApplication::setOrganizationName(QStringLiteral("photolot"));
  QApplication::setApplicationName(QStringLiteral("photolot"));
  QApplication::setApplicationVersion(QStringLiteral(PHOTOLOT_VERSION));
  QApplication::setWindowIcon(QIcon(QStringLiteral(":/photolot/icons/photolot.svg")));

  QCommandLineParser parser;
  parser.setApplicationDescription(
      QStringLiteral("Photoresistor lot workbench: import bench logs, fit, inspect."));
  parser.addHelpOption();
  parser.addVersionOption();
  parser.addPositionalArgument(QStringLiteral("files"),
                               QStringLiteral("Bench logs (CSV) or a workspace (*.photolot)."),
                               QStringLiteral("[FILE...]"));
  QCommandLineOption spec_option(QStringLiteral("spec"),
                                 QStringLiteral("Judge the lot against this spec (TOML)."),
                                 QStringLiteral("FILE"));
  QCommandLineOption snapshot_option(
      QStringLiteral("snapshot"),
      QStringLiteral("Save a picture of each view into DIR once fitted, then quit."),
      QStringLiteral("DIR"));
  parser.addOption(spec_option);
  parser.addOption(snapshot_option);
  parser.process(app);

  photolot::workbench::MainWindow window;
  window.show();
  const QStringList files = parser.positionalArguments();
  const QString spec = parser.value(spec_option);
  const bool snapshot = parser.isSet(snapshot_option);
  QTimer::singleShot(0, &window, [&window, files, spec, snapshot] {
    // Work a run that did not end cleanly left behind is offered first (autosave.h).
    if (!snapshot) window.offerRecovery();
    if (!files.isEmpty()) window.openPaths(files);
    if (!spec.isEmpty()) window.openSpecFile(spec);
  });
  if (parser.isSet(snapshot_option)) {
    window.resize(1440, 900);
    const QString dir = parser.value(snapshot_option);
    QTimer::singleShot(500, &window, [&window, dir] { snapshot_when_idle(&window, dir); });
  }
  return app.exec();
}
