// Adaptive implicit integration of a linear system V dc/dt = L c (constant V, L). Each step is
// backward Euler with step h and, independently, with two steps h/2; their difference estimates
// the error and their Richardson combination (2nd order) is kept. Step sizes are h0 * 2^k, so the
// LU factorisation of (V - h L) is computed once per size and reused.
#pragma once

#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <functional>
#include <map>
#include <memory>

namespace oxystrat {

struct IntegratorStats {
  int steps = 0;
  int rejected = 0;
  int factorisations = 0;
};

class LinearImplicitIntegrator {
 public:
  //! `scale`: the concentration level errors are measured against (absolute tolerance = atol*scale).
  LinearImplicitIntegrator(Eigen::SparseMatrix<double> l, Eigen::VectorXd volume, double h_initial,
                           double rtol = 1e-3, double atol = 1e-4, double scale = 1.0);

  //! Advances c from t = 0 until `on_step(t, c)` returns false or t reaches t_end.
  void run(Eigen::VectorXd& c, double t_end, const std::function<bool(double, const Eigen::VectorXd&)>& on_step);

  const IntegratorStats& stats() const { return stats_; }
  //! Keep the initial step size throughout (for order-of-accuracy tests).
  void fix_step(bool fixed) { fixed_ = fixed; }

 private:
  using Lu = Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>>;
  Eigen::VectorXd solve(int level, const Eigen::VectorXd& rhs);
  double step_size(int level) const;

  Eigen::SparseMatrix<double> l_;
  Eigen::VectorXd volume_;
  double h_initial_;
  double rtol_, atol_, scale_;
  std::map<int, std::unique_ptr<Lu>> lu_;
  IntegratorStats stats_;
  bool fixed_ = false;
};

}  // namespace oxystrat
