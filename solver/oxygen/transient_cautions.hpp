// Plain-words cautions of a transient run: the hazards and model limits that applied at some time
// of it (enriched gas, pCO2, a probe blind to a starving region, the feed's volume, a saturated
// cascade, a cooling overload, O2-limited growth).
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/transient.hpp"

namespace oxystrat {

std::vector<std::string> transient_cautions(const Case& c, const TransientResult& r);

}  // namespace oxystrat
