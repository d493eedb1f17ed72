#include "solver/linalg/scalar_multigrid.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {
namespace {

// Compressed rows of one level's operator.
struct Csr {
  int n = 0;
  std::vector<int> start, col;
  std::vector<double> val;
};

// B = -(A - diag(shift)) by compressed rows, from A by columns (a counting transpose, so the rows
// come out sorted by column); every stored entry is kept, explicit zeros included.
Csr negated_rows(const Eigen::SparseMatrix<double>& a, const std::vector<double>& shift) {
  Csr c;
  c.n = static_cast<int>(a.rows());
  const int nnz = static_cast<int>(a.nonZeros());
  c.start.assign(c.n + 1, 0);
  c.col.resize(nnz);
  c.val.resize(nnz);
  for (int j = 0; j < a.outerSize(); ++j) {
    for (Eigen::SparseMatrix<double>::InnerIterator it(a, j); it; ++it) ++c.start[it.row() + 1];
  }
  for (int i = 0; i < c.n; ++i) c.start[i + 1] += c.start[i];
  std::vector<int> at(c.start.begin(), c.start.end() - 1);
  for (int j = 0; j < a.outerSize(); ++j) {
    for (Eigen::SparseMatrix<double>::InnerIterator it(a, j); it; ++it) {
      const int i = static_cast<int>(it.row()), e = at[i]++;
      c.col[e] = j;
      c.val[e] = -(i == j && !shift.empty() ? it.value() - shift[i] : it.value());
    }
  }
  return c;
}

// One pass of pairwise aggregation (Notay 2010, with the symmetric part of the couplings for a
// nonsymmetric matrix as in Notay 2012): in natural order, each row not yet aggregated is paired
// with its strongest not-yet-aggregated neighbour among the strong ones (coupling at least
// beta = 0.25 of the row's strongest), or stays alone. Rows whose diagonal is at least 5 times
// their off-diagonal sum are left out of the coarse level (aggregate -1): the smoother alone
// resolves them. Returns the number of aggregates.
int pair_up(const Csr& b, std::vector<int>& aggregate) {
  const int n = b.n;
  // Transpose pattern and values: the column couplings b_ji of row i.
  std::vector<int> t_start(n + 1, 0), t_col(b.col.size());
  std::vector<double> t_val(b.col.size());
  for (int e = 0; e < b.start[n]; ++e) ++t_start[b.col[e] + 1];
  for (int i = 0; i < n; ++i) t_start[i + 1] += t_start[i];
  {
    std::vector<int> at(t_start.begin(), t_start.end() - 1);
    for (int i = 0; i < n; ++i) {
      for (int e = b.start[i]; e < b.start[i + 1]; ++e) {
        const int k = at[b.col[e]]++;
        t_col[k] = i;
        t_val[k] = b.val[e];
      }
    }
  }
  constexpr double kBeta = 0.25, kDominant = 5.0;
  aggregate.assign(n, -2);  // -2: not yet decided
  std::vector<double> s(n, 0.0);
  std::vector<int> touched;
  int count = 0;
  for (int i = 0; i < n; ++i) {
    if (aggregate[i] != -2) continue;
    double diag = 0.0, off = 0.0;
    touched.clear();
    for (int e = b.start[i]; e < b.start[i + 1]; ++e) {
      const int j = b.col[e];
      if (j == i) {
        diag += b.val[e];
        continue;
      }
      off += std::abs(b.val[e]);
      if (s[j] == 0.0) touched.push_back(j);
      s[j] -= 0.5 * b.val[e];
    }
    for (int e = t_start[i]; e < t_start[i + 1]; ++e) {
      const int j = t_col[e];
      if (j == i) continue;
      if (s[j] == 0.0) touched.push_back(j);
      s[j] -= 0.5 * t_val[e];
    }
    if (diag >= kDominant * off) {
      aggregate[i] = -1;
    } else {
      double strongest = 0.0;
      for (const int j : touched) strongest = std::max(strongest, s[j]);
      int best = -1;
      for (const int j : touched) {
        if (aggregate[j] != -2 || j == i || !(s[j] >= kBeta * strongest) || !(s[j] > 0.0)) continue;
        if (best < 0 || s[j] > s[best] || (s[j] == s[best] && j < best)) best = j;
      }
      aggregate[i] = count;
      if (best >= 0) aggregate[best] = count;
      ++count;
    }
    for (const int j : touched) s[j] = 0.0;
  }
  return count;
}

// Galerkin operator P^T B P for piecewise-constant P: entries summed by aggregate, coarse rows
// assembled in fine-row order (deterministic, no sort).
Csr galerkin(const Csr& b, const std::vector<int>& aggregate, int coarse) {
  std::vector<int> m_start(coarse + 1, 0), members;
  for (const int a : aggregate) {
    if (a >= 0) ++m_start[a + 1];
  }
  for (int a = 0; a < coarse; ++a) m_start[a + 1] += m_start[a];
  members.resize(m_start[coarse]);
  {
    std::vector<int> at(m_start.begin(), m_start.end() - 1);
    for (int i = 0; i < b.n; ++i) {
      if (aggregate[i] >= 0) members[at[aggregate[i]]++] = i;
    }
  }
  // Two passes (count, then fill) so that the coarse rows take exactly their memory.
  Csr c;
  c.n = coarse;
  c.start.assign(coarse + 1, 0);
  std::vector<int> where(coarse, -1);
  for (int pass = 0; pass < 2; ++pass) {
    if (pass == 1) {
      for (int a = 0; a < coarse; ++a) c.start[a + 1] += c.start[a];
      c.col.resize(c.start[coarse]);
      c.val.resize(c.start[coarse]);
      std::fill(where.begin(), where.end(), -1);
    }
    for (int a = 0; a < coarse; ++a) {
      const int row_begin = pass == 0 ? 0 : c.start[a];
      int row_end = row_begin;
      for (int m = m_start[a]; m < m_start[a + 1]; ++m) {
        const int i = members[m];
        for (int e = b.start[i]; e < b.start[i + 1]; ++e) {
          const int ca = aggregate[b.col[e]];
          if (ca < 0) continue;
          if (pass == 0) {
            if (where[ca] != a) where[ca] = a, ++c.start[a + 1];
          } else if (where[ca] < row_begin) {
            where[ca] = row_end;
            c.col[row_end] = ca;
            c.val[row_end++] = b.val[e];
          } else {
            c.val[where[ca]] += b.val[e];
          }
        }
      }
    }
  }
  return c;
}

}  // namespace


