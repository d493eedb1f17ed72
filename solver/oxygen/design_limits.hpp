// The other limits of a design beside oxygen: heat removal, shear, and the cost of power,
// compressed air and oxygen, at one steady operating point, with the cautions and notes they call
// for (docs/method.md, sections 16 to 18).
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "mesh/zone_network.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/heat_balance.hpp"
#include "solver/oxygen/operating_cost.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "solver/oxygen/shear.hpp"

namespace oxystrat {

struct DesignLimits {
  HeatBalance heat;
  ShearField shear;
  OperatingCost cost;
};

//! At the steady field (`field` null without gas: no uptake, no transfer).
DesignLimits design_limits(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h, const OxygenField* field);

//! Cautions: cooling short or nearly so; for cell cultures, where the literature puts the damage
//! (bursting bubbles) and how the impeller maxima compare with published lethal dissipation.
//! `oxygen_max_biomass_kg_m3` (0 when not computed) is compared with the heat-limited biomass.
std::vector<std::string> limit_cautions(const Case& c, const DesignLimits& d, double oxygen_max_biomass_kg_m3);

//! Notes: what was not checked (no [cooling], no [prices]).
std::vector<std::string> limit_notes(const Case& c, const DesignLimits& d);

//! Published range of dissipation per volume that is lethal to CHO cells [W/m3]: 1e6-1e8
//! (Walls et al. 2017, Sci. Rep. 7:15102, from earlier studies) [pub].
inline constexpr double cho_lethal_dissipation_low_w_m3 = 1e6;
inline constexpr double cho_lethal_dissipation_high_w_m3 = 1e8;

}  // namespace oxystrat
