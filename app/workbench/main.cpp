// photolot: the desktop workbench. `photolot [FILE...]` opens logs or a workspace.
#include <QApplication>
#include <QCommandLineParser>
#include <QIcon>
#include <QTimer>

#include "main_window.h"

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
  parser.process(app);

  photolot::workbench::MainWindow window;
  window.show();
  const QStringList files = parser.positionalArguments();
  if (!files.isEmpty()) {
    QTimer::singleShot(0, &window, [&window, files] { window.openPaths(files); });
  }
  return app.exec();
}