namespace {

// ILU(0) on the operator's pattern, rows sorted by column (IKJ variant). It exists and is stable
// for an M-matrix (Meijerink & van der Vorst 1977).
bool ilu0(const std::vector<int>& start, const std::vector<int>& col, std::vector<double>& lu, std::vector<int>& diag_pos) {
  const int n = static_cast<int>(start.size()) - 1;
  diag_pos.assign(n, -1);
  std::vector<int> where(n, -1);
  for (int i = 0; i < n; ++i) {
    for (int e = start[i]; e < start[i + 1]; ++e) {
      where[col[e]] = e;
      if (col[e] == i) diag_pos[i] = e;
    }
    if (diag_pos[i] < 0) return false;
    for (int e = start[i]; e < diag_pos[i]; ++e) {
      const int k = col[e];
      const double l = lu[e] /= lu[diag_pos[k]];
      for (int f = diag_pos[k] + 1; f < start[k + 1]; ++f) {
        const int w = where[col[f]];
        if (w >= start[i]) lu[w] -= l * lu[f];
      }
    }
    if (!(lu[diag_pos[i]] > 0.0) || !std::isfinite(lu[diag_pos[i]])) return false;
    for (int e = start[i]; e < start[i + 1]; ++e) where[col[e]] = -1;
  }
  return true;
}

void sort_rows(Csr& b) {
  std::vector<std::pair<int, double>> row;
  for (int i = 0; i < b.n; ++i) {
    if (std::is_sorted(b.col.begin() + b.start[i], b.col.begin() + b.start[i + 1])) continue;  // the finest level's are
    row.clear();
    for (int e = b.start[i]; e < b.start[i + 1]; ++e) row.emplace_back(b.col[e], b.val[e]);
    std::sort(row.begin(), row.end());
    for (int e = b.start[i], k = 0; e < b.start[i + 1]; ++e, ++k) b.col[e] = row[k].first, b.val[e] = row[k].second;
  }
}

double dot(const std::vector<float>& a, const std::vector<float>& b) {
  double s = 0.0;
  for (std::size_t i = 0; i < a.size(); ++i) s += a[i] * b[i];
  return s;
}

}  // namespace

