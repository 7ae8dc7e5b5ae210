// Colours and marker shapes shared by the plots. The palette is the Okabe-Ito set, chosen to
// stay apart for the common colour-vision deficiencies; every kind of point also has its own
// shape, so a plot reads in black and white.
#pragma once

#include <QColor>
#include <QString>

#include <qcustomplot.h>

namespace photolot::workbench {

QColor unit_colour(int i);
inline const QColor kAggregateColour(0x33, 0x5c, 0x8a);
inline const QColor kOutlierColour(0xd5, 0x5e, 0x00);   // vermillion
inline const QColor kCensoredColour(0x6a, 0x3d, 0x9a);
inline const QColor kSpecColour(0x00, 0x9e, 0x73);      // bluish green
inline const QColor kLimitColour(0xcc, 0x79, 0xa7);     // reddish purple

// Readings: filled disc; outliers: cross; over range (a lower bound): open triangle pointing up.
QCPScatterStyle reading_style(const QColor& colour, double size = 6);
QCPScatterStyle outlier_style(double size = 9);
QCPScatterStyle censored_style(double size = 9);

// Writes the plot to path as PNG, SVG or PDF by its suffix; returns an error text or empty.
QString export_plot(QCustomPlot* plot, const QString& path, int width_px = 0, int height_px = 0);

}  // namespace photolot::workbench
