// Adaptive implicit integration of a linear system V dc/dt = L c (constant V, L). Each step is
// backward Euler with step h and, independently, with two steps h/2; their difference estimates
// the error and their Richardson combination (2nd order) is kept. Step sizes are h0 * 2^k, so the
// solver of (V - h L) is built once per size and reused: a sparse LU, or on a large network
// (where the LU's fill outgrows the memory) GMRES with aggregation multigrid, of which the three
// sizes used last are kept.
#pragma once

#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <functional>
#include <map>
#include <memory>

#include "solver/linalg/scalar_multigrid.hpp"

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
  //! From this many rows on, multigrid instead of the LU (tests exercise it on small systems).
  void set_multigrid_from(int rows) { multigrid_from_ = rows; }
  //! A million-zone LU asked for more than 20 GB; multigrid takes ~100 MB per step size there.
  static constexpr int kMultigridFromRows = 100000;

 private:
  using Lu = Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>>;
  struct Multigrid {
    ScalarMultigrid mg;
    long last_used = 0;
  };
  Eigen::VectorXd solve(int level, const Eigen::VectorXd& rhs);
  Eigen::VectorXd solve_multigrid(int level, const Eigen::VectorXd& rhs);
  double step_size(int level) const;

  Eigen::SparseMatrix<double> l_;
  Eigen::VectorXd volume_;
  double h_initial_;
  double rtol_, atol_, scale_;
  std::map<int, std::unique_ptr<Lu>> lu_;
  std::map<int, Multigrid> mg_;
  long solves_ = 0;
  int multigrid_from_ = kMultigridFromRows;
  IntegratorStats stats_;
  bool fixed_ = false;
};

}  // namespace oxystrat
