#include "physics/compression.hpp"

#include <cmath>

namespace oxystrat::physics {

double isothermal_compression_power(double p_in_pa, double inlet_flow_m3_s, double p_out_pa) {
  if (!(p_out_pa > p_in_pa)) return 0.0;  // no compression needed
  return p_in_pa * inlet_flow_m3_s * std::log(p_out_pa / p_in_pa);
}

double adiabatic_compression_power(double p_in_pa, double inlet_flow_m3_s, double p_out_pa, double kappa) {
  if (!(p_out_pa > p_in_pa)) return 0.0;
  const double m = (kappa - 1.0) / kappa;
  return p_in_pa * inlet_flow_m3_s / m * std::expm1(m * std::log(p_out_pa / p_in_pa));
}

}  // namespace oxystrat::physics
