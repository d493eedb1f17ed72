// Small-scale turbulence, what a cell in the broth feels: the stress of the smallest eddies (their
// length is kolmogorov_length of physics/bubbles.hpp), and how far the largest local dissipation
// near an impeller exceeds the mean.
// Free functions, SI in and out (docs/method.md, section 17).
#pragma once

#include "physics/bubbles.hpp"  // kolmogorov_length, shared with the bubble break-up
#include "physics/impeller_types.hpp"

namespace oxystrat::physics {

//! Stress of the Kolmogorov eddies tau = rho (eps nu)^(1/2) [Pa] for density [kg/m3], kinematic
//! viscosity [m2/s] and specific dissipation [W/kg]: the viscous stress at the shear rate
//! (eps/nu)^(1/2) of the smallest eddies (common practice in cell-damage studies).
double kolmogorov_stress(double density_kg_m3, double kinematic_viscosity_m2_s, double epsilon_w_kg);

//! Largest local dissipation in an impeller's discharge over the mean dissipation of the liquid
//! it drives, eps_max / eps_mean [-], by type, for a baffled vessel:
//! - Rushton turbine 40: measured 30-50 in the discharge stream (Zhou & Kresta 1996, AIChE J.
//!   42:2476) [mem];
//! - narrow-blade hydrofoil 12: 10-15 [mem];
//! - pitched-blade turbine 20 and hollow-blade disc turbine 30: our assumption between the two.
//! Give your own per impeller with `impeller.N.dissipation_ratio`.
double dissipation_max_to_mean(ImpellerType type);

}  // namespace oxystrat::physics
