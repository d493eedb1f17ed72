#include "solver/fit/grid_convergence.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {

GridConvergence grid_convergence(double f1, double f2, double f3, double h1, double h2, double h3) {
  GridConvergence g;
  const double e21 = f2 - f1, e32 = f3 - f2;
  const double scale = std::max({std::abs(f1), std::abs(f2), std::abs(f3), 1e-300});
  if (std::abs(e21) <= 1e-12 * scale && std::abs(e32) <= 1e-12 * scale) {
    g.converged_already = true;
    g.extrapolated = f1;
    g.observed_order = 0.0;
    return g;
  }
  const double r21 = h2 / h1, r32 = h3 / h2;
  const double ratio = e32 / e21;
  g.oscillatory = ratio < 0.0;
  const double s = ratio >= 0.0 ? 1.0 : -1.0;
  // Fixed-point iteration for p (Celik et al. 2008, eqs. 3a-3c); for r21 = r32 it is direct.
  double p = std::abs(std::log(std::abs(ratio))) / std::log(r21);
  for (int i = 0; i < 100; ++i) {
    const double q = std::log((std::pow(r21, p) - s) / (std::pow(r32, p) - s));
    const double next = std::abs(std::log(std::abs(ratio)) + q) / std::log(r21);
    if (!std::isfinite(next)) break;
    if (std::abs(next - p) < 1e-12) {
      p = next;
      break;
    }
    p = next;
  }
  g.observed_order = p;
  const double rp = std::pow(r21, p);
  g.extrapolated = (rp * f1 - f2) / (rp - 1.0);
  const double ea21 = std::abs(e21) / std::max(std::abs(f1), 1e-300);
  g.gci_fine = 1.25 * ea21 / (rp - 1.0);
  g.gci_fine_absolute = 1.25 * std::abs(e21) / (rp - 1.0);
  return g;
}

bool in_asymptotic_range(double observed_order, double formal_order) {
  const double ratio = observed_order / formal_order;
  return ratio >= 0.5 && ratio <= 2.0;
}

}  // namespace oxystrat
