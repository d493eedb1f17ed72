// Aggregation-based algebraic multigrid for one scalar liquid block of the zone balances: an
// approximate inverse with O(N) cost and memory, used by the zone block solver's preconditioner
// on large networks in place of the exact ScalarLu.
//
// Method (algebraic: the matrix only, no grid): double pairwise aggregation on the symmetric part
// of the couplings (Notay 2010, ETNA 37; Notay 2012, SISC 34, for convection-diffusion matrices),
// piecewise-constant prolongation, Galerkin coarse operators P^T A P, a K-cycle (Notay &
// Vassilevski 2008: two GCR steps on each coarse level, which keeps the rate of the two-level
// method at any depth where plain aggregation's V- and W-cycles degrade), ILU(0) smoothing
// before and after the coarse correction (robust for convection, Wittum 1989), and ScalarLu on
// the coarsest level; where coarsening stalls above that size (rows that dominate their
// couplings, as a short implicit time step makes them), ILU(0) alone ends the cycle. The
// K-cycle makes the operator vary slightly with its argument, so the
// outer Krylov method must be flexible (the zone block solver's GMRES is).
//
// The blocks are transport with zero column sums minus a non-negative diagonal: -A is an
// M-matrix-like operator (positive diagonal, non-positive off-diagonals, column diagonally
// dominant), so the hierarchy is built for B = -A and solve() applies -B^-1, approximately.
#pragma once

#include <Eigen/Core>
#include <Eigen/Sparse>
#include <optional>
#include <vector>

#include "solver/linalg/five_point_ilu.hpp"
#include "solver/linalg/scalar_lu.hpp"

namespace oxystrat {

class ScalarMultigrid {
 public:
  //! Builds the hierarchy for A - diag(diagonal_shift) (no shift when empty). False when a pivot
  //! of the ILU(0) or of the coarsest LU is not of the sign of an M-matrix block. Coarsening stops
  //! at options.multigrid_coarsest_size rows.
  bool setup(const Eigen::SparseMatrix<double>& a, const std::vector<double>& diagonal_shift = {},
             const SolverOptions& options = {});
  //! x <- M^-1 x in place, M^-1 ~ A^-1: one K-cycle from a zero guess.
  void solve(Eigen::VectorXd& x) const;
  //! The same as a Krylov preconditioner (fgmres.hpp), whose vectors are single precision.
  void precondition(const Eigen::VectorXf& in, Eigen::VectorXf& out) const;
  //! One K-cycle from a zero guess for the right-hand side whose row i is rhs(i), read where it
  //! lies (no copy of it); the answer is then solution(), until the next cycle.
  template <class Rhs>
  void solve_with(const Rhs& rhs) const {
    const Level& top = levels_.front();
    for (int i = 0; i < top.n; ++i) top.b[i] = static_cast<float>(-rhs(i));  // B = -A
    cycle(0);
  }
  const std::vector<float>& solution() const { return levels_.front().x; }
  int levels() const { return static_cast<int>(levels_.size()); }
  long nonzeros() const;  //!< all levels' operators and smoothers and the coarsest factor

 private:
  struct Level {
    int n = 0;
    std::vector<int> start, col;  // B = -A of this level, compressed rows sorted by column
    std::vector<float> val;       // single precision: see setup()
    std::vector<int> diag_pos;    // ILU(0): position of the diagonal in each row
    std::vector<float> lu;        // ILU(0) factors on the pattern of B
    std::vector<float> inv_diag;  // 1 / U's diagonal: a product, not a division, on the solve's critical path
    std::vector<int> aggregate;   // coarse index of each row, -1 when left out of the coarse level
    // The finest level in five-point form when it has that shape; its compressed rows are then
    // released (the K-cycle multiplies only the coarse levels).
    std::optional<FivePointIlu> five_point;
    // Single precision too: the cycle's output is a preconditioner's (FGMRES keeps it in single
    // precision), and its sums are taken in double.
    mutable std::vector<float> x, b, r, v, w;  // v, w: the K-cycle's first direction and its image (not on level 0)
  };
  void cycle(int l) const;
  static void multiply(const Level& lev, const std::vector<float>& in, std::vector<float>& out);
  static void restrict_residual(const Level& lev, const std::vector<float>& b, const std::vector<float>& x,
                                std::vector<float>& coarse);
  // r = (LU)^-1 in, added to *add_to when given; with residual_of, of in - B residual_of instead
  // (each row's residual formed inside the forward sweep: one pass over the operator fewer).
  static void ilu_solve(const Level& lev, const std::vector<float>& in, std::vector<float>& r, std::vector<float>* add_to,
                        const std::vector<float>* residual_of = nullptr);

  std::vector<Level> levels_;
  ScalarLu coarsest_;
  mutable Eigen::VectorXd coarse_scratch_;
};

}  // namespace oxystrat
