// The report of `oxystrat mixing`: what the mixing time means for the culture first, then the
// tracer history at the probe, the approach to uniform over all zones, and the tracer in the
// (r, z) section half-way to mixed.
#pragma once

#include <string>

#include "input/case.hpp"
#include "mesh/zone_network.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/mixing_time.hpp"

namespace oxystrat {

//! The first sentence: theta_x of the whole vessel, and whether the culture would use up the
//! dissolved O2 of air saturation faster than that (gradients expected) or not.
std::string mixing_headline(const Case& c, const MixingResult& mix, double homogeneity);

std::string mixing_report_body(const Case& c, const ZoneNetwork& net, const Hydrodynamics& hydro, const MixingResult& mix,
                               double homogeneity);

}  // namespace oxystrat
