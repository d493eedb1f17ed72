#include "solver/oxygen/do_control.hpp"

#include <algorithm>

namespace oxystrat {

DoController::DoController(const Case& c, double air_saturation_mol_m3) : air_sat_(air_saturation_mol_m3) { retune(c); }

void DoController::retune(const Case& c) {
  k_ = c.control;
  gas_lo_ = k_.gas_min_m3_s >= 0.0 ? k_.gas_min_m3_s : c.operation.gas_flow_normal_m3_s;
  gas_hi_ = k_.gas_max_m3_s >= 0.0 ? k_.gas_max_m3_s : gas_lo_;
  o2_lo_ = c.operation.oxygen_fraction;
  o2_hi_ = k_.oxygen_max >= 0.0 ? k_.oxygen_max : o2_lo_;
  u_max_ = o2_hi_ > o2_lo_ ? 3.0 : gas_hi_ > gas_lo_ ? 2.0 : 1.0;
}

double DoController::update(double probe_do_mol_m3) {
  const double measured = probe_do_mol_m3 / air_sat_;
  const double error = k_.setpoint_mol_m3 / air_sat_ - measured;
  const double slope = have_measured_ ? (measured - last_measured_) / k_.interval_s : 0.0;
  last_measured_ = measured;
  have_measured_ = true;
  integral_ += error * k_.interval_s;
  double u = k_.gain * (error + integral_ / k_.integral_time_s - k_.derivative_time_s * slope);
  if (u < 0.0 || u > u_max_) {
    integral_ -= error * k_.interval_s;
    u = std::clamp(u, 0.0, u_max_);
  }
  return u;
}

void DoController::actuate(double u, Case& c) const {
  const auto lerp = [](double a, double b, double f) { return a + (b - a) * std::clamp(f, 0.0, 1.0); };
  c.operation.speed_rps = lerp(k_.speed_min_rps, k_.speed_max_rps, u);
  c.operation.gas_flow_normal_m3_s = lerp(gas_lo_, gas_hi_, u - 1.0);
  c.operation.oxygen_fraction = lerp(o2_lo_, o2_hi_, u - 2.0);
}

}  // namespace oxystrat
