#include "solver/oxygen/shear.hpp"

#include <algorithm>

#include "physics/rheology.hpp"
#include "physics/turbulence.hpp"

namespace oxystrat {
namespace {

// Kinematic viscosity at a dissipation [m2/s]: the broth's apparent viscosity at the shear rate
// that dissipation sustains (the same rule as the zones' apparent viscosity; Newtonian: mu/rho).
double kinematic_viscosity_at(const Case& c, double epsilon_w_kg) {
  const auto& r = c.broth.rheology;
  const double rho = c.broth.density_kg_m3;
  return apparent_viscosity(r, dissipation_shear_rate(r, rho, epsilon_w_kg)) / rho;
}

}  // namespace

ShearField shear_field(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h) {
  ShearField s;
  const double rho = c.broth.density_kg_m3;
  const int n = net.size();
  s.kolmogorov_m.resize(n);
  s.stress_pa.resize(n);
  const bool per_zone = h.apparent_viscosity.size() == static_cast<size_t>(n);
  for (int k = 0; k < n; ++k) {
    // Each zone at its own apparent viscosity (non-Newtonian broths thin where the dissipation is high).
    const double nu = per_zone ? h.apparent_viscosity[k] / rho : kinematic_viscosity_at(c, h.epsilon[k]);
    s.kolmogorov_m[k] = physics::kolmogorov_length(nu, h.epsilon[k]);
    s.stress_pa[k] = physics::kolmogorov_stress(rho, nu, h.epsilon[k]);
    s.zone_epsilon_max_w_kg = std::max(s.zone_epsilon_max_w_kg, h.epsilon[k]);
  }
  s.epsilon_max_w_kg = s.zone_epsilon_max_w_kg;
  // Each impeller drives the liquid of its domain (docs/method.md, section 5); for one impeller
  // that is the tank, as in the published ratios.
  const size_t m = c.impellers.size();
  std::vector<double> domain_volume(m, 0.0), swept_max(m, 0.0);
  for (int k = 0; k < n; ++k) {
    const auto& reg = net.region[k];
    if (reg.domain >= 0 && static_cast<size_t>(reg.domain) < m) domain_volume[reg.domain] += net.volume[k];
    if (reg.discharge >= 0 && static_cast<size_t>(reg.discharge) < m) {
      swept_max[reg.discharge] = std::max(swept_max[reg.discharge], h.epsilon[k]);
    }
  }
  s.impellers.resize(m);
  for (size_t i = 0; i < m; ++i) {
    auto& imp = s.impellers[i];
    const double power = i < h.impellers.size() ? h.impellers[i].power_gassed_w : 0.0;
    imp.epsilon_mean_w_kg = domain_volume[i] > 0.0 ? power / (rho * domain_volume[i]) : 0.0;
    imp.ratio = c.impellers[i].dissipation_ratio.value_or(physics::dissipation_max_to_mean(c.impellers[i].type));
    // Never below what the zones of its swept volume already hold.
    imp.epsilon_max_w_kg = std::max(imp.ratio * imp.epsilon_mean_w_kg, swept_max[i]);
    imp.from_zones = swept_max[i] > imp.ratio * imp.epsilon_mean_w_kg;
    const double nu = kinematic_viscosity_at(c, imp.epsilon_max_w_kg);
    imp.kolmogorov_min_m = physics::kolmogorov_length(nu, imp.epsilon_max_w_kg);
    imp.stress_max_pa = physics::kolmogorov_stress(rho, nu, imp.epsilon_max_w_kg);
    if (imp.epsilon_max_w_kg >= s.epsilon_max_w_kg) {
      s.epsilon_max_w_kg = imp.epsilon_max_w_kg;
      s.worst_impeller = static_cast<int>(i);
    }
  }
  // Smallest eddies and largest stress anywhere (with a shear-thinning broth not necessarily where
  // the dissipation peaks, so taken over zones and impeller maxima alike).
  s.kolmogorov_min_m = *std::min_element(s.kolmogorov_m.begin(), s.kolmogorov_m.end());
  s.stress_max_pa = *std::max_element(s.stress_pa.begin(), s.stress_pa.end());
  for (const auto& imp : s.impellers) {
    s.kolmogorov_min_m = std::min(s.kolmogorov_min_m, imp.kolmogorov_min_m);
    s.stress_max_pa = std::max(s.stress_max_pa, imp.stress_max_pa);
  }
  return s;
}

}  // namespace oxystrat
