#include "help_text.h"

#include <QObject>

namespace photolot::workbench {

QString cautions_html() {
  return QObject::tr(
      "<h3>Cautions</h3>"
      "<p><b>Cadmium.</b> CdS photoresistors contain cadmium (cadmium sulfide is about 78 % "
      "cadmium by mass). Cadmium is restricted in electrical equipment under the EU RoHS "
      "Directive 2011/65/EU unless an exemption applies: check the current status before "
      "stating that parts or products comply. Cadmium sulfide may cause cancer and damages the "
      "kidneys, bones and lungs with repeated exposure (ILO International Chemical Safety Card "
      "0404). Do not cut, grind, crush or burn cells; wash your hands after handling broken "
      "ones; dispose of rejected and broken parts as hazardous electronic waste (WEEE Directive "
      "2012/19/EU), following your local rules.</p>"
      "<p><b>Mains voltage.</b> Light-operated switches are often connected to the mains "
      "without isolation. Never measure cells fitted in a mains-connected control. Bench "
      "fixtures should run at extra-low voltage (at most 50 V a.c. or 120 V ripple-free d.c., "
      "IEC 61140). Local electrical codes and licensed practice take precedence over anything "
      "this program says.</p>");
}

QString help_html() {
  return QObject::tr(
             "<h2>photolot guide</h2>"
             "<p>photolot reads the bench logs of a lot of CdS photoresistors, fits each unit's "
             "curve, shows how the lot spreads, judges it against a purchase spec and a sampling "
             "plan, pairs matching units and prints the lot summary.</p>"
             "<h3>Opening a lot</h3>"
             "<p><b>File ▸ Open Logs…</b> (Ctrl+O), drag files onto the window, or give them on "
             "the command line: <tt>photolot reel-07.csv</tt>. The import dialog shows the first "
             "rows as they will be read, what was detected (delimiter, decimal mark, which "
             "column is the unit id, illuminance, resistance and temperature, and their units) "
             "and every row that cannot be used, with its file and line. Change any choice and "
             "the preview follows; <b>Save as profile…</b> keeps the choices under a name for "
             "the next log from the same bench. <b>File ▸ Import Choices…</b> (Ctrl+I) reopens "
             "the dialog for the lot that is open.</p>"
             "<h3>R10 and gamma</h3>"
             "<p>A photoresistor's resistance falls as light rises. On log-log axes the curve is "
             "close to a straight line: <i>R(E) = R10 · (E / 10 lx)<sup>−gamma</sup></i>. "
             "<b>R10</b> is the resistance at 10 lux, the point where datasheets state it. "
             "<b>gamma</b> is the slope: each tenfold increase in light divides the resistance "
             "by 10<sup>gamma</sup>. With gamma = 0.7, going from 10 lx to 100 lx divides R by "
             "about 5. Typical parts have gamma between 0.6 and 0.9. R10 of one batch can "
             "easily differ by half again from unit to unit, so the lot's spread of R10 is "
             "judged on a log scale.</p>"
             "<h3>The fit</h3>"
             "<p>Each unit's readings under light are fitted on log-log axes by least squares "
             "with a robust loss: a reading far off the line (a range slip, a bad contact) is "
             "down-weighted rather than allowed to pull the line, and is marked as an "
             "<b>outlier</b> (✕). Readings over the meter's range are kept as lower bounds "
             "(△): the true value lies above. Dark readings (0 lx) are not part of the curve. "
             "The table shows for each unit the number of points used, R10 and gamma with their "
             "95 % confidence intervals, and the <b>RMS</b> of the residuals in ln R (0.01 is "
             "about 1 %). A unit with too few light levels, or levels spanning too little, is "
             "not fitted and says why in the <i>Fit</i> column. The shaded band around a "
             "fitted line is the 95 % confidence band of the curve.</p>"
             "<h3>Verdicts</h3>"
             "<p>Against a purchase spec, each unit conforms or not (for example, R10 outside "
             "its window, gamma outside its limits, dark resistance too low). The lot is then "
             "judged by an ISO 2859-1 sampling plan: for the lot size and the AQL, the plan "
             "gives a sample size and an acceptance number; the lot is accepted when the "
             "nonconforming units in the sample do not exceed it. Open or fill in the spec in "
             "the <b>Acceptance</b> view; the Verdict column and the disposition follow. The "
             "disposition is a recommendation: the decision and the signature are the "
             "inspector's.</p>"
             "<h3>The views</h3>"
             "<ul><li><b>Curves</b>: the selected units' readings and fitted lines, with the "
             "residuals below. Drag to pan, scroll to zoom, hover over a point for its values. "
             "Select many units (Ctrl+A) to see the whole lot at once.</li>"
             "<li><b>Spread</b>: histograms of R10 and gamma and R10 against gamma; click a dot "
             "to select its unit.</li>"
             "<li><b>Acceptance</b>: the spec form, verdict counts, the sampling plan and the "
             "disposition, and the printed lot summary.</li>"
             "<li><b>Pairs</b>: matched pairs whose curves track each other within a tolerance "
             "over a working range of light; choose a pair to see its two curves and their "
             "ratio error.</li>"
             "<li><b>Import log</b>: every row that could not be used, with file and line.</li></ul>"
             "<h3>Workspaces</h3>"
             "<p><b>File ▸ Save Workspace</b> (Ctrl+S) keeps the lot's logs (by path and "
             "content hash), the import choices, the fit options and what you were looking at, "
             "in one file (<tt>*.photolot</tt>). When a log has changed since, opening the "
             "workspace says so and offers to reload it. The file is written to a temporary "
             "file first and then renamed, so a crash never leaves half a workspace.</p>"
             "<p>Opening a workspace first lists the logs it will read, with any outside the "
             "workspace's folder marked; nothing is read until you choose <b>Read These "
             "Files</b>. Unsaved work is copied aside every minute; if photolot stops without "
             "closing, the next start offers to recover it.</p>"
             "<h3>Long work</h3>"
             "<p>Import and fitting run in the background: the window stays usable, the status "
             "bar shows progress, and <b>Cancel</b> (Esc) stops the run.</p>") +
         cautions_html();
}

QString about_html() {
  return QObject::tr("<h2>photolot %1</h2>"
                     "<p>A workbench for incoming inspection of CdS photoresistor lots: import "
                     "bench logs, fit R10 and gamma per unit, look at the lot's spread.</p>"
                     "<p>Built with Qt %2, QCustomPlot, Ceres Solver, nlohmann-json and fmt.</p>")
             .arg(QStringLiteral(PHOTOLOT_VERSION), QString::fromLatin1(qVersion())) +
         cautions_html();
}

}  // namespace photolot::workbench