bool ScalarMultigrid::setup(const Eigen::SparseMatrix<double>& a, const std::vector<double>& diagonal_shift,
                            const SolverOptions& options) {
  levels_.clear();
  Csr b = negated_rows(a, diagonal_shift);
  for (;;) {
    Level lev;
    lev.n = b.n;
    lev.x.assign(b.n, 0.0);
    lev.b.assign(b.n, 0.0);
    lev.r.assign(b.n, 0.0);
    if (!levels_.empty()) {  // the K-cycle's vectors live on the coarse levels
      lev.v.assign(b.n, 0.0);
      lev.w.assign(b.n, 0.0);
    }
    // Double pairwise aggregation: aggregates of up to four rows, coarsening by about 4. A level
    // of options.multigrid_eightfold_from_rows rows or more is paired a third time (up to eight
    // rows): the K-cycle then spends a quarter, not a half, of this level's work below it.
    Csr coarse;
    bool last = b.n <= options.multigrid_coarsest_size;
    bool smoother_only = false;
    if (!last) {
      const int passes = b.n >= options.multigrid_eightfold_from_rows ? 3 : 2;
      lev.aggregate.resize(b.n);
      for (int i = 0; i < b.n; ++i) lev.aggregate[i] = i;
      int count = b.n;
      for (int pass = 0; pass < passes && count > 0; ++pass) {
        std::vector<int> pairs;
        count = pair_up(pass == 0 ? b : coarse, pairs);
        for (int& a : lev.aggregate) a = a < 0 ? -1 : pairs[a];
        coarse = galerkin(pass == 0 ? b : coarse, pairs, count);
      }
      last = count == 0 || count > 0.8 * b.n;  // coarsening has stalled
      // Stalled above the coarsest size: rows that dominate their couplings (a short implicit
      // step, V >> h L) or no strong pairs. The smoother alone then ends the cycle; an LU of a
      // level this large would cost more than the whole hierarchy.
      smoother_only = last;
    }
    if (last && !smoother_only) {
      lev.aggregate.clear();
      std::vector<Eigen::Triplet<double>> t;
      t.reserve(b.col.size());
      for (int i = 0; i < b.n; ++i) {
        for (int e = b.start[i]; e < b.start[i + 1]; ++e) t.emplace_back(i, b.col[e], b.val[e]);
      }
      Eigen::SparseMatrix<double> m(b.n, b.n);
      m.setFromTriplets(t.begin(), t.end());
      m.makeCompressed();
      if (!coarsest_.factorize(m, options.supernodal_lu_from)) return false;
      coarse_scratch_.resize(b.n);
    } else {
      if (smoother_only) lev.aggregate.clear();
      sort_rows(b);
      std::vector<double> lu = b.val;
      if (!ilu0(b.start, b.col, lu, lev.diag_pos)) return false;
      // U's rows are kept divided by their diagonal, so that the backward sweep's chain from
      // row to row is one multiply and one subtraction (see ilu_solve).
      lev.inv_diag.resize(b.n);
      for (int i = 0; i < b.n; ++i) {
        const double d = 1.0 / lu[lev.diag_pos[i]];
        lev.inv_diag[i] = static_cast<float>(d);
        for (int e = lev.diag_pos[i] + 1; e < b.start[i + 1]; ++e) lu[e] *= d;
      }
      lev.lu.assign(lu.begin(), lu.end());
    }
    // Operators and factors are computed in double and kept in single precision: a preconditioner
    // needs no more, and the cycle then streams 8 instead of 12 bytes per entry (on networks too
    // large for the caches the cycle runs at memory speed). Sums stay in double.
    lev.start = std::move(b.start);
    lev.col = std::move(b.col);
    lev.val.assign(b.val.begin(), b.val.end());
    if (levels_.empty() && !lev.lu.empty()) {
      lev.five_point = FivePointIlu::from_rows(lev.start, lev.col, lev.val, lev.lu, lev.diag_pos, lev.inv_diag);
      if (lev.five_point) {
        for (auto* v : {&lev.start, &lev.col, &lev.diag_pos}) std::vector<int>().swap(*v);
        for (auto* v : {&lev.val, &lev.lu, &lev.inv_diag}) std::vector<float>().swap(*v);
      }
    }
    levels_.push_back(std::move(lev));
    if (last) return true;
    b = std::move(coarse);
  }
}

