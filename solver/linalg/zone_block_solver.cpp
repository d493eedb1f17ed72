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
  shared_pattern_ = false;
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
  shared_pattern_ = true;
  for (int sp = 1; sp < kS; ++sp) {
    shared_pattern_ = shared_pattern_ && m_[sp].nonZeros() == m_[0].nonZeros() &&
                      std::equal(m_[0].outerIndexPtr(), m_[0].outerIndexPtr() + n + 1, m_[sp].outerIndexPtr()) &&
                      std::equal(m_[0].innerIndexPtr(), m_[0].innerIndexPtr() + m_[0].nonZeros(), m_[sp].innerIndexPtr());
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
  // The preconditioner needs only the gas rows' coupling to their own liquid (C of each pair).
  gas_from_liquid_.resize(n_);
  for (int k = 0; k < n_; ++k) gas_from_liquid_[k] = {local_[k][kS * 2 + 0], local_[k][kS * 3 + 1]};
  // Gas Schur diagonals: S = G - diag(C B / A_kk) per pair.
  std::array<std::vector<double>, 2> shift;
  for (int pair = 0; pair < 2; ++pair) {
    const int l = pair, g = pair + 2;
    shift[pair].resize(n_);
    for (int k = 0; k < n_; ++k) {
      const double a_kk = diagonal(m_[l], k);
      if (a_kk == 0.0) return false;
      shift[pair][k] = local_[k][kS * g + l] * local_[k][kS * l + g] / a_kk;  // C B / A_kk
    }
  }
  if (multigrid_) {
    // The two pairs are independent (block Jacobi between them, see precondition()): built side
    // by side, each sequential, so the hierarchies are the same bits for any thread count.
    std::array<bool, 2> ok{false, false};
#pragma omp parallel sections num_threads(2) if (n_ >= kParallelPairsFrom)
    {
#pragma omp section
      ok[0] = mg_[0].setup(m_[0], {}, options_) && mg_[2].setup(m_[2], shift[0], options_);
#pragma omp section
      ok[1] = mg_[1].setup(m_[1], {}, options_) && mg_[3].setup(m_[3], shift[1], options_);
    }
    if (!ok[0] || !ok[1]) return false;
  } else {
    for (int s = 0; s < kS; ++s) {
      p_[s] = m_[s];
      if (s >= 2) {
        for (int k = 0; k < n_; ++k) p_[s].coeffRef(k, k) -= shift[s - 2][k];
      }
    }
    // All four blocks have the transport pattern of the faces: one ordering and symbolic
    // factorisation, and the O2 and CO2 blocks of each phase refactorised together.
    for (int first = 0; first < kS; first += 2) {
      if (ScalarLu::refactor_both(lu_[first], p_[first], lu_[first + 1], p_[first + 1])) continue;
      if (!lu_[first].factorize(p_[first], options_.supernodal_lu_from)) return false;
      for (int s = first + 1; s < kS; ++s) {
        if (!lu_[s].has_pattern(p_[s]) && lu_[first].has_pattern(p_[s])) lu_[s].adopt_symbolic(lu_[first]);
      }
      if (!lu_[first + 1].factorize(p_[first + 1], options_.supernodal_lu_from)) return false;
    }
  }
  fused_ = !multigrid_ && lu_[0].same_symbolic(lu_[1]) && lu_[2].same_symbolic(lu_[3]);
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
  if (shared_pattern_) {
    // The four blocks on one pattern (the faces): one pass over it, four independent streams;
    // each entry of out sums in the same order as below.
    const int* outer = m_[0].outerIndexPtr();
    const int* inner = m_[0].innerIndexPtr();
    const double *v0 = m_[0].valuePtr(), *v1 = m_[1].valuePtr(), *v2 = m_[2].valuePtr(), *v3 = m_[3].valuePtr();
    double* o = out.data();
    for (int col = 0; col < n_; ++col) {
      const double* xc = x.data() + kS * col;
      const double x0 = xc[0], x1 = xc[1], x2 = xc[2], x3 = xc[3];
      for (int e = outer[col]; e < outer[col + 1]; ++e) {
        double* oi = o + kS * inner[e];
        oi[0] += v0[e] * x0, oi[1] += v1[e] * x1, oi[2] += v2[e] * x2, oi[3] += v3[e] * x3;
      }
    }
  } else {
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

// Block Jacobi between the two species pairs, block lower-triangular within a pair (header).
void ZoneBlockSolver::precondition(const Eigen::VectorXf& v, Eigen::VectorXf& out) {
  if (fused_) {
    precondition_fused(v);
  } else {
#pragma omp parallel sections num_threads(2) if (n_ >= kParallelPairsFrom)
    {
#pragma omp section
      precondition_pair(0, v);
#pragma omp section
      precondition_pair(1, v);
    }
  }
  out.resize(kS * n_);
  for (int k = 0; k < n_; ++k) {
    for (int s = 0; s < kS; ++s) out[kS * k + s] = static_cast<float>(s_[s][k]);
  }
}

// x_l = A^-1 v_l, x_g = S^-1 (v_g - C x_l) for one pair, into s_[l] and s_[g].
void ZoneBlockSolver::precondition_pair(int pair, const Eigen::VectorXf& v) {
  const int l = pair, g = pair + 2, n = n_;
  Eigen::VectorXd& xl = s_[l];
  Eigen::VectorXd& xg = s_[g];
  xl.resize(n);
  xg.resize(n);
  for (int k = 0; k < n; ++k) xl[k] = v[kS * k + l];
  block_solve(l, xl);
  for (int k = 0; k < n; ++k) xg[k] = v[kS * k + g] - gas_from_liquid_[k][pair] * xl[k];
  block_solve(g, xg);
}

// The same as both pairs' precondition_pair(), with the O2 and CO2 blocks (one symbolic
// factorisation) solved together: two independent triangular chains per sweep.
void ZoneBlockSolver::precondition_fused(const Eigen::VectorXf& v) {
  const int n = n_;
  for (auto& x : s_) x.resize(n);
  for (int k = 0; k < n; ++k) s_[0][k] = v[kS * k + 0], s_[1][k] = v[kS * k + 1];
  ScalarLu::solve_both(lu_[0], lu_[1], s_[0], s_[1]);
  for (int k = 0; k < n; ++k) {
    s_[2][k] = v[kS * k + 2] - gas_from_liquid_[k][0] * s_[0][k];
    s_[3][k] = v[kS * k + 3] - gas_from_liquid_[k][1] * s_[1][k];
  }
  ScalarLu::solve_both(lu_[2], lu_[3], s_[2], s_[3]);
}

bool ZoneBlockSolver::solve(const Eigen::VectorXd& b, Eigen::VectorXd& dx, double rel_tol) {
  if (!have_jacobian_ || !factored_) return false;
  FgmresOptions o;
  o.restart = kS * n_ > 800000 ? 10 : 30;
  o.parallel_from_unknowns = options_.parallel_from_unknowns;
  const bool ok = krylov_.solve([this](const Eigen::VectorXd& in, Eigen::VectorXd& out) { multiply(in, out); },
                                [this](const Eigen::VectorXf& in, Eigen::VectorXf& out) { precondition(in, out); }, b,
                                dx, rel_tol, o);
  return ok && dx.allFinite();
}

}  // namespace oxystrat
