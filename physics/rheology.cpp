#include "physics/rheology.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

namespace oxystrat {

std::string to_string(RheologyKind k) {
  switch (k) {
    case RheologyKind::newtonian: return "newtonian";
    case RheologyKind::power_law: return "power-law";
    case RheologyKind::herschel_bulkley: return "herschel-bulkley";
    case RheologyKind::casson: return "casson";
  }
  return "?";
}

double shear_stress(const Rheology& r, double g) {
  switch (r.kind) {
    case RheologyKind::newtonian: return r.viscosity_pa_s * g;
    case RheologyKind::power_law: return r.consistency * std::pow(g, r.flow_index);
    case RheologyKind::herschel_bulkley: return r.yield_stress_pa + r.consistency * std::pow(g, r.flow_index);
    case RheologyKind::casson: {
      const double s = std::sqrt(r.yield_stress_pa) + std::sqrt(r.viscosity_pa_s * g);
      return s * s;
    }
  }
  return 0.0;
}

double apparent_viscosity(const Rheology& r, double g) {
  if (r.newtonian()) return r.viscosity_pa_s;
  const double gamma = std::max(g, 1e-3);
  return shear_stress(r, gamma) / gamma;
}

double dissipation_shear_rate(const Rheology& r, double rho, double eps) {
  const double target = rho * std::max(eps, 0.0);
  if (r.newtonian()) return std::sqrt(target / r.viscosity_pa_s);
  if (r.kind == RheologyKind::power_law) return std::pow(target / r.consistency, 1.0 / (r.flow_index + 1.0));
  // tau(gamma) gamma rises monotonically: bisection on ln gamma over 1e-6 .. 1e7 1/s.
  double lo = std::log(1e-6), hi = std::log(1e7);
  if (shear_stress(r, std::exp(lo)) * std::exp(lo) >= target) return std::exp(lo);
  for (int i = 0; i < 80; ++i) {
    const double mid = 0.5 * (lo + hi), g = std::exp(mid);
    (shear_stress(r, g) * g < target ? lo : hi) = mid;
  }
  return std::exp(0.5 * (lo + hi));
}

double metzner_otto_reynolds(const Rheology& r, double rho, double n, double d, double ks) {
  return rho * n * d * d / apparent_viscosity(r, ks * n);
}

namespace {

// Np rho N^2 D^2 / (pi^2 tau_y): the torque the impeller can spread against the yield stress.
double torque_number(double np, double rho, double n, double d, double tau_y) {
  return np * rho * n * n * d * d / (std::numbers::pi * std::numbers::pi * tau_y);
}

}  // namespace

double cavern_diameter(double np, double rho, double n, double d, double tau_y, double t) {
  constexpr double kHeightRatio = 0.4;  // H_c / D_c observed by Elson et al. (1986) [mem]
  const double dc = d * std::cbrt(torque_number(np, rho, n, d, tau_y) / (kHeightRatio + 1.0 / 3.0));
  return std::min(dc, t);
}

double cavern_height(double np, double rho, double n, double d, double tau_y, double t) {
  const double dc = cavern_diameter(np, rho, n, d, tau_y, t);
  if (dc < t) return 0.4 * dc;
  return t * std::max(0.4, torque_number(np, rho, n, d, tau_y) * std::pow(d / t, 3.0) - 1.0 / 3.0);
}

}  // namespace oxystrat
