#include "solver/linalg/scalar_lu.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <utility>

#include <Eigen/OrderingMethods>

namespace oxystrat {


bool ScalarLu::has_pattern(const Eigen::SparseMatrix<double>& a) const {
  const auto n = static_cast<int>(a.rows());
  return n == n_ && pattern_outer_.size() == n + 1 && pattern_inner_.size() == a.nonZeros() &&
         std::equal(a.outerIndexPtr(), a.outerIndexPtr() + n + 1, pattern_outer_.data()) &&
         std::equal(a.innerIndexPtr(), a.innerIndexPtr() + a.nonZeros(), pattern_inner_.data());
}

void ScalarLu::adopt_symbolic(const ScalarLu& other) {
  if (other.supernodal_ || !other.symbolic_) return;
  supernodal_ = false;
  n_ = other.n_;
  perm_ = other.perm_;
  pattern_outer_ = other.pattern_outer_;
  pattern_inner_ = other.pattern_inner_;
  l_start_ = other.l_start_, l_row_ = other.l_row_, u_start_ = other.u_start_, u_row_ = other.u_row_;
  l_val_.resize(other.l_val_.size()), u_val_.resize(other.u_val_.size()), diag_.resize(other.diag_.size());
  rows_built_ = other.rows_built_;
  if (rows_built_) {
    lr_start_ = other.lr_start_, lr_col_ = other.lr_col_, ur_start_ = other.ur_start_, ur_col_ = other.ur_col_;
    l_to_row_ = other.l_to_row_, u_to_row_ = other.u_to_row_;
    lr_val_.resize(lr_col_.size()), ur_val_.resize(ur_col_.size());
  }
  work_.assign(n_, 0.0);
  mark_.assign(n_, -1);
  next_.assign(n_, 0);
  stack_.resize(n_);
  reach_.resize(n_);
  symbolic_ = true;
}

bool ScalarLu::factorize(const Eigen::SparseMatrix<double>& a, int supernodal_from) {
  const int n = static_cast<int>(a.rows());
  supernodal_ = n >= supernodal_from;
  if (supernodal_) {
    const bool same = n == n_ && pattern_outer_.size() == n + 1 && pattern_inner_.size() == a.nonZeros() &&
                      std::equal(a.outerIndexPtr(), a.outerIndexPtr() + n + 1, pattern_outer_.data()) &&
                      std::equal(a.innerIndexPtr(), a.innerIndexPtr() + a.nonZeros(), pattern_inner_.data());
    if (!same) {
      n_ = n;
      perm_.resize(0);  // the plain columns' ordering is not made here
      symbolic_ = false;
      rows_built_ = false;
      big_.analyzePattern(a);
      pattern_outer_ = Eigen::Map<const Eigen::VectorXi>(a.outerIndexPtr(), n + 1);
      pattern_inner_ = Eigen::Map<const Eigen::VectorXi>(a.innerIndexPtr(), a.nonZeros());
    }
    big_.factorize(a);
    return big_.info() == Eigen::Success;
  }
  // The ordering and the patterns of L and U depend on the pattern of A only: found once (COLAMD
  // and a depth-first search per column), kept while the pattern stays; a refactorisation is
  // then numeric only.
  const bool same = n == n_ && perm_.size() == n && pattern_outer_.size() == n + 1 &&
                    pattern_inner_.size() == a.nonZeros() &&
                    std::equal(a.outerIndexPtr(), a.outerIndexPtr() + n + 1, pattern_outer_.data()) &&
                    std::equal(a.innerIndexPtr(), a.innerIndexPtr() + a.nonZeros(), pattern_inner_.data());
  if (!same) {
    n_ = n;
    symbolic_ = false;
    rows_built_ = false;
    // Approximate minimum degree on the pattern of A + A^T (Amestoy, Davis & Duff 1996): the
    // blocks' patterns are symmetric (faces couple both ways), and it gives 25 % less fill than
    // COLAMD here (23.8 vs 31.6 entries per row at 1972 zones). Eigen returns the permutation
    // from new to old positions; perm_ needs old to new, hence the inverse.
    Eigen::PermutationMatrix<Eigen::Dynamic, Eigen::Dynamic, int> q;
    Eigen::AMDOrdering<int> amd;
    amd(a, q);
    const Eigen::PermutationMatrix<Eigen::Dynamic, Eigen::Dynamic, int> old_to_new = q.inverse();
    perm_ = old_to_new.indices();  // new position of old column (and row) i
    pattern_outer_ = Eigen::Map<const Eigen::VectorXi>(a.outerIndexPtr(), n + 1);
    pattern_inner_ = Eigen::Map<const Eigen::VectorXi>(a.innerIndexPtr(), a.nonZeros());
    work_.assign(n, 0.0);
    mark_.assign(n, -1);
    next_.assign(n, 0);
    stack_.resize(n);
    reach_.resize(n);
  }
  load_permuted(a);
  const bool ok = symbolic_ ? refactor_numeric() : factor_with_patterns();
  if (ok) transpose_factors();
  return ok;
}

// B = P A P^T in compressed columns.
void ScalarLu::load_permuted(const Eigen::SparseMatrix<double>& a) {
  const int n = n_;
  b_start_.assign(n + 1, 0);
  b_row_.resize(a.nonZeros());
  b_val_.resize(a.nonZeros());
  for (int j = 0; j < n; ++j) b_start_[perm_[j] + 1] = a.outerIndexPtr()[j + 1] - a.outerIndexPtr()[j];
  for (int j = 0; j < n; ++j) b_start_[j + 1] += b_start_[j];
  for (int j = 0; j < n; ++j) {
    int at = b_start_[perm_[j]];
    for (Eigen::SparseMatrix<double>::InnerIterator it(a, j); it; ++it, ++at) {
      b_row_[at] = perm_[it.row()];
      b_val_[at] = it.value();
    }
  }
}

bool ScalarLu::refactor_both(ScalarLu& a, const Eigen::SparseMatrix<double>& ma, ScalarLu& b,
                             const Eigen::SparseMatrix<double>& mb) {
  if (!a.symbolic_ || !b.symbolic_ || !a.same_symbolic(b) || !a.has_pattern(ma) || !b.has_pattern(mb)) return false;
  a.load_permuted(ma);
  b.load_permuted(mb);
  if (!refactor_together<2>({&a, &b})) return false;
  a.transpose_factors();
  b.transpose_factors();
  return true;
}

// Numeric refactorisation of N factorisations on one symbolic part (the first one's index arrays,
// each its own values and scratch), eliminating in the kept order: for N = 2 the two chains are
// independent and run interleaved; every number is computed as for N = 1.
template <int N>
bool ScalarLu::refactor_together(const std::array<ScalarLu*, N>& lu) {
  const ScalarLu& s = *lu[0];
  const int *bs = s.b_start_.data(), *br = s.b_row_.data();  // one pattern and permutation: the same rows
  const int *us = s.u_start_.data(), *ur = s.u_row_.data(), *ls = s.l_start_.data(), *lr = s.l_row_.data();
  std::array<double*, N> w, lv, uv;
  std::array<const double*, N> bv;
  for (int q = 0; q < N; ++q) {
    w[q] = lu[q]->work_.data(), bv[q] = lu[q]->b_val_.data();
    lv[q] = lu[q]->l_val_.data(), uv[q] = lu[q]->u_val_.data();
  }
  for (int k = 0; k < s.n_; ++k) {
    std::array<double, N> column_max{};
    for (int e = bs[k]; e < bs[k + 1]; ++e) {
      for (int q = 0; q < N; ++q) {
        w[q][br[e]] += bv[q][e];
        column_max[q] = std::max(column_max[q], std::abs(bv[q][e]));
      }
    }
    for (int e = us[k]; e < us[k + 1]; ++e) {
      const int j = ur[e];
      std::array<double, N> xj;
      for (int q = 0; q < N; ++q) xj[q] = w[q][j];
      for (int f = ls[j]; f < ls[j + 1]; ++f) {
        for (int q = 0; q < N; ++q) w[q][lr[f]] -= lv[q][f] * xj[q];
      }
    }
    for (int q = 0; q < N; ++q) {
      if (!lu[q]->take_pivot(k, column_max[q])) {
        for (int p = 0; p < N; ++p) std::fill(lu[p]->work_.begin(), lu[p]->work_.end(), 0.0);
        return false;
      }
    }
    for (int q = 0; q < N; ++q) {
      const double pivot = lu[q]->diag_[k];
      w[q][k] = 0.0;
      for (int e = us[k]; e < us[k + 1]; ++e) uv[q][e] = std::exchange(w[q][ur[e]], 0.0);
      for (int e = ls[k]; e < ls[k + 1]; ++e) lv[q][e] = std::exchange(w[q][lr[e]], 0.0) / pivot;
    }
  }
  return true;
}

bool ScalarLu::factor_with_patterns() {
  const int n = n_;
  rows_built_ = false;
  l_start_.assign(1, 0);
  u_start_.assign(1, 0);
  l_row_.clear();
  l_val_.clear();
  u_row_.clear();
  u_val_.clear();
  diag_.assign(n, 0.0);
  std::fill(mark_.begin(), mark_.end(), -1);
  for (int k = 0; k < n; ++k) {
    // Pattern of x = L^-1 B(:, k): everything reachable from B's rows through the columns of L
    // done so far, found by depth-first search; reach_[0, top) in reverse topological order.
    int top = 0;
    double column_max = 0.0;
    for (int e = b_start_[k]; e < b_start_[k + 1]; ++e) {
      const int start = b_row_[e];
      work_[start] += b_val_[e];
      column_max = std::max(column_max, std::abs(b_val_[e]));
      if (mark_[start] == k) continue;
      int depth = 0;
      stack_[0] = start;
      mark_[start] = k;
      next_[start] = start < k ? l_start_[start] : 0;
      while (depth >= 0) {
        const int node = stack_[depth];
        const int end = node < k ? l_start_[node + 1] : 0;
        bool descended = false;
        while (next_[node] < end) {
          const int child = l_row_[next_[node]++];
          if (mark_[child] == k) continue;
          mark_[child] = k;
          next_[child] = child < k ? l_start_[child] : 0;
          stack_[++depth] = child;
          descended = true;
          break;
        }
        if (!descended) {
          reach_[top++] = node;  // finished: postorder
          --depth;
        }
      }
    }
    // Numeric: in topological order (reverse postorder), eliminate with the columns of L.
    for (int t = top - 1; t >= 0; --t) {
      const int j = reach_[t];
      if (j >= k) continue;
      const double xj = work_[j];
      for (int e = l_start_[j]; e < l_start_[j + 1]; ++e) work_[l_row_[e]] -= l_val_[e] * xj;
    }
    if (!take_pivot(k, column_max)) return false;
    const double pivot = diag_[k];
    // U's column keeps the topological order: a numeric refactorisation eliminates in it.
    for (int t = top - 1; t >= 0; --t) {
      const int i = reach_[t];
      if (i < k) {
        u_row_.push_back(i);
        u_val_.push_back(work_[i]);
      } else if (i > k) {
        l_row_.push_back(i);
        l_val_.push_back(work_[i] / pivot);
      }
      work_[i] = 0.0;
    }
    l_start_.push_back(static_cast<int>(l_row_.size()));
    u_start_.push_back(static_cast<int>(u_row_.size()));
  }
  symbolic_ = true;
  return true;
}

// Diagonal pivots only: one below 1e-12 of its column is refused (the caller falls back), and
// the scratch is left clean for the next factorisation.
bool ScalarLu::take_pivot(int k, double column_max) {
  const double pivot = work_[k];
  if (!(std::abs(pivot) > 1e-12 * column_max) || !std::isfinite(pivot)) {
    std::fill(work_.begin(), work_.end(), 0.0);
    return false;
  }
  diag_[k] = pivot;
  return true;
}

bool ScalarLu::refactor_numeric() { return refactor_together<1>({this}); }

// The factors by rows for the solves: each unknown then gathers its sum from finished ones (no
// scattered stores, independent loads), which is what makes the triangular solves fast. The row
// patterns and where each entry goes are found once per symbolic factorisation; a numeric
// refactorisation only moves the values.
void ScalarLu::transpose_factors() {
  const auto by_rows = [n = n_](const std::vector<int>& start, const std::vector<int>& row, std::vector<int>& r_start,
                                std::vector<int>& r_col, std::vector<int>& to_row) {
    r_start.assign(n + 1, 0);
    for (const int i : row) ++r_start[i + 1];
    for (int i = 0; i < n; ++i) r_start[i + 1] += r_start[i];
    r_col.resize(row.size());
    to_row.resize(row.size());
    std::vector<int> at(r_start.begin(), r_start.end() - 1);
    for (int j = 0; j < n; ++j) {
      for (int e = start[j]; e < start[j + 1]; ++e) {
        const int to = at[row[e]]++;
        r_col[to] = j;
        to_row[e] = to;
      }
    }
  };
  if (!rows_built_) {
    by_rows(l_start_, l_row_, lr_start_, lr_col_, l_to_row_);
    by_rows(u_start_, u_row_, ur_start_, ur_col_, u_to_row_);
    rows_built_ = true;
  }
  lr_val_.resize(l_val_.size());
  ur_val_.resize(u_val_.size());
  for (size_t e = 0; e < l_val_.size(); ++e) lr_val_[l_to_row_[e]] = l_val_[e];
  for (size_t e = 0; e < u_val_.size(); ++e) ur_val_[u_to_row_[e]] = u_val_[e];
  inv_diag_.resize(n_);
  for (int k = 0; k < n_; ++k) inv_diag_[k] = 1.0 / diag_[k];
}

bool ScalarLu::same_symbolic(const ScalarLu& other) const {
  return !supernodal_ && !other.supernodal_ && rows_built_ && other.rows_built_ && n_ == other.n_ &&
         perm_ == other.perm_ && lr_start_ == other.lr_start_ && lr_col_ == other.lr_col_ &&
         ur_start_ == other.ur_start_ && ur_col_ == other.ur_col_;
}

// x_q <- LU_q^-1 x_q for N factorisations on one symbolic part, in one pass over the first one's
// row patterns (for N = 2, two independent triangular chains interleaved; the same numbers as N = 1).
template <int N>
void ScalarLu::solve_together(const std::array<const ScalarLu*, N>& lu, const std::array<Eigen::VectorXd*, N>& x) {
  const ScalarLu& s = *lu[0];
  const int n = s.n_;
  const int* perm = s.perm_.data();
  std::array<double*, N> y;
  std::array<const double*, N> lv, uv, inv;
  for (int q = 0; q < N; ++q) {
    lu[q]->solve_scratch_.resize(n);
    y[q] = lu[q]->solve_scratch_.data();
    lv[q] = lu[q]->lr_val_.data(), uv[q] = lu[q]->ur_val_.data(), inv[q] = lu[q]->inv_diag_.data();
    for (int i = 0; i < n; ++i) y[q][perm[i]] = (*x[q])[i];
  }
  const int *ls = s.lr_start_.data(), *lc = s.lr_col_.data();
  for (int i = 0; i < n; ++i) {
    std::array<double, N> sum;
    for (int q = 0; q < N; ++q) sum[q] = y[q][i];
    for (int e = ls[i]; e < ls[i + 1]; ++e) {
      for (int q = 0; q < N; ++q) sum[q] -= lv[q][e] * y[q][lc[e]];
    }
    for (int q = 0; q < N; ++q) y[q][i] = sum[q];
  }
  const int *us = s.ur_start_.data(), *uc = s.ur_col_.data();
  for (int i = n - 1; i >= 0; --i) {
    std::array<double, N> sum;
    for (int q = 0; q < N; ++q) sum[q] = y[q][i];
    for (int e = us[i]; e < us[i + 1]; ++e) {
      for (int q = 0; q < N; ++q) sum[q] -= uv[q][e] * y[q][uc[e]];
    }
    for (int q = 0; q < N; ++q) y[q][i] = sum[q] * inv[q][i];
  }
  for (int q = 0; q < N; ++q) {
    for (int i = 0; i < n; ++i) (*x[q])[i] = y[q][perm[i]];
  }
}

void ScalarLu::solve_both(const ScalarLu& a, const ScalarLu& b, Eigen::VectorXd& xa, Eigen::VectorXd& xb) {
  solve_together<2>({&a, &b}, {&xa, &xb});
}

void ScalarLu::solve(Eigen::VectorXd& x) const {
  if (supernodal_) {
    x = big_.solve(x).eval();
    return;
  }
  solve_together<1>({this}, {&x});
}

}  // namespace oxystrat
