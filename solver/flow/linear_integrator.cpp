#include "solver/flow/linear_integrator.hpp"
#include "input/errors.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace oxystrat {

LinearImplicitIntegrator::LinearImplicitIntegrator(Eigen::SparseMatrix<double> l, Eigen::VectorXd volume,
                                                   double h_initial, double rtol, double atol, double scale)
    : l_(std::move(l)), volume_(std::move(volume)), h_initial_(h_initial), rtol_(rtol), atol_(atol), scale_(scale) {}

double LinearImplicitIntegrator::step_size(int level) const { return h_initial_ * std::ldexp(1.0, level); }

Eigen::VectorXd LinearImplicitIntegrator::solve(int level, const Eigen::VectorXd& rhs) {
  auto& lu = lu_[level];
  if (!lu) {
    Eigen::SparseMatrix<double> a = -step_size(level) * l_;
    for (Eigen::Index i = 0; i < a.rows(); ++i) a.coeffRef(i, i) += volume_[i];
    a.makeCompressed();
    lu = std::make_unique<Lu>();
    lu->compute(a);
    if (lu->info() != Eigen::Success) throw SolveError("transport: factorisation of (V - h L) failed");
    ++stats_.factorisations;
  }
  return lu->solve(rhs);
}

void LinearImplicitIntegrator::run(Eigen::VectorXd& c, double t_end,
                                   const std::function<bool(double, const Eigen::VectorXd&)>& on_step) {
  constexpr int max_level = 40, min_level = -30;
  int level = 0;
  double t = 0.0;
  while (t < t_end) {
    const Eigen::VectorXd vc = volume_.cwiseProduct(c);
    const Eigen::VectorXd full = solve(level, vc);
    const Eigen::VectorXd half1 = solve(level - 1, vc);
    const Eigen::VectorXd half = solve(level - 1, volume_.cwiseProduct(half1));
    double err = 0.0;
    for (Eigen::Index i = 0; i < c.size(); ++i) {
      const double tol = atol_ * scale_ + rtol_ * std::abs(half[i]);
      err = std::max(err, std::abs(half[i] - full[i]) / tol);
    }
    if (!fixed_ && err > 1.0 && level > min_level) {
      --level;
      ++stats_.rejected;
      continue;
    }
    c = 2.0 * half - full;
    t += step_size(level);
    ++stats_.steps;
    if (!on_step(t, c)) return;
    if (!fixed_ && err < 0.2 && level < max_level) ++level;  // error ~ h^2: doubling h keeps it below 0.8
  }
}

}  // namespace oxystrat
