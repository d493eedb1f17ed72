#include "physics/heat.hpp"

#include <cmath>

namespace oxystrat::physics {

double water_latent_heat(double temperature_k) {
  const double t = temperature_k - 273.15;
  return 1e3 * (2500.9 + t * (-2.3729 + t * (4.7457e-4 + t * -1.1825e-5)));
}

double log_mean_temperature_difference(double dt_in_k, double dt_out_k) {
  if (std::abs(dt_in_k - dt_out_k) <= 1e-9 * std::max(std::abs(dt_in_k), std::abs(dt_out_k))) return dt_in_k;
  return (dt_in_k - dt_out_k) / std::log(dt_in_k / dt_out_k);
}

double coolant_duty(double ua_w_k, double capacity_rate_w_k, double broth_k, double coolant_in_k) {
  if (!(broth_k > coolant_in_k) || !(ua_w_k > 0.0) || !(capacity_rate_w_k > 0.0)) return 0.0;
  // -expm1(-x) keeps the small-NTU limit (Q -> UA dT) exact.
  return -std::expm1(-ua_w_k / capacity_rate_w_k) * capacity_rate_w_k * (broth_k - coolant_in_k);
}

}  // namespace oxystrat::physics
