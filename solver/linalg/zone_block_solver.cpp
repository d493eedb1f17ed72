#include "solver/linalg/zone_block_solver.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {
namespace {

constexpr int kS = ZoneBlockSolver::kSpecies;

// Entries filled column by column in list order (column c at [start[c], start[c + 1])) become a
// compressed column matrix: rows sorted, stably, and repeated rows summed in list order, as a
// triplet assembly sums them (the same numbers to the bit). In place: the list is never copied.
// moved[i] is where the entry first filled at position i ended up.
void compress_columns(Eigen::SparseMatrix<double>& m, const std::vector<int>& start, std::vector<int>& moved) {
  const int n = static_cast<int>(m.cols());
  int* outer = m.outerIndexPtr();
  int* inner = m.innerIndexPtr();
  double* val = m.valuePtr();
  std::vector<int> origin(start[n]);
  for (int i = 0; i < start[n]; ++i) origin[i] = i;
  moved.resize(start[n]);
  int out = 0;
  for (int c = 0; c < n; ++c) {
    const int b = start[c], e = start[c + 1];
    for (int i = b + 1; i < e; ++i) {  // insertion sort: columns hold a handful of entries
      const int row = inner[i], from = origin[i];
      const double v = val[i];
      int j = i;
      for (; j > b && inner[j - 1] > row; --j) inner[j] = inner[j - 1], val[j] = val[j - 1], origin[j] = origin[j - 1];
      inner[j] = row, val[j] = v, origin[j] = from;
    }
    outer[c] = out;
    for (int i = b; i < e; ++i) {
      if (out > outer[c] && inner[out - 1] == inner[i]) {
        val[out - 1] += val[i];
      } else {
        inner[out] = inner[i], val[out] = val[i], ++out;
      }
      moved[origin[i]] = out - 1;
    }
  }
  outer[n] = out;
  m.resizeNonZeros(out);
}

double diagonal(const Eigen::SparseMatrix<double>& m, int k) {
  for (Eigen::SparseMatrix<double>::InnerIterator it(m, k); it; ++it) {
    if (it.row() == k) return it.value();
  }
  return 0.0;
}

}  // namespace

bool ZoneBlockSolver::accept(const ZoneLayout& layout, const Triplets& t) {
  have_jacobian_ = false;
  if (begin_same_pattern(layout) && add_same_pattern(t) && finish_same_pattern()) return true;
  return accept(layout, [&t](const PieceTaker& take) { return take(t); });
}

// Two passes over the pieces, so that the whole list never exists: the first checks the
// structure, adds the zone-local entries and counts the others per column and species (each
// species' block gets one explicit diagonal, which the preconditioner modifies in place); the
// second places them in list order. Each entry's slot is remembered on the way, so that the next
// Jacobian with this pattern is taken apart by one scatter.
bool ZoneBlockSolver::accept(const ZoneLayout& layout, const PieceList& pieces) {
  have_jacobian_ = false;
  slot_.clear();
  const int n = layout.zones;
  if (n <= 0) return false;
  if (n != n_) factored_ = false;
  n_ = n;
  local_.assign(n, Local{});
  std::array<std::vector<int>, kS> col;
  for (auto& c : col) {
    c.assign(n + 1, 1);
    c[0] = 0;
  }
  std::size_t total = 0;
  const bool counted = pieces([&](const Triplets& piece) {
    for (const auto& e : piece) {
      if (e.row() < 0 || e.col() < 0) return false;
      const int zi = e.row() / kS, si = e.row() % kS, zj = e.col() / kS, sj = e.col() % kS;
      if (zi >= n || zj >= n) return false;
      if (si == sj) {
        ++col[si][zj + 1];
      } else if (zi == zj) {
        local_[zi][kS * si + sj] += e.value();
      } else {
        return false;  // species coupled across zones
      }
    }
    total += piece.size();
    return true;
  });
  if (!counted) return false;
  for (auto& c : col) {
    for (int k = 0; k < n; ++k) c[k + 1] += c[k];
  }
  std::array<std::vector<int>, kS> fill;
  for (int s = 0; s < kS; ++s) {
    m_[s].resize(n, n);
    m_[s].resizeNonZeros(col[s][n]);
    fill[s].assign(col[s].begin(), col[s].end() - 1);
    for (int k = 0; k < n; ++k) {
      const int at = fill[s][k]++;
      m_[s].innerIndexPtr()[at] = k;
      m_[s].valuePtr()[at] = 0.0;
    }
  }
  std::size_t largest = static_cast<std::size_t>(kS * kS) * n;
  for (const auto& c : col) largest = std::max(largest, static_cast<std::size_t>(c[n]));
  const bool remember = largest < kSlotMask;  // else too large to encode: every Jacobian is taken apart in full
  if (remember) slot_.resize(total);
  std::size_t i = 0;
  const bool placed = pieces([&](const Triplets& piece) {
    if (i + piece.size() > total) return false;  // not the list of the first pass
    for (const auto& e : piece) {
      const int zi = e.row() / kS, si = e.row() % kS, zj = e.col() / kS, sj = e.col() % kS;
      std::uint32_t part = 0, offset = 0;
      if (si == sj) {
        const int at = fill[si][zj]++;
        m_[si].innerIndexPtr()[at] = zi;
        m_[si].valuePtr()[at] = e.value();
        part = static_cast<std::uint32_t>(si), offset = static_cast<std::uint32_t>(at);  // renumbered after compression
      } else {
        part = kLocalPart, offset = static_cast<std::uint32_t>(kS * kS * zi + kS * si + sj);
      }
      if (remember) slot_[i] = part << kPartShift | offset;
      ++i;
    }
    return true;
  });
  if (!placed || i != total) {
    slot_.clear();
    return false;
  }
  std::array<std::vector<int>, kS> moved;
  for (int s = 0; s < kS; ++s) compress_columns(m_[s], col[s], moved[s]);
  for (auto& sl : slot_) {
    const std::uint32_t part = sl >> kPartShift;
    if (part < kLocalPart) sl = part << kPartShift | static_cast<std::uint32_t>(moved[part][sl & kSlotMask]);
  }
  have_jacobian_ = true;
  return true;
}

