#include "plot_style.h"

#include <QFileInfo>
#include <QSaveFile>
#include <QSvgGenerator>
#include <QBuffer>

#include <filesystem>

namespace photolot::workbench {

QColor unit_colour(int i) {
  static const QColor kPalette[] = {QColor(0x00, 0x72, 0xb2), QColor(0xe6, 0x9f, 0x00),
                                    QColor(0x00, 0x9e, 0x73), QColor(0xcc, 0x79, 0xa7),
                                    QColor(0x56, 0xb4, 0xe9), QColor(0xd5, 0x5e, 0x00),
                                    QColor(0x00, 0x00, 0x00), QColor(0xf0, 0xe4, 0x42)};
  return kPalette[static_cast<unsigned>(i) % 8];
}

QCPScatterStyle reading_style(const QColor& colour, double size) {
  return QCPScatterStyle(QCPScatterStyle::ssDisc, colour, colour, size);
}

QCPScatterStyle outlier_style(double size) {
  QCPScatterStyle style(QCPScatterStyle::ssCross, size);
  style.setPen(QPen(kOutlierColour, 2));
  return style;
}

QCPScatterStyle censored_style(double size) {
  QCPScatterStyle style(QCPScatterStyle::ssTriangle, size);
  style.setPen(QPen(kCensoredColour, 1.6));
  style.setBrush(Qt::NoBrush);
  return style;
}

QString export_plot(QCustomPlot* plot, const QString& path, int width_px, int height_px) {
  const QString suffix = QFileInfo(path).suffix().toLower();
  const int w = width_px > 0 ? width_px : plot->width();
  const int h = height_px > 0 ? height_px : plot->height();
  // Render to memory, then write through QSaveFile so a failed export leaves no half file.
  QByteArray bytes;
  QBuffer buffer(&bytes);
  buffer.open(QIODevice::WriteOnly);
  if (suffix == QLatin1String("png")) {
    if (!plot->toPixmap(w, h, 2.0).save(&buffer, "PNG")) return QObject::tr("PNG encoding failed");
  } else if (suffix == QLatin1String("svg")) {
    QSvgGenerator svg;
    svg.setOutputDevice(&buffer);
    svg.setSize(QSize(w, h));
    svg.setViewBox(QRect(0, 0, w, h));
    svg.setTitle(QStringLiteral("photolot plot"));
    QCPPainter painter(&svg);
    plot->toPainter(&painter, w, h);
    painter.end();
  } else if (suffix == QLatin1String("pdf")) {
    buffer.close();
    // QCustomPlot writes PDF to a path: write it beside the target, then rename over it.
    const QString temp = path + QStringLiteral(".part");
    if (!plot->savePdf(temp, w, h)) return QObject::tr("cannot write '%1'").arg(temp);
    std::error_code error;
    std::filesystem::rename(temp.toStdString(), path.toStdString(), error);
    if (error) {
      QFile::remove(temp);
      return QObject::tr("cannot rename '%1' to '%2': %3")
          .arg(temp, path, QString::fromStdString(error.message()));
    }
    return {};
  } else {
    return QObject::tr("unknown format '%1': use .png, .svg or .pdf").arg(suffix);
  }
  buffer.close();
  QSaveFile file(path);
  if (!file.open(QIODevice::WriteOnly)) return file.errorString();
  file.write(bytes);
  if (!file.commit()) return file.errorString();
  return {};
}

}  // namespace photolot::workbench
