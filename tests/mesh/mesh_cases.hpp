// Cases built directly as plain data (no case file), so each mesh test controls the bottom shape
// and the grid. The geometry is invented and valid for all three bottoms.
#pragma once

#include <numbers>

#include "input/case.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat::test {

//! T = 2 m, H = 3.2 m; a radial impeller (D = 0.7 m at 0.8 m, 0.14 m band), an up-pumping
//! hydrofoil (D = 0.9 m at 2.2 m, 0.108 m band), a ring sparger (D = 0.5 m at 0.45 m).
inline Case two_impeller_case(BottomShape bottom, int radial, int axial) {
  Case c;
  c.title = "mesh test vessel (invented)";
  c.vessel.diameter_m = 2.0;
  c.vessel.liquid_height_m = 3.2;
  c.vessel.bottom = bottom;
  c.vessel.baffles = 4;
  c.vessel.baffle_width_m = 0.2;
  c.vessel.head_pressure_pa = 151325.0;
  Impeller lower;
  lower.type = ImpellerType::rushton;
  lower.diameter_m = 0.7;
  lower.elevation_m = 0.8;
  lower.blade_height_m = 0.14;
  Impeller upper;
  upper.type = ImpellerType::hydrofoil_up;
  upper.diameter_m = 0.9;
  upper.elevation_m = 2.2;
  upper.blade_height_m = 0.108;
  upper.blades = 3;
  c.impellers = {lower, upper};
  c.has_sparger = true;
  c.sparger.elevation_m = 0.45;
  c.sparger.diameter_m = 0.5;
  c.broth.density_kg_m3 = 1030.0;
  c.grid.radial = radial;
  c.grid.axial = axial;
  return c;
}

//! Liquid volume below H for the vessel of two_impeller_case [m3]: head volume pi T^3/24
//! (2:1 ellipsoidal) or pi T^3/12 (hemispherical) plus the cylinder above the head (standard
//! vessel-head formulas, Perry's Chemical Engineers' Handbook, 8th ed., section 10).
inline double analytic_liquid_volume(BottomShape bottom, double t, double h) {
  const double pi = std::numbers::pi;
  const double area = pi * t * t / 4.0;
  switch (bottom) {
    case BottomShape::flat: return area * h;
    case BottomShape::ellipsoidal: return pi * t * t * t / 24.0 + area * (h - t / 4.0);
    case BottomShape::hemispherical: return pi * t * t * t / 12.0 + area * (h - t / 2.0);
  }
  return 0.0;
}

inline const BottomShape kAllBottoms[] = {BottomShape::flat, BottomShape::ellipsoidal, BottomShape::hemispherical};

}  // namespace oxystrat::test
