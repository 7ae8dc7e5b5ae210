// The summary's plots, drawn by QCustomPlot into a rectangle of the page. Everything reads in
// black and white: conforming and nonconforming units differ by line style and marker, limits
// are dashed lines, bins are grey with black outlines, grids are thin and light grey.
#pragma once

#include <QPainter>
#include <QRectF>

#include "content.h"

namespace photolot::report {

enum class PlotKind {
  curves,           // every unit's fitted curve, log-log, with the R10 window at 10 lx
  r10_histogram,    // bins equal in ln R10, with the R10 limits
  gamma_histogram,  // with the gamma limits
  r10_gamma,        // R10 against gamma, spec box and tolerance ellipse
  pair_errors,      // histogram of the pairs' tracking error
};

// Draws `kind` into `target` (device units of a painter whose device has `device_dpi`).
void draw_plot(QPainter& painter, const QRectF& target, double device_dpi, PlotKind kind,
               const Content& content);

// The one-line explanation printed under a plot (what each line and marker means).
std::string plot_caption(PlotKind kind, const Content& content);

}  // namespace photolot::report