bool ZoneBlockSolver::begin_same_pattern(const ZoneLayout& layout) {
  have_jacobian_ = false;
  taken_ = 0;
  if (slot_.empty() || layout.zones != n_) return false;
  for (auto& m : m_) std::fill_n(m.valuePtr(), m.nonZeros(), 0.0);
  std::fill(local_.begin(), local_.end(), Local{});
  return true;
}

// Each entry must land where the remembered slot says, and the slot must be the place of its
// (row, column) in the part: otherwise the pattern has changed and the caller takes it in full.
bool ZoneBlockSolver::add_same_pattern(const Triplets& piece) {
  if (taken_ + piece.size() > slot_.size()) return false;
  const std::uint32_t* slot = slot_.data() + taken_;
  for (size_t i = 0; i < piece.size(); ++i) {
    const auto& e = piece[i];
    const int zi = e.row() / kS, si = e.row() % kS, zj = e.col() / kS, sj = e.col() % kS;
    const std::uint32_t part = slot[i] >> kPartShift, at = slot[i] & kSlotMask;
    if (zi >= n_ || zj >= n_) return false;
    if (part < kLocalPart) {
      const auto& m = m_[part];
      if (si != sj || si != static_cast<int>(part) || static_cast<int>(at) < m.outerIndexPtr()[zj] ||
          static_cast<int>(at) >= m.outerIndexPtr()[zj + 1] || m.innerIndexPtr()[at] != zi) {
        return false;
      }
      m_[part].valuePtr()[at] += e.value();
    } else {
      if (si == sj || zi != zj || at != static_cast<std::uint32_t>(kS * kS * zi + kS * si + sj)) return false;
      local_[zi][kS * si + sj] += e.value();
    }
  }
  taken_ += piece.size();
  return true;
}

bool ZoneBlockSolver::finish_same_pattern() {
  if (taken_ != slot_.size()) return false;
  have_jacobian_ = true;
  return true;
}

bool ZoneBlockSolver::refresh_preconditioner() {
  factored_ = false;
  if (!have_jacobian_) return false;
  multigrid_ = n_ >= options_.multigrid_from_zones;
  p_local_ = local_;
  for (int pair = 0; pair < 2; ++pair) {
    const int l = pair, g = pair + 2;
    auto& a_diag = pair == 0 ? a_diag_o_ : a_diag_c_;
    a_diag.resize(n_);
    std::vector<double> shift(n_);
    for (int k = 0; k < n_; ++k) {
      a_diag[k] = diagonal(m_[l], k);
      if (a_diag[k] == 0.0) return false;
      shift[k] = local_[k][kS * g + l] * local_[k][kS * l + g] / a_diag[k];  // C B / A_kk
    }
    if (multigrid_) {
      if (!mg_[l].setup(m_[l], {}, options_) || !mg_[g].setup(m_[g], shift, options_)) return false;
    } else {
      p_[l] = m_[l];
      p_[g] = m_[g];
      for (int k = 0; k < n_; ++k) p_[g].coeffRef(k, k) -= shift[k];
      // The CO2 blocks have the O2 blocks' patterns: their orderings and symbolic factors are
      // taken over rather than found again.
      if (pair == 1 && !lu_[l].has_pattern(p_[l]) && lu_[0].has_pattern(p_[l])) lu_[l].adopt_symbolic(lu_[0]);
      if (pair == 1 && !lu_[g].has_pattern(p_[g]) && lu_[2].has_pattern(p_[g])) lu_[g].adopt_symbolic(lu_[2]);
      if (!lu_[l].factorize(p_[l], options_.supernodal_lu_from) || !lu_[g].factorize(p_[g], options_.supernodal_lu_from)) {
        return false;
      }
    }
  }
  ++factorisations_;
  factored_ = true;
  return true;
}

