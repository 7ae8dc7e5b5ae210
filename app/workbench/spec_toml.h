// Writes a Spec back in the layout of docs/spec-format.md, so the spec edited in the
// acceptance form can be saved and read again by the same loader the command line uses.
#pragma once

#include <string>

#include "photolot/spec.h"

namespace photolot::workbench {

std::string spec_to_toml(const Spec& spec);

}  // namespace photolot::workbench
