// Exact sparse LU of one scalar liquid block (transport plus transfer diagonal): the zone block
// solver's preconditioner on small and mid-sized networks, and the coarsest level of the
// multigrid on large ones.
#pragma once

#include <Eigen/Core>
#include <Eigen/Sparse>
#include <Eigen/SparseLU>
#include <array>
#include <vector>

#include "solver/linalg/solver_options.hpp"

namespace oxystrat {

//! Sparse LU without pivoting of P A P^T (left-looking, Gilbert & Peierls 1988), P a fill-reducing
//! ordering (approximate minimum degree on A + A^T, Amestoy, Davis & Duff 1996) applied to rows
//! and columns alike. Meant for the
//! liquid blocks here: transport with zero column sums minus a non-negative diagonal is column
//! diagonally dominant, so the diagonal pivots are stable; a pivot that is not (below 1e-12 of
//! its column) makes factorize() fail. Plain compressed-column factors, so a solve is two simple
//! triangular sweeps.
class ScalarLu {
 public:
  //! Keeps the ordering while the pattern stays; blocks of `supernodal_from` rows or more go to
  //! Eigen's supernodal SparseLU (SolverOptions::supernodal_lu_from).
  bool factorize(const Eigen::SparseMatrix<double>& a, int supernodal_from = SolverOptions{}.supernodal_lu_from);
  void solve(Eigen::VectorXd& x) const;                   //!< in place
  //! True when `other` holds factors of the same ordering and patterns (plain columns), e.g.
  //! after adopt_symbolic(): solve_both() then applies.
  bool same_symbolic(const ScalarLu& other) const;
  //! xa <- A^-1 xa and xb <- B^-1 xb for two factorisations with the same symbolic part, in one
  //! pass over the shared patterns: the two triangular chains are independent, so they run
  //! interleaved (bit-identical to two solve() calls).
  //! Numeric refactorisation of a and b (matrices with the patterns of their last factorisations,
  //! one symbolic part, same_symbolic()) in one pass; the factors are those of two factorize()
  //! calls to the bit. False when the conditions do not hold or a pivot is refused.
  static bool refactor_both(ScalarLu& a, const Eigen::SparseMatrix<double>& ma, ScalarLu& b,
                            const Eigen::SparseMatrix<double>& mb);
  static void solve_both(const ScalarLu& a, const ScalarLu& b, Eigen::VectorXd& xa, Eigen::VectorXd& xb);
  //! The last factorisation was of a matrix with a's pattern (its ordering applies to a).
  bool has_pattern(const Eigen::SparseMatrix<double>& a) const;
  //! Takes over the ordering and symbolic factors of `other` (plain columns), so that the next
  //! factorize() of a matrix with its pattern is numeric only.
  void adopt_symbolic(const ScalarLu& other);
  long nonzeros() const {
    return supernodal_ ? static_cast<long>(big_.nnzL() + big_.nnzU())
                       : static_cast<long>(l_val_.size() + u_val_.size() + diag_.size());
  }
 private:
  bool supernodal_ = false;
  Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>> big_;
  int n_ = 0;
  Eigen::VectorXi perm_, pattern_outer_, pattern_inner_;  // new index of old row/col; pattern the ordering was made for
  bool factor_with_patterns();  // symbolic and numeric, on b_*
  void load_permuted(const Eigen::SparseMatrix<double>& a);  // b_* = P A P^T
  template <int N>
  static bool refactor_together(const std::array<ScalarLu*, N>& lu);
  template <int N>
  static void solve_together(const std::array<const ScalarLu*, N>& lu, const std::array<Eigen::VectorXd*, N>& x);
  bool refactor_numeric();      // numeric only, on the patterns found before
  bool take_pivot(int k, double column_max);  // diag_[k] = work_[k] when it is a usable pivot
  void transpose_factors();     // the row copies the solves use
  bool symbolic_ = false;       // l_/u_ patterns are those of the current ordering
  std::vector<int> b_start_, b_row_;  // P A P^T by columns
  std::vector<double> b_val_;
  std::vector<int> l_start_, l_row_, u_start_, u_row_;  // by columns (U in elimination order)
  std::vector<double> l_val_, u_val_, diag_;
  std::vector<int> lr_start_, lr_col_, ur_start_, ur_col_;  // the same by rows
  std::vector<int> l_to_row_, u_to_row_;  // where each column entry of L, U sits in the row copies
  bool rows_built_ = false;               // lr_/ur_ patterns and the maps match the symbolic part
  std::vector<double> lr_val_, ur_val_, inv_diag_;
  mutable Eigen::VectorXd solve_scratch_;
  // Scratch for the factorisation.
  std::vector<double> work_;
  std::vector<int> mark_, stack_, next_, reach_;
};

}  // namespace oxystrat
