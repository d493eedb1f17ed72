// What a viscous or yield-stress broth does to the flow: the apparent viscosity each zone's
// turbulence sees, the damping of turbulent exchange below the turbulent regime, and the caverns
// impellers clear in a yield-stress broth, outside which the broth stands still.
#pragma once

#include <vector>

#include "input/case.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

//! Impeller Reynolds number times Np^(1/3) above which mixing is turbulent: Grenville (1992),
//! Re Np^(1/3) > 6370 [mem]; below, N theta95 Np^(2/3) Re (D/T)^2 = 33500 (transitional).
inline constexpr double turbulent_mixing_reynolds = 6370.0;

//! O2 diffusivity used for stagnant broth outside every cavern: molecular transport only [m2/s]
//! (O2 in water at 30 degC, Han & Bartels 1996, rounded).
inline constexpr double stagnant_diffusivity_m2_s = 2.2e-9;

//! The caverns of a case: per impeller, the cylinder centred on its plane.
struct Caverns {
  std::vector<double> diameter_m, height_m, elevation_m;  //!< per impeller; empty without a yield stress
  bool any() const { return !diameter_m.empty(); }
  //! Inside some cavern (always true without a yield stress).
  bool contains(double r, double z) const;
};

//! Caverns from each impeller's power number (Elson et al. 1986) when the broth has a yield stress.
Caverns impeller_caverns(const Case& c, const std::vector<double>& power_numbers);

//! Per zone: shear rate from the local dissipation [1/s] and the apparent viscosity at it [Pa s].
void zone_viscosity(const Case& c, const std::vector<double>& epsilon_w_kg, std::vector<double>& shear_rate_1_s,
                    std::vector<double>& apparent_viscosity_pa_s);

//! Per zone: the share of the turbulent exchange that survives, min(1, Re Np^(1/3) / 6370) with Re
//! the zone's own impeller's Reynolds number at the zone's apparent viscosity (so exchange falls
//! where the broth is thick, and the mixing time grows as Grenville's transitional correlation
//! says); 0 in stagnant zones.
std::vector<double> turbulence_share(const Case& c, const ZoneNetwork& net, const std::vector<double>& power_numbers,
                                     const std::vector<double>& apparent_viscosity_pa_s, const Caverns& caverns);

}  // namespace oxystrat
