// The narrow boundary between physics and the Newton solver: a steady problem is its size, its
// residual and its analytic Jacobian. The solver sees nothing else.
#pragma once

#include <Eigen/Core>
#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <vector>

namespace oxystrat {

class SteadyProblem {
 public:
  virtual ~SteadyProblem() = default;
  virtual int size() const = 0;
  virtual void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const = 0;
  virtual void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const = 0;
  //! Residual magnitude that counts as zero for each equation (same units as the residual).
  virtual double residual_scale() const = 0;
};

struct NewtonOptions {
  int max_iterations = 60;
  double tolerance = 1e-12;  //!< max |r_i| / residual_scale() at convergence
};

struct NewtonReport {
  bool converged = false;
  int iterations = 0;
  double residual = 0.0;  //!< final max |r_i| / residual_scale()
};

//! What one Newton solve leaves for the next one on the same sparsity pattern: the symbolic
//! analysis and the last factorisation, reused while it still converges fast (chord steps).
struct NewtonWorkspace {
  Eigen::SparseMatrix<double> jacobian;
  Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>> lu;
  bool analysed = false;
  bool factored = false;
  int factorisations = 0;
};

//! Damped Newton: backtracking on the 2-norm of the residual; converged on max |r_i| / scale.
//! With a workspace, an old factorisation is tried first and refreshed when a step with it does
//! not cut the residual at least threefold.
NewtonReport solve_newton(const SteadyProblem& p, Eigen::VectorXd& x, const NewtonOptions& opts = {},
                          NewtonWorkspace* workspace = nullptr);

//! Central finite-difference Jacobian, for tests of the analytic one only.
Eigen::MatrixXd finite_difference_jacobian(const SteadyProblem& p, const Eigen::VectorXd& x, double rel_step = 1e-6);

}  // namespace oxystrat