long ScalarMultigrid::nonzeros() const {
  long total = coarsest_.nonzeros();
  for (const auto& l : levels_) total += static_cast<long>(l.val.size() + l.lu.size()) + (l.five_point ? l.five_point->nonzeros() : 0);
  return total;
}

namespace {
// Row i of a level's operator (compressed rows) times x.
inline double row_product(const int* start, const int* col, const float* val, const float* x, int i) {
  double s = 0.0;
  for (int e = start[i]; e < start[i + 1]; ++e) s += val[e] * x[col[e]];
  return s;
}
}  // namespace

void ScalarMultigrid::multiply(const Level& lev, const std::vector<float>& in, std::vector<float>& out) {
  const int *start = lev.start.data(), *col = lev.col.data();
  const float* val = lev.val.data();
  for (int i = 0; i < lev.n; ++i) out[i] = static_cast<float>(row_product(start, col, val, in.data(), i));
}

// The residual b - B x row by row, summed straight into the coarse right-hand side (restriction
// by the aggregates): one pass over the operator, none over a residual vector.
void ScalarMultigrid::restrict_residual(const Level& lev, const std::vector<float>& b, const std::vector<float>& x,
                                        std::vector<float>& coarse) {
  if (lev.five_point) {
    lev.five_point->restrict_residual(b, x, lev.aggregate, coarse);
    return;
  }
  const int *start = lev.start.data(), *col = lev.col.data();
  const float* val = lev.val.data();
  for (int i = 0; i < lev.n; ++i) {
    if (lev.aggregate[i] >= 0) coarse[lev.aggregate[i]] += static_cast<float>(b[i] - row_product(start, col, val, x.data(), i));
  }
}

// r = (LU)^-1 in (in may be r itself); with add_to, also add_to += r in the same sweep; with
// residual_of, r = (LU)^-1 (in - B residual_of), each row's residual formed in the forward sweep.
void ScalarMultigrid::ilu_solve(const Level& lev, const std::vector<float>& in, std::vector<float>& r, std::vector<float>* add_to,
                                const std::vector<float>* residual_of) {
  if (lev.five_point) {
    lev.five_point->solve(in, r, add_to, residual_of);
    return;
  }
  const int* start = lev.start.data();
  const int* col = lev.col.data();
  const float* val = lev.val.data();
  const float* lu = lev.lu.data();
  const float* inv_diag = lev.inv_diag.data();
  const int* dp = lev.diag_pos.data();
  const float* b = in.data();
  float* x = r.data();
  // Each sweep is a chain from row to row through the neighbour just finished (column i - 1
  // forward, i + 1 backward; rows are sorted by column, so it is the entry next to the
  // diagonal). That neighbour is taken from a register, not from memory, and subtracted last, so
  // that the chain is one multiply and one subtraction per row; the other terms are ready
  // before it arrives. (A row without that neighbour subtracts zero times it.)
  double last = 0.0;
  for (int i = 0; i < lev.n; ++i) {
    const int near = dp[i] - 1;
    const bool chained = near >= start[i] && col[near] == i - 1;
    // A row's residual needs only residual_of, not the chain: it is off the critical path.
    double s = residual_of != nullptr ? b[i] - row_product(start, col, val, residual_of->data(), i) : b[i];
    for (int e = start[i], end = chained ? near : dp[i]; e < end; ++e) s -= lu[e] * x[col[e]];
    s -= (chained ? lu[near] : 0.0f) * last;
    x[i] = static_cast<float>(s);
    last = s;
  }
  last = 0.0;
  float* sum = add_to != nullptr ? add_to->data() : nullptr;
  for (int i = lev.n - 1; i >= 0; --i) {
    const int near = dp[i] + 1;
    const bool chained = near < start[i + 1] && col[near] == i + 1;
    double s = x[i] * inv_diag[i];  // U's rows are stored divided by the diagonal
    for (int e = start[i + 1] - 1, end = chained ? near : dp[i]; e > end; --e) s -= lu[e] * x[col[e]];
    s -= (chained ? lu[near] : 0.0f) * last;
    x[i] = static_cast<float>(s);
    last = s;
    if (sum != nullptr) sum[i] += static_cast<float>(s);
  }
}

