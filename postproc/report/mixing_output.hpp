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

//! x of theta_x in percent as printed: 95, 97.5, 99.9.
std::string homogeneity_percent(double homogeneity);

//! The name of the mixing time for homogeneity x: "theta95", "theta99.9".
inline std::string theta_label(double homogeneity) { return "theta" + homogeneity_percent(homogeneity); }

//! The first sentence: theta_x of the whole vessel, and whether the culture would use up the
//! dissolved O2 of air saturation faster than that (gradients expected) or not.
std::string mixing_headline(const Case& c, const MixingResult& mix, double homogeneity);

std::string mixing_report_body(const Case& c, const ZoneNetwork& net, const Hydrodynamics& hydro, const MixingResult& mix,
                               double homogeneity);

}  // namespace oxystrat
