// The narrow boundary between physics and the Newton solver: a steady problem is its size, its
// residual and its analytic Jacobian. The solver sees nothing else.
#pragma once

#include <Eigen/Core>
#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <vector>

#include "solver/linalg/solver_options.hpp"
#include "solver/linalg/zone_block_solver.hpp"

namespace oxystrat {

class SteadyProblem {
 public:
  virtual ~SteadyProblem() = default;
  virtual int size() const = 0;
  virtual void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const = 0;
  virtual void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const = 0;
  //! Appends the Jacobian entries that zones [zone_begin, zone_end) of the zone layout contribute,
  //! such that jacobian() is their concatenation over any split into consecutive ranges. The
  //! structured solve then takes a large Jacobian in pieces (memory); a problem that cannot split
  //! its Jacobian returns false (the default) and is taken whole.
  virtual bool jacobian_zones(const Eigen::VectorXd& /*x*/, int /*zone_begin*/, int /*zone_end*/,
                              std::vector<Eigen::Triplet<double>>& /*t*/) const {
    return false;
  }
  //! The Jacobian by parts (ZoneBlockSolver::begin_parts): every entry of the zone-local blocks
  //! into `local`, the transports they add to into `transports`. Faster and leaner than listing
  //! it on a large network; a problem that cannot returns false (the default) and is listed.
  virtual bool jacobian_parts(const Eigen::VectorXd& /*x*/, std::vector<ZoneBlockSolver::LocalBlock>& /*local*/,
                              ZoneTransports& /*transports*/) const {
    return false;
  }
  //! Residual magnitude that counts as zero for each equation (same units as the residual).
  virtual double residual_scale() const = 0;
  //! The largest imbalance of a conserved quantity over the whole problem (a sum of residual
  //! entries, e.g. O2 fed minus O2 leaving and taken up), as a fraction of what the problem feeds
  //! (OxygenProblem: of the O2 fed). The max-norm test alone lets the residuals of N equations
  //! add up to N times its tolerance; Newton stops only when this is within
  //! NewtonOptions::balance_tolerance too. Default: nothing to conserve.
  virtual double largest_imbalance(const Eigen::VectorXd& /*r*/) const { return 0.0; }
  //! A problem with the zone layout of zone_block_solver.hpp says so here (zones > 0), and
  //! solve_newton then uses the structured linear solve; the default is a general sparse LU.
  virtual ZoneLayout zone_layout() const { return {}; }
  //! Keeps a trial iterate where the problem is defined, given the accepted iterate `x` it steps
  //! from (e.g. amounts that cannot be negative). Newton calls it on every trial point of its
  //! line search. It may move only components that a step takes out of the domain or most of the
  //! way to its edge, so that the short steps near a solution stay plain Newton steps.
  //! Default: every point is in the domain.
  virtual void keep_in_domain(const Eigen::VectorXd& /*x*/, Eigen::VectorXd& /*x_try*/) const {}
};

struct NewtonOptions {
  int max_iterations = 60;
  double tolerance = 1e-12;  //!< max |r_i| / residual_scale() at convergence
  //! SteadyProblem::largest_imbalance() at convergence: the vessel's O2 balance closes to 1e-9 of
  //! the O2 fed on networks of any size.
  double balance_tolerance = 1e-9;
  //! When > 0, the solve ends once the max |r_i| / residual_scale() has fallen this much below
  //! its start (or reached `tolerance`): a loose solve whose problem will change again.
  double reduction = 0.0;
  bool structured = true;    //!< use the structured solve when the problem has a zone layout
  SolverOptions linear;      //!< size thresholds of the linear solves and the nested start
};

struct NewtonReport {
  bool converged = false;
  int iterations = 0;
  double residual = 0.0;  //!< final max |r_i| / residual_scale()
  double imbalance = 0.0;  //!< final SteadyProblem::largest_imbalance()
  int linear_iterations = 0;  //!< Krylov iterations of the structured solve
  bool structured = false;    //!< the structured solve produced the result
  //! The structured solve failed and the problem was too large for the general LU to take over.
  bool general_lu_refused = false;
};

//! What one Newton solve leaves for the next one on the same sparsity pattern: the symbolic
//! analysis and the last factorisation, reused while it still converges fast (chord steps).
struct NewtonWorkspace {
  Eigen::SparseMatrix<double> jacobian;
  Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>> lu;
  bool analysed = false;
  bool factored = false;
  int factorisations = 0;
  //! The structured solve's preconditioner, kept between solves like the LU above.
  ZoneBlockSolver blocks;
  bool refresh_blocks = false;  //!< refactor the preconditioner before the next structured step
  //! Before a solve of another problem (e.g. the next sweep point): nothing numeric is carried
  //! over, so the result does not depend on what was solved before; orderings, symbolic factors
  //! and the Jacobian's slots are kept while the pattern stays.
  void start_new_problem() {
    refresh_blocks = true;
    analysed = factored = false;
  }
};

//! Damped Newton: backtracking on the 2-norm of the residual; converged on max |r_i| / scale and
//! on the problem's conserved totals (largest_imbalance()).
//! For a problem with a zone layout: inexact Newton, each step solved by the structured solver
//! (zone_block_solver.hpp) to a relative linear residual of at most 1e-4, tighter near the end so
//! that the last step lands inside the tolerance; should that solve fail, the general path
//! below continues from the current iterate. General path: with a workspace, an old
//! factorisation is tried first and refreshed when a step with it does not cut the residual at
//! least threefold.
NewtonReport solve_newton(const SteadyProblem& p, Eigen::VectorXd& x, const NewtonOptions& opts = {},
                          NewtonWorkspace* workspace = nullptr);

//! Central finite-difference Jacobian, for tests of the analytic one only.
Eigen::MatrixXd finite_difference_jacobian(const SteadyProblem& p, const Eigen::VectorXd& x, double rel_step = 1e-6);

}  // namespace oxystrat
