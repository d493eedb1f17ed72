#include "steady_problem.hpp"

#include <cmath>

namespace oxystrat {
namespace {

// Scaled max norm (the convergence test) and scaled 2-norm squared (the line-search merit).
double max_norm(const SteadyProblem& p, const Eigen::VectorXd& r) { return r.cwiseAbs().maxCoeff() / p.residual_scale(); }

double merit(const SteadyProblem& p, const Eigen::VectorXd& x, Eigen::VectorXd& r) {
  p.residual(x, r);
  if (!r.allFinite()) return std::numeric_limits<double>::infinity();
  return (r / p.residual_scale()).squaredNorm();
}

}  // namespace

NewtonReport solve_newton(const SteadyProblem& p, Eigen::VectorXd& x, const NewtonOptions& opts, NewtonWorkspace* workspace) {
  NewtonReport rep;
  const int n = p.size();
  NewtonWorkspace local;
  NewtonWorkspace& ws = workspace != nullptr ? *workspace : local;
  if (ws.analysed && ws.jacobian.rows() != n) ws.analysed = ws.factored = false;  // another problem size
  Eigen::VectorXd r(n), r_try(n);
  std::vector<Eigen::Triplet<double>> triplets;
  bool fresh = false;
  const auto refactor = [&] {
    triplets.clear();
    p.jacobian(x, triplets);
    ws.jacobian.resize(n, n);
    ws.jacobian.setFromTriplets(triplets.begin(), triplets.end());
    ws.jacobian.makeCompressed();
    if (!ws.analysed) {
      ws.lu.analyzePattern(ws.jacobian);
      ws.analysed = true;
    }
    ws.lu.factorize(ws.jacobian);
    ws.factored = ws.lu.info() == Eigen::Success;
    ++ws.factorisations;
    fresh = true;
    return ws.factored;
  };
  double m = merit(p, x, r);
  for (rep.iterations = 0; rep.iterations < opts.max_iterations; ++rep.iterations) {
    rep.residual = max_norm(p, r);
    if (rep.residual < opts.tolerance) {
      rep.converged = true;
      return rep;
    }
    if (!ws.factored && !refactor()) return rep;
    const Eigen::VectorXd dx = ws.lu.solve(-r);
    if (!dx.allFinite()) {
      if (fresh || !refactor()) return rep;
      continue;
    }
    if (!fresh) {
      // Chord step with an old factorisation: keep it only if it cuts |r| at least threefold.
      Eigen::VectorXd x_try = x + dx;
      const double m_try = merit(p, x_try, r_try);
      if (m_try < m / 9.0) {
        x = x_try;
        r = r_try;
        m = m_try;
      } else if (!refactor()) {
        return rep;
      }
      continue;
    }
    double lambda = 1.0;
    Eigen::VectorXd x_try;
    double m_try = m;
    for (int k = 0; k < 40; ++k, lambda *= 0.5) {
      x_try = x + lambda * dx;
      m_try = merit(p, x_try, r_try);
      if (m_try < (1.0 - 1e-4 * lambda) * m) break;  // Armijo on 1/2 |r|^2
    }
    if (!(m_try < m)) return rep;  // no decrease along the Newton direction: stop with what we have
    // Near the solution (a full step that cut |r| tenfold) the factorisation is worth keeping.
    const bool keep = lambda == 1.0 && m_try < m / 100.0;
    if (!keep) ws.factored = false;
    fresh = false;
    x = x_try;
    r = r_try;
    m = m_try;
  }
  rep.residual = max_norm(p, r);
  rep.converged = rep.residual < opts.tolerance;
  return rep;
}

Eigen::MatrixXd finite_difference_jacobian(const SteadyProblem& p, const Eigen::VectorXd& x, double rel_step) {
  const int n = p.size();
  Eigen::MatrixXd j(n, n);
  Eigen::VectorXd rp(n), rm(n);
  for (int i = 0; i < n; ++i) {
    const double h = rel_step * std::max(std::abs(x[i]), 1e-6);
    Eigen::VectorXd xp = x, xm = x;
    xp[i] += h;
    xm[i] -= h;
    p.residual(xp, rp);
    p.residual(xm, rm);
    j.col(i) = (rp - rm) / (2.0 * h);
  }
  return j;
}

}  // namespace oxystrat
