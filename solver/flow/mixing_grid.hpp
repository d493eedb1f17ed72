// The mixing time of a case on a grid it can afford. The tracer integration resolves a pulse
// injected into one zone: on finer grids the zone is smaller, the first steps shorter and each
// step a larger solve, so its cost grows much faster than the steady field's (a 2e5-zone grid took
// ten minutes). Above a size, theta95 is taken on the case's grid halved until it fits, and the
// result says on how many zones it was found.
#pragma once

#include "input/case.hpp"
#include "mesh/zone_network.hpp"
#include "solver/flow/hydrodynamics.hpp"

namespace oxystrat {

struct CaseMixingTime {
  double theta_s = 0.0;  //!< whole-vessel theta95 [s]
  int zones = 0;         //!< zones of the network it was found on
  int halvings = 0;      //!< times the case's grid was halved for it (0: the case's own network)
  bool reached = true;   //!< false: the tracer had not mixed when the integration gave up (theta_s is a lower bound)
  double judged_volume_fraction = 1.0;  //!< MixingResult::judged_volume_fraction
};

//! theta95 seen on a grid finer than this is within ~1 % of the finest grids measured on the tall
//! demo (339.6, 341.3, 342.4, 343.2 s at 4.9e3, 9.8e3, 2.0e4, 4.9e4 zones) and takes ~10 s.
constexpr int kMixingZonesMax = 20000;

//! theta95 of `c`, on its own network when that has at most `max_zones` zones, else on its grid
//! halved (radially and axially) as often as it takes to have at most `max_zones` grid cells.
CaseMixingTime case_mixing_time(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h,
                                int max_zones = kMixingZonesMax);

}  // namespace oxystrat