// x = M_l^-1 b on level l, from a zero guess.
void ScalarMultigrid::cycle(int l) const {
  const Level& lev = levels_[l];
  const int n = lev.n;
  auto &x = lev.x, &r = lev.r;
  const auto& b = lev.b;
  if (l + 1 == static_cast<int>(levels_.size())) {
    if (!lev.lu.empty() || lev.five_point) {  // coarsening stalled here: the smoother ends the cycle (setup())
      ilu_solve(lev, b, x, nullptr);
      return;
    }
    for (int i = 0; i < n; ++i) coarse_scratch_[i] = b[i];
    coarsest_.solve(coarse_scratch_);
    for (int i = 0; i < n; ++i) x[i] = static_cast<float>(coarse_scratch_[i]);
    return;
  }
  // Pre-smoothing from zero: x = (LU)^-1 b; its residual restricted to the next level.
  ilu_solve(lev, b, x, nullptr);
  const Level& next = levels_[l + 1];
  const int nc = next.n;
  std::fill(next.b.begin(), next.b.end(), 0.0f);
  restrict_residual(lev, b, x, next.b);
  if (l + 2 == static_cast<int>(levels_.size())) {
    cycle(l + 1);  // exact
  } else {
    // K-cycle (Notay & Vassilevski 2008): up to two GCR steps on the coarse system, each
    // preconditioned by the next level's cycle; the second only when the first leaves more than
    // a quarter of the coarse residual.
    cycle(l + 1);
    next.v = next.x;
    multiply(next, next.v, next.w);
    const double ww = dot(next.w, next.w), rr = dot(next.b, next.b);
    const double a1 = ww > 0.0 ? dot(next.w, next.b) / ww : 0.0;
    for (int i = 0; i < nc; ++i) next.b[i] -= a1 * next.w[i];
    if (dot(next.b, next.b) <= 0.0625 * rr) {
      for (int i = 0; i < nc; ++i) next.x[i] = a1 * next.v[i];
    } else {
      cycle(l + 1);
      multiply(next, next.x, next.r);
      const double beta = ww > 0.0 ? dot(next.r, next.w) / ww : 0.0;
      for (int i = 0; i < nc; ++i) next.r[i] -= beta * next.w[i];
      const double w2 = dot(next.r, next.r);
      const double a2 = w2 > 0.0 ? dot(next.r, next.b) / w2 : 0.0;
      for (int i = 0; i < nc; ++i) next.x[i] = (a1 - a2 * beta) * next.v[i] + a2 * next.x[i];
    }
  }
  // Coarse correction, then post-smoothing x += (LU)^-1 (b - A x).
  for (int i = 0; i < n; ++i) {
    if (lev.aggregate[i] >= 0) x[i] += next.x[lev.aggregate[i]];
  }
  ilu_solve(lev, b, r, &x, &x);
}

void ScalarMultigrid::precondition(const Eigen::VectorXf& in, Eigen::VectorXf& out) const {
  solve_with([&in](int i) { return in[i]; });
  out = Eigen::Map<const Eigen::VectorXf>(solution().data(), levels_.front().n);
}

void ScalarMultigrid::solve(Eigen::VectorXd& x) const {
  solve_with([&x](int i) { return x[i]; });
  x = Eigen::Map<const Eigen::VectorXf>(solution().data(), levels_.front().n).cast<double>();
}

}  // namespace oxystrat
