// The texts of the guide (Help ▸ photolot Guide, F1) and the About box, with the safety
// cautions about cadmium and mains-voltage light switches.
#pragma once

#include <QString>

namespace photolot::workbench {

QString help_html();
QString about_html();
QString cautions_html();

}  // namespace photolot::workbench
