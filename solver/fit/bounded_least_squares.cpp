#include "solver/fit/bounded_least_squares.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <limits>

namespace oxystrat {

std::vector<int> free_indices(const std::vector<bool>& free) {
  std::vector<int> out;
  for (int j = 0; j < static_cast<int>(free.size()); ++j) {
    if (free[static_cast<size_t>(j)]) out.push_back(j);
  }
  return out;
}

LeastSquaresResult bounded_levenberg_marquardt(const Residuals& f, Eigen::VectorXd p, const std::vector<bool>& free,
                                               const Eigen::VectorXd& lo, const Eigen::VectorXd& hi, int max_iterations) {
  const auto idx = free_indices(free);
  const auto nf = static_cast<Eigen::Index>(idx.size());
  p = p.cwiseMax(lo).cwiseMin(hi);
  Eigen::VectorXd r, r_trial;
  Eigen::MatrixXd Jfull;
  f(p, r, &Jfull);
  double cost = 0.5 * r.squaredNorm();
  Eigen::VectorXd scale = Eigen::VectorXd::Zero(nf);
  double lambda = -1.0, nu = 2.0;
  LeastSquaresResult out;
  for (int it = 0; it < max_iterations; ++it) {
    out.iterations = it + 1;
    Eigen::MatrixXd J(Jfull.rows(), nf);
    for (Eigen::Index j = 0; j < nf; ++j) {
      J.col(j) = Jfull.col(idx[static_cast<size_t>(j)]);
      scale[j] = std::max(scale[j], J.col(j).norm());
      if (scale[j] == 0.0) scale[j] = 1.0;
    }
    const Eigen::VectorXd grad = J.transpose() * r;
    // Active bounds: on the bound with the descent direction pointing outwards.
    std::vector<Eigen::Index> act;
    double worst_cos = 0.0;
    for (Eigen::Index j = 0; j < nf; ++j) {
      const int q = idx[static_cast<size_t>(j)];
      const bool at_lo = p[q] <= lo[q] && grad[j] > 0.0;
      const bool at_hi = p[q] >= hi[q] && grad[j] < 0.0;
      if (at_lo || at_hi) continue;
      act.push_back(j);
      const double denom = J.col(j).norm() * r.norm();
      if (denom > 0.0) worst_cos = std::max(worst_cos, std::abs(grad[j]) / denom);
    }
    // Stationary (the residual is orthogonal to every free column) or an exact fit.
    if (act.empty() || worst_cos <= 1e-10 || cost == 0.0) {
      out.converged = true;
      break;
    }
    const auto na = static_cast<Eigen::Index>(act.size());
    Eigen::MatrixXd Js(J.rows(), na);
    for (Eigen::Index a = 0; a < na; ++a) Js.col(a) = J.col(act[static_cast<size_t>(a)]) / scale[act[static_cast<size_t>(a)]];
    const Eigen::MatrixXd A = Js.transpose() * Js;
    const Eigen::VectorXd gs = Js.transpose() * r;
    if (lambda < 0.0) lambda = 1e-3 * A.diagonal().maxCoeff();
    bool accepted = false;
    bool done = false;
    while (!accepted) {
      const Eigen::MatrixXd M = A + lambda * Eigen::MatrixXd::Identity(na, na);
      const Eigen::VectorXd hs = M.ldlt().solve(-gs);
      Eigen::VectorXd trial = p;
      for (Eigen::Index a = 0; a < na; ++a) {
        const auto j = act[static_cast<size_t>(a)];
        const int q = idx[static_cast<size_t>(j)];
        trial[q] = std::clamp(p[q] + hs[a] / scale[j], lo[q], hi[q]);
      }
      // Predicted reduction of the linear model for the projected step.
      Eigen::VectorXd step(nf);
      for (Eigen::Index j = 0; j < nf; ++j) step[j] = trial[idx[static_cast<size_t>(j)]] - p[idx[static_cast<size_t>(j)]];
      const double predicted = cost - 0.5 * (r + J * step).squaredNorm();
      f(trial, r_trial, nullptr);
      const double trial_cost = 0.5 * r_trial.squaredNorm();
      const double rho = predicted > 0.0 && std::isfinite(trial_cost) ? (cost - trial_cost) / predicted : -1.0;
      if (rho > 1e-4) {
        accepted = true;
        double step_norm = 0.0, p_norm = 0.0;
        for (Eigen::Index j = 0; j < nf; ++j) {
          step_norm += std::pow(step[j] * scale[j], 2);
          p_norm += std::pow(p[idx[static_cast<size_t>(j)]] * scale[j], 2);
        }
        const double reduction = cost - trial_cost;
        p = trial;
        cost = trial_cost;
        lambda *= std::max(1.0 / 3.0, 1.0 - std::pow(2.0 * rho - 1.0, 3));
        nu = 2.0;
        // Steps that no longer move the parameters or the cost: converged.
        if (std::sqrt(step_norm) <= 1e-11 * (std::sqrt(p_norm) + 1e-11) || reduction <= 1e-15 * cost) done = true;
      } else {
        lambda *= nu;
        nu *= 2.0;
        // No step lowers the cost any more: a minimum if the gradient is small, else stuck.
        if (lambda > 1e16 * std::max(1.0, A.diagonal().maxCoeff())) {
          out.p = p;
          out.cost = cost;
          out.converged = worst_cos <= 1e-6;
          return out;
        }
      }
    }
    f(p, r, &Jfull);
    if (done) {
      out.converged = true;
      break;
    }
  }
  out.p = p;
  out.cost = cost;
  return out;
}

}  // namespace oxystrat
