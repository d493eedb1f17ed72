#include "physics/bubbles.hpp"
#include "physics/constants.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

namespace oxystrat::physics {
double water_surface_tension(double temperature_k) {
  const double tau = 1.0 - temperature_k / 647.096;
  return 0.2358 * std::pow(tau, 1.256) * (1.0 - 0.625 * tau);
}

double o2_diffusivity_water(double temperature_k) {
  const double t = temperature_k;
  const double log10_cm2_s = -4.410 + 773.8 / t - (506.4 / t) * (506.4 / t);
  return std::pow(10.0, log10_cm2_s) * 1e-4;
}

double hinze_max_diameter(double sigma, double rho, double epsilon) {
  return 0.725 * std::pow(sigma / rho, 0.6) * std::pow(std::max(epsilon, 1e-12), -0.4);
}

double viscous_max_diameter(double sigma, double tau) { return 2.0 * 0.5 * sigma / std::max(tau, 1e-12); }

double kolmogorov_length(double nu, double eps) { return std::pow(nu * nu * nu / std::max(eps, 1e-12), 0.25); }

double orifice_bubble_diameter(double d_o, double q, double sigma, double rho, double mu) {
  const double pi = std::numbers::pi;
  const double static_term = std::pow(6.0 * d_o * sigma / (rho * kG), 4.0 / 3.0);
  const double viscous_term = 81.0 * mu * q / (pi * rho * kG);
  const double inertial_term = std::pow(135.0 * q * q / (4.0 * pi * pi * kG), 0.8);
  return std::pow(static_term + viscous_term + inertial_term, 0.25);
}

double largest_stable_bubble(double sigma, double rho) { return 4.0 * std::sqrt(sigma / (rho * kG)); }

double bubble_rise_velocity(double d, double sigma, double rho, double mu) {
  const double wave = std::sqrt(2.14 * sigma / (rho * d) + 0.505 * kG * d);
  // A deformed bubble (Eotvos number rho g d^2 / sigma above ~4) no longer rises like a sphere.
  if (rho * kG * d * d / sigma > 4.0) return wave;
  // Rigid sphere: the velocity where the Schiller-Naumann drag balances buoyancy,
  // 24 Re (1 + 0.15 Re^0.687) = Ar with Re = u d / nu. The left side is increasing and convex, and
  // each of its two terms alone bounds Re from above, so Newton's method from the smaller bound
  // falls monotonically onto the root.
  const double nu = mu / rho;
  const double archimedes = 4.0 * kG * d * d * d / (3.0 * nu * nu);
  double re = std::min(archimedes / 24.0, std::pow(archimedes / 3.6, 1.0 / 1.687));
  for (int i = 0; i < 60; ++i) {
    const double power = std::pow(re, 0.687);
    const double excess = 24.0 * re * (1.0 + 0.15 * power) - archimedes;
    const double slope = 24.0 + 3.6 * 1.687 * power;
    const double step = excess / slope;
    re -= step;
    if (!(step > 1e-15 * re)) break;
  }
  const double rigid = re * nu / d;
  return std::min(wave, rigid);
}

}  // namespace oxystrat::physics
