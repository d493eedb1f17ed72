// Plain-text summaries printed on the terminal.
#pragma once

#include <string>

#include "input/case_reader.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

//! Vessel, impellers, sparger and grid as derived from the case (what `oxystrat check` prints).
std::string geometry_summary(const LoadedCase& loaded, const ZoneNetwork& net);

}  // namespace oxystrat
