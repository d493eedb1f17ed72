// The liquid flow field as a Stokes stream function psi(r, z) built from one smooth shape per
// circulation loop. Face flows are 2 pi times differences of psi at the face's end points, so every
// zone balances exactly (the sum around a closed zone boundary telescopes to zero).
//
// Sign: psi > 0 is a loop that runs down near the shaft, out along its bottom, up at the wall and
// in along its top. A radial impeller drives an upper loop (psi > 0) and a lower one (psi < 0)
// that meet in its discharge plane; a down-pumping axial impeller one loop with psi > 0, an
// up-pumping one a loop with psi < 0. Neighbouring loops that turn the same way merge into one
// (their flows join); loops that turn opposite ways meet on a psi = 0 surface that no liquid
// crosses: only turbulent exchange links them (the compartments of tall multi-impeller vessels).
#pragma once

#include <vector>

#include "input/case.hpp"
#include "physics/vessel_shape.hpp"

namespace oxystrat {

//! One loop's shape: psi = flow/(2 pi) f(r) g(z). f rises from the axis to 1 at r_core, stays 1
//! to r_eye, then falls to 0 at the wall, steepest there (the wall jet). g rises from 0 at z_lo over
//! rise_len, stays 1, and falls to 0 over fall_len at z_hi; a jet length makes the rise or fall
//! reach jet_share of the peak across the impeller's half blade height (its discharge stream).
//! f and g never both have a flat stretch at one place, so no region of the loop is stagnant.
struct CirculationLoop {
  double z_lo = 0.0, z_hi = 0.0;       //!< axial extent [m]
  double rise_len = 0.0, fall_len = 0.0;  //!< lengths of the rise at z_lo and fall at z_hi [m]
  double rise_jet = 0.0, fall_jet = 0.0;  //!< jet lengths at either end, 0 = none [m]
  bool floor_on_head = false;          //!< lower end follows the vessel bottom (the lowest loop)
  double r_core = 0.0;                 //!< impeller tip radius [m]
  double r_eye = 0.0;                  //!< outer end of the radial plateau (= r_core: none) [m]
  double flow_m3_s = 0.0;              //!< circulation carried by the loop, signed as psi [m3/s]
};

//! Share of a radial loop's flow that leaves through the impeller's own blade band [-]
//! (our modelling choice: most of the discharge stream stays in the blade band near the tip).
inline constexpr double jet_share = 0.7;
//! Height of a radial loop's eye above (below) its impeller plane, as a share of the loop height [-].
inline constexpr double radial_eye_height = 0.4;

//! The loops of the case's impeller stack at circulation flows `circulation_m3_s` (per impeller,
//! the whole pumped + entrained flow; a radial impeller puts half in each of its two loops).
std::vector<CirculationLoop> circulation_loops(const Case& c, const std::vector<double>& circulation_m3_s);

//! Stream function [m3/s / (2 pi)] of the loops at (r, z); 0 on the axis, wall, bottom and surface.
double stream_function(const std::vector<CirculationLoop>& loops, const VesselShape& shape, double r, double z);

}  // namespace oxystrat
