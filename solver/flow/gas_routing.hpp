// Where the gas goes: sparged gas enters the sparger zones and rises column by column; an impeller
// that is not flooded (loaded or completely dispersed) takes the gas rising into its lowest blade
// row and spreads it over the row above out to the wall, by area. A flooded impeller lets it rise
// as a plume. The routing is a directed acyclic graph, listed in
// an order in which every zone comes after all zones that send it gas.
#pragma once

#include <vector>

#include "input/case.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

struct GasLink {
  int to = -1;          //!< receiving zone; -1: the head space (off-gas)
  double share = 0.0;   //!< share of the sending zone's outgoing gas [-]
};

struct GasRouting {
  std::vector<std::vector<GasLink>> out;  //!< per zone, shares summing to 1
  std::vector<int> order;                 //!< senders before receivers
  std::vector<double> area;               //!< horizontal area the gas rises through per zone [m2]
};

GasRouting route_gas(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h);

}  // namespace oxystrat
