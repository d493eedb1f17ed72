#include "physics/mass_transfer.hpp"

#include <algorithm>
#include <cmath>

#include "physics/solubility.hpp"

namespace oxystrat {

std::string to_string(Coalescence c) { return c == Coalescence::coalescing ? "coalescing" : "non-coalescing"; }

VantRietConstants vant_riet_constants(Coalescence c) {
  return c == Coalescence::coalescing ? VantRietConstants{0.026, 0.4, 0.5} : VantRietConstants{0.002, 0.7, 0.2};
}

double viscous_kla_factor(double mu) {
  return mu > water_like_viscosity_pa_s ? std::pow(water_like_viscosity_pa_s / mu, 0.4) : 1.0;
}

double vant_riet_kla(const VantRietConstants& k, double pv, double vs) {
  if (pv <= 0.0 || vs <= 0.0) return 0.0;
  return k.prefactor * std::pow(pv, k.power_exponent) * std::pow(vs, k.gas_exponent);
}

double eddy_model_kl(double eps, double nu, double sc) { return 0.523 * std::pow(eps * nu, 0.25) / std::sqrt(sc); }

double interfacial_area(double holdup, double d32) { return 6.0 * holdup / d32; }

double kla_temperature_factor(double temperature_k) { return std::pow(1.024, temperature_k - 293.15); }


}  // namespace oxystrat
