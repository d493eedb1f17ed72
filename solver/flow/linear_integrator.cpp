#include "solver/flow/linear_integrator.hpp"
#include "input/errors.hpp"
#include "solver/linalg/fgmres.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace oxystrat {

LinearImplicitIntegrator::LinearImplicitIntegrator(Eigen::SparseMatrix<double> l, Eigen::VectorXd volume,
                                                   double h_initial, double rtol, double atol, double scale)
    : l_(std::move(l)), volume_(std::move(volume)), h_initial_(h_initial), rtol_(rtol), atol_(atol), scale_(scale) {}

double LinearImplicitIntegrator::step_size(int level) const { return h_initial_ * std::ldexp(1.0, level); }

Eigen::VectorXd LinearImplicitIntegrator::solve(int level, const Eigen::VectorXd& rhs) {
  if (l_.rows() >= multigrid_from_) return solve_multigrid(level, rhs);
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

// (V - h L) x = rhs by GMRES, preconditioned by multigrid on h L - V (the sign its M-matrix-like
// form takes: transport minus a non-negative diagonal). To 1e-10 relative: far inside the
// step's error control (1e-3).
Eigen::VectorXd LinearImplicitIntegrator::solve_multigrid(int level, const Eigen::VectorXd& rhs) {
  constexpr std::size_t kKept = 3;
  const double h = step_size(level);
  auto it = mg_.find(level);
  if (it == mg_.end()) {
    if (mg_.size() >= kKept) {
      mg_.erase(std::min_element(mg_.begin(), mg_.end(), [](const auto& a, const auto& b) {
        return a.second.last_used < b.second.last_used;
      }));
    }
    const Eigen::SparseMatrix<double> hl = h * l_;
    it = mg_.try_emplace(level).first;
    if (!it->second.mg.setup(hl, std::vector<double>(volume_.data(), volume_.data() + volume_.size()))) {
      mg_.erase(it);
      throw SolveError("transport: multigrid setup for (V - h L) failed");
    }
    ++stats_.factorisations;
  }
  it->second.last_used = ++solves_;
  const ScalarMultigrid& mg = it->second.mg;
  Fgmres krylov;
  Eigen::VectorXd x;
  const bool ok = krylov.solve(
      [&](const Eigen::VectorXd& in, Eigen::VectorXd& out) { out.noalias() = volume_.cwiseProduct(in) - h * (l_ * in); },
      [&mg](const Eigen::VectorXf& in, Eigen::VectorXf& out) {
        mg.precondition(in, out);  // ~ (h L - V)^-1 in
        out = -out;
      },
      rhs, x, 1e-10);
  if (!ok || !x.allFinite()) throw SolveError("transport: the solve of (V - h L) did not converge");
  return x;
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
