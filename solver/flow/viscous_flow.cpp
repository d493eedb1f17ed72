#include "solver/flow/viscous_flow.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {

bool Caverns::contains(double r, double z) const {
  if (!any()) return true;
  for (size_t m = 0; m < diameter_m.size(); ++m) {
    if (r <= 0.5 * diameter_m[m] && std::abs(z - elevation_m[m]) <= 0.5 * height_m[m]) return true;
  }
  return false;
}

Caverns impeller_caverns(const Case& c, const std::vector<double>& power_numbers) {
  Caverns cv;
  const auto& r = c.broth.rheology;
  if (!(r.yield_stress_pa > 0.0)) return cv;
  for (size_t m = 0; m < c.impellers.size(); ++m) {
    const auto& imp = c.impellers[m];
    const double n = c.operation.speed_rps, t = c.vessel.diameter_m;
    cv.diameter_m.push_back(cavern_diameter(power_numbers[m], c.broth.density_kg_m3, n, imp.diameter_m, r.yield_stress_pa, t));
    cv.height_m.push_back(cavern_height(power_numbers[m], c.broth.density_kg_m3, n, imp.diameter_m, r.yield_stress_pa, t));
    cv.elevation_m.push_back(imp.elevation_m);
  }
  return cv;
}

void zone_viscosity(const Case& c, const std::vector<double>& eps, std::vector<double>& shear, std::vector<double>& mu) {
  const auto& r = c.broth.rheology;
  shear.resize(eps.size());
  mu.resize(eps.size());
  for (size_t k = 0; k < eps.size(); ++k) {
    shear[k] = dissipation_shear_rate(r, c.broth.density_kg_m3, eps[k]);
    mu[k] = apparent_viscosity(r, shear[k]);
  }
}

std::vector<double> turbulence_share(const Case& c, const ZoneNetwork& net, const std::vector<double>& np,
                                     const std::vector<double>& mu, const Caverns& caverns) {
  std::vector<double> share(net.size(), 1.0);
  for (int k = 0; k < net.size(); ++k) {
    if (!caverns.contains(net.r[k], net.z[k])) {
      share[k] = 0.0;
      continue;
    }
    const int m = std::clamp(net.region[k].domain, 0, static_cast<int>(c.impellers.size()) - 1);
    const double d = c.impellers[m].diameter_m;
    const double re = c.broth.density_kg_m3 * c.operation.speed_rps * d * d / mu[k];
    const double x = re * std::cbrt(np[m]) / turbulent_mixing_reynolds;
    if (x < 1.0) share[k] = x;  // exactly 1 otherwise: a turbulent case is unchanged to the bit
  }
  return share;
}

}  // namespace oxystrat
