#include "physics/mass_transfer.hpp"

#include <algorithm>
#include <cmath>

#include "physics/solubility.hpp"

namespace oxystrat {

double drift_flux_holdup(double j, double u_slip) { return j > 0.0 ? std::min(max_holdup, j / (j + u_slip)) : 0.0; }

std::string to_string(Coalescence c) { return c == Coalescence::coalescing ? "coalescing" : "non-coalescing"; }

VantRietConstants vant_riet_constants(Coalescence c) {
  return c == Coalescence::coalescing ? VantRietConstants{0.026, 0.4, 0.5} : VantRietConstants{0.002, 0.7, 0.2};
}

double vant_riet_kla(const VantRietConstants& k, double pv, double vs) {
  if (pv <= 0.0 || vs <= 0.0) return 0.0;
  return k.prefactor * std::pow(pv, k.power_exponent) * std::pow(vs, k.gas_exponent);
}

double eddy_model_kl(double eps, double nu, double sc) { return 0.523 * std::pow(eps * nu, 0.25) / std::sqrt(sc); }

double interfacial_area(double holdup, double d32) { return 6.0 * holdup / d32; }

double default_bubble_diameter(Coalescence c) { return c == Coalescence::coalescing ? 4e-3 : 1.5e-3; }

double kla_temperature_factor(double temperature_k) { return std::pow(1.024, temperature_k - 293.15); }

double o2_diffusivity(double temperature_k) {
  return 2.1e-9 * (temperature_k / 298.15) * (physics::water_viscosity(298.15) / physics::water_viscosity(temperature_k));
}

}  // namespace oxystrat
