#include "steady_problem.hpp"

#include <Eigen/SparseLU>
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

NewtonReport solve_newton(const SteadyProblem& p, Eigen::VectorXd& x, const NewtonOptions& opts) {
  NewtonReport rep;
  const int n = p.size();
  Eigen::VectorXd r(n), r_try(n);
  std::vector<Eigen::Triplet<double>> triplets;
  Eigen::SparseMatrix<double> jac(n, n);
  Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>> lu;
  bool analysed = false;
  double m = merit(p, x, r);
  for (rep.iterations = 0; rep.iterations < opts.max_iterations; ++rep.iterations) {
    rep.residual = max_norm(p, r);
    if (rep.residual < opts.tolerance) {
      rep.converged = true;
      return rep;
    }
    triplets.clear();
    p.jacobian(x, triplets);
    jac.setFromTriplets(triplets.begin(), triplets.end());
    jac.makeCompressed();
    if (!analysed) {
      lu.analyzePattern(jac);
      analysed = true;
    }
    lu.factorize(jac);
    if (lu.info() != Eigen::Success) return rep;
    const Eigen::VectorXd dx = lu.solve(-r);
    if (!dx.allFinite()) return rep;
    double lambda = 1.0;
    Eigen::VectorXd x_try;
    double m_try = m;
    for (int k = 0; k < 40; ++k, lambda *= 0.5) {
      x_try = x + lambda * dx;
      m_try = merit(p, x_try, r_try);
      if (m_try < (1.0 - 1e-4 * lambda) * m) break;  // Armijo on 1/2 |r|^2
    }
    if (!(m_try < m)) return rep;  // no decrease along the Newton direction: stop with what we have
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
