// --grid-check: the case on its own grid and two coarser ones (cell-size ratio >= 1.5 each), with the observed
// order and GCI of DO_min, the below-critical share and theta95.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/fit/grid_convergence.hpp"

namespace oxystrat {

struct GridCheckQuantity {
  std::string name, unit;
  double fine = 0.0, medium = 0.0, coarse = 0.0;  //!< in `unit`
  GridConvergence convergence;
  std::string verdict;
};

struct GridCheck {
  int zones[3] = {0, 0, 0};       //!< fine, medium, coarse
  double cell_size[3] = {0, 0, 0};  //!< representative (r, z) cell size sqrt(R H / N) [m]
  std::vector<GridCheckQuantity> quantities;
  std::vector<std::string> warnings;
};

GridCheck grid_check(const Case& c);

//! Formal order of the zone network's discretisation: upwind convection between zones, first
//! order in the cell size (docs/method.md, section 5).
inline constexpr double network_scheme_order = 1.0;

//! The verdict on one quantity: the same on all grids, oscillating, near zero (`near_zero`: judged
//! by the absolute band), not in the asymptotic range (observed order far from the scheme's),
//! too coarse (GCI > 10 %), or adequate. A verdict that asks to refine contains "refine".
std::string grid_check_verdict(const GridConvergence& cv, bool near_zero, const std::string& unit);

}  // namespace oxystrat