void ZoneBlockSolver::block_solve(int s, Eigen::VectorXd& x) const {
  if (multigrid_) {
    mg_[s].solve(x);
  } else {
    lu_[s].solve(x);
  }
}

// out = J x, straight on the interleaved vectors: each species' block by columns, then the
// zone-local couplings.
void ZoneBlockSolver::multiply(const Eigen::VectorXd& x, Eigen::VectorXd& out) const {
  out.setZero(kS * n_);
  for (int s = 0; s < kS; ++s) {
    const auto& m = m_[s];
    const int* outer = m.outerIndexPtr();
    const int* inner = m.innerIndexPtr();
    const double* val = m.valuePtr();
    for (int col = 0; col < n_; ++col) {
      const double xc = x[kS * col + s];
      for (int e = outer[col]; e < outer[col + 1]; ++e) out[kS * inner[e] + s] += val[e] * xc;
    }
  }
#pragma omp parallel for schedule(static) if (kS * n_ >= options_.parallel_from_unknowns)
  for (int k = 0; k < n_; ++k) {
    const Local& c = local_[k];
    const double* xk = x.data() + kS * k;
    for (int si = 0; si < kS; ++si) {
      const double* row = c.data() + kS * si;  // its diagonal entry is 0: the blocks hold it
      out[kS * k + si] += ((row[0] * xk[0] + row[1] * xk[1]) + (row[2] * xk[2] + row[3] * xk[3]));
    }
  }
}

// Block Gauss-Seidel over the two species pairs, block lower-triangular within a pair (header).
void ZoneBlockSolver::precondition(const Eigen::VectorXf& v, Eigen::VectorXf& out) {
  const int n = n_;
  std::array<Eigen::VectorXd, kS>& x = s_;
  for (auto& e : x) e.resize(n);
  Eigen::VectorXd y(n), t(n);
  for (int pair = 0; pair < 2; ++pair) {
    const int l = pair, g = pair + 2;
    // Right-hand sides of the pair, less the couplings to the pair already solved.
    Eigen::VectorXd bl(n), bg(n);
    for (int k = 0; k < n; ++k) {
      bl[k] = v[kS * k + l];
      bg[k] = v[kS * k + g];
      if (pair == 1) {
        const Local& c = p_local_[k];
        bl[k] -= c[kS * l + 0] * x[0][k] + c[kS * l + 2] * x[2][k];
        bg[k] -= c[kS * g + 0] * x[0][k] + c[kS * g + 2] * x[2][k];
      }
    }
    x[l] = bl;
    block_solve(l, x[l]);
    for (int k = 0; k < n; ++k) t[k] = bg[k] - p_local_[k][kS * g + l] * x[l][k];
    block_solve(g, t);
    x[g] = t;
  }
  out.resize(kS * n);
  for (int k = 0; k < n; ++k) {
    for (int s = 0; s < kS; ++s) out[kS * k + s] = static_cast<float>(x[s][k]);
  }
}

bool ZoneBlockSolver::solve(const Eigen::VectorXd& b, Eigen::VectorXd& dx, double rel_tol) {
  if (!have_jacobian_ || !factored_) return false;
  FgmresOptions o;
  o.restart = kS * n_ > 800000 ? 15 : 30;
  o.parallel_from_unknowns = options_.parallel_from_unknowns;
  const bool ok = krylov_.solve([this](const Eigen::VectorXd& in, Eigen::VectorXd& out) { multiply(in, out); },
                                [this](const Eigen::VectorXf& in, Eigen::VectorXf& out) { precondition(in, out); }, b,
                                dx, rel_tol, o);
  return ok && dx.allFinite();
}

}  // namespace oxystrat
