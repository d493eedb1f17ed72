// What the turbulence does to cells: the Kolmogorov length and the stress of the smallest eddies
// in every zone, and, because a zone averages over its volume, the largest dissipation in each
// impeller's discharge from a published max/mean ratio (docs/method.md, section 17).
#pragma once

#include <vector>

#include "input/case.hpp"
#include "mesh/zone_network.hpp"
#include "solver/flow/hydrodynamics.hpp"

namespace oxystrat {

struct ImpellerShear {
  double epsilon_mean_w_kg = 0.0;  //!< its gassed power over the liquid of its domain [W/kg]
  double ratio = 0.0;              //!< eps_max / eps_mean used [-]
  double epsilon_max_w_kg = 0.0;   //!< largest dissipation in its discharge [W/kg]
  bool from_zones = false;         //!< the zones of its swept volume hold more than ratio x mean
  double kolmogorov_min_m = 0.0;   //!< Kolmogorov length at that maximum [m]
  double stress_max_pa = 0.0;      //!< stress of the smallest eddies there [Pa]
};

struct ShearField {
  std::vector<double> kolmogorov_m;  //!< per zone, at the zone-mean dissipation and apparent viscosity [m]
  std::vector<double> stress_pa;     //!< per zone, rho (eps nu)^(1/2) [Pa]
  std::vector<ImpellerShear> impellers;
  double epsilon_max_w_kg = 0.0;     //!< largest anywhere: impeller maxima and zones [W/kg]
  double kolmogorov_min_m = 0.0;     //!< smallest anywhere [m]
  double stress_max_pa = 0.0;        //!< largest anywhere [Pa]
  int worst_impeller = -1;           //!< impeller whose discharge holds the maximum; -1: a zone
  double zone_epsilon_max_w_kg = 0.0;  //!< largest zone-mean dissipation [W/kg]
};

ShearField shear_field(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h);

}  // namespace oxystrat
