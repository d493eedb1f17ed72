#include "solver/linalg/zone_block_solver.hpp"

#include <algorithm>
#include <cmath>

#include "solver/linalg/parallel_loop.hpp"

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

// A transport of the layout's size, compressed, with its diagonal stored in every column (the
// preconditioner adds the zone-local diagonal to the stored one).
bool layout_transport(const Eigen::SparseMatrix<double>* m, int n) {
  if (m == nullptr || m->rows() != n || m->cols() != n || !m->isCompressed()) return false;
  const int* outer = m->outerIndexPtr();
  const int* inner = m->innerIndexPtr();
  for (int k = 0; k < n; ++k) {
    if (std::find(inner + outer[k], inner + outer[k + 1], k) == inner + outer[k + 1]) return false;
  }
  return true;
}

// out[kS i + s] += sum_j m_ij x[kS j + s] for the species s of `first` .. `first + count - 1`,
// which share the matrix m; columns from the last to the first when `backward`. With `local`,
// also the zone-local rows of those species, zone by zone as its column passes (the same lines
// of out and x, while they are in cache).
void add_product(const Eigen::SparseMatrix<double>& m, int first, int count, bool backward, const Eigen::VectorXd& x,
                 Eigen::VectorXd& out, const ZoneBlockSolver::LocalBlock* local = nullptr) {
  const int* outer = m.outerIndexPtr();
  const int* inner = m.innerIndexPtr();
  const double* val = m.valuePtr();
  double* o = out.data();
  const int n = static_cast<int>(m.cols());
  for (int step = 0; step < n; ++step) {
    const int col = backward ? n - 1 - step : step;
    const double* xc = x.data() + kS * col + first;
    if (count == 2) {
      const double x0 = xc[0], x1 = xc[1];
      for (int e = outer[col]; e < outer[col + 1]; ++e) {
        double* oi = o + kS * inner[e] + first;
        oi[0] += val[e] * x0, oi[1] += val[e] * x1;
      }
    } else {
      for (int e = outer[col]; e < outer[col + 1]; ++e) o[kS * inner[e] + first] += val[e] * xc[0];
    }
    if (local != nullptr) {
      const double* xk = x.data() + kS * col;
      for (int si = first; si < first + count; ++si) {
        const double* row = local[col].data() + kS * si;
        o[kS * col + si] += ((row[0] * xk[0] + row[1] * xk[1]) + (row[2] * xk[2] + row[3] * xk[3]));
      }
    }
  }
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
  local_.assign(n, LocalBlock{});
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
  for (int sp = 0; sp < kS; ++sp) block_[sp] = &m_[sp];
  have_jacobian_ = true;
  return true;
}

std::vector<ZoneBlockSolver::LocalBlock>& ZoneBlockSolver::begin_parts(const ZoneLayout& layout) {
  have_jacobian_ = false;
  if (layout.zones != n_) factored_ = false;
  n_ = std::max(layout.zones, 0);
  local_.resize(n_);
  return local_;
}

// The listed Jacobian's copies and slots are let go: a large network holds the transports once.
bool ZoneBlockSolver::accept_parts(const ZoneTransports& transports) {
  have_jacobian_ = false;
  if (n_ <= 0 || static_cast<int>(local_.size()) != n_ || !layout_transport(transports.liquid, n_) ||
      !layout_transport(transports.gas, n_)) {
    return false;
  }
  for (auto& m : m_) m = Eigen::SparseMatrix<double>();
  slot_ = {};
  block_ = {transports.liquid, transports.liquid, transports.gas, transports.gas};
  have_jacobian_ = true;
  return true;
}

bool ZoneBlockSolver::begin_same_pattern(const ZoneLayout& layout) {
  have_jacobian_ = false;
  taken_ = 0;
  if (slot_.empty() || layout.zones != n_) return false;
  for (auto& m : m_) std::fill_n(m.valuePtr(), m.nonZeros(), 0.0);
  std::fill(local_.begin(), local_.end(), LocalBlock{});
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
  for (int sp = 0; sp < kS; ++sp) block_[sp] = &m_[sp];
  have_jacobian_ = true;
  return true;
}

bool ZoneBlockSolver::refresh_preconditioner() {
  factored_ = false;
  if (!have_jacobian_) return false;
  multigrid_ = n_ >= options_.multigrid_from_zones;
  // The preconditioner needs only the gas rows' coupling to their own liquid (C of each pair).
  for (int pair = 0; pair < 2; ++pair) {
    gas_from_liquid_[pair].resize(n_);
    for (int k = 0; k < n_; ++k) gas_from_liquid_[pair][k] = local_[k][kS * (pair + 2) + pair];
  }
  // Each species' block is its transport plus the zone-local diagonal; the gas blocks become
  // their Schur complements S = G - diag(C B / A_kk). Both as a shift: block - diag(shift).
  std::array<std::vector<double>, kS> shift;
  for (int pair = 0; pair < 2; ++pair) {
    const int l = pair, g = pair + 2;
    shift[l].resize(n_);
    shift[g].resize(n_);
    for (int k = 0; k < n_; ++k) {
      const auto& c = local_[k];
      const double a_kk = diagonal(*block_[l], k) + c[kS * l + l];
      if (a_kk == 0.0) return false;
      shift[l][k] = -c[kS * l + l];
      shift[g][k] = -c[kS * g + g] + c[kS * g + l] * c[kS * l + g] / a_kk;  // C B / A_kk
    }
  }
  if (multigrid_) {
    // The two pairs are independent (block Jacobi between them, see precondition()): built side
    // by side, each sequential, so the hierarchies are the same bits for any thread count.
    std::array<bool, 2> ok{false, false};
    side_by_side(
        n_ >= kParallelPairsFrom,
        [&] { ok[0] = mg_[0].setup(*block_[0], shift[0], options_) && mg_[2].setup(*block_[2], shift[2], options_); },
        [&] { ok[1] = mg_[1].setup(*block_[1], shift[1], options_) && mg_[3].setup(*block_[3], shift[3], options_); });
    if (!ok[0] || !ok[1]) return false;
  } else {
    for (int s = 0; s < kS; ++s) {
      p_[s] = *block_[s];
      for (int k = 0; k < n_; ++k) p_[s].coeffRef(k, k) -= shift[s][k];
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

// out = J x, straight on the interleaved vectors: the transports (once for a pair that shares
// one), then the zone-local blocks.
void ZoneBlockSolver::multiply(const Eigen::VectorXd& x, Eigen::VectorXd& out) const {
  out.resize(kS * n_);
  const bool split = kS * n_ >= options_.parallel_from_unknowns;
  parallel_loop(kS * n_, split, [&](int i) { out[i] = 0.0; });
  // Each species' transport with its zone-local rows. Liquid and gas pair side by side when each
  // shares one transport; the gas from the last column, so that the two threads write the same
  // cache lines only where they cross.
  if (block_[0] == block_[1] && block_[2] == block_[3]) {
    side_by_side(
        split, [&] { add_product(*block_[0], 0, 2, false, x, out, local_.data()); },
        [&] { add_product(*block_[2], 2, 2, true, x, out, local_.data()); });
    return;
  }
  for (int s = 0; s < kS; ++s) add_product(*block_[s], s, 1, false, x, out, local_.data());
}

// Block Jacobi between the two species pairs, block lower-triangular within a pair (header).
void ZoneBlockSolver::precondition(const Eigen::VectorXf& v, Eigen::VectorXf& out) {
  if (fused_) {
    precondition_fused(v);
  } else {
    side_by_side(n_ >= kParallelPairsFrom, [&] { precondition_pair(0, v); }, [&] { precondition_pair(1, v); });
  }
  out.resize(kS * n_);
  const bool split = kS * n_ >= options_.parallel_from_unknowns;
  if (multigrid_) {  // the answers where the cycles left them
    const std::array<const float*, kS> x{mg_[0].solution().data(), mg_[1].solution().data(), mg_[2].solution().data(),
                                         mg_[3].solution().data()};
    parallel_loop(n_, split, [&](int k) {
      for (int s = 0; s < kS; ++s) out[kS * k + s] = x[s][k];
    });
    return;
  }
  parallel_loop(n_, split, [&](int k) {
    for (int s = 0; s < kS; ++s) out[kS * k + s] = static_cast<float>(s_[s][k]);
  });
}

// x_l = A^-1 v_l, x_g = S^-1 (v_g - C x_l) for one pair: into the multigrid's own solution
// vectors, each cycle reading its right-hand side straight from v; else into s_[l] and s_[g].
void ZoneBlockSolver::precondition_pair(int pair, const Eigen::VectorXf& v) {
  const int l = pair, g = pair + 2, n = n_;
  const double* c = gas_from_liquid_[pair].data();
  if (multigrid_) {
    mg_[l].solve_with([&v, l](int k) { return v[kS * k + l]; });
    const float* xl = mg_[l].solution().data();
    mg_[g].solve_with([&v, g, c, xl](int k) { return v[kS * k + g] - c[k] * xl[k]; });
    return;
  }
  Eigen::VectorXd& xl = s_[l];
  Eigen::VectorXd& xg = s_[g];
  xl.resize(n);
  xg.resize(n);
  for (int k = 0; k < n; ++k) xl[k] = v[kS * k + l];
  block_solve(l, xl);
  for (int k = 0; k < n; ++k) xg[k] = v[kS * k + g] - c[k] * xl[k];
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
    s_[2][k] = v[kS * k + 2] - gas_from_liquid_[0][k] * s_[0][k];
    s_[3][k] = v[kS * k + 3] - gas_from_liquid_[1][k] * s_[1][k];
  }
  ScalarLu::solve_both(lu_[2], lu_[3], s_[2], s_[3]);
}

bool ZoneBlockSolver::solve(const Eigen::VectorXd& b, Eigen::VectorXd& dx, double rel_tol, int max_iterations) {
  if (!have_jacobian_ || !factored_) return false;
  FgmresOptions o;
  o.max_iterations = max_iterations;
  o.restart = kS * n_ > 800000 ? 10 : 30;
  o.parallel_from_unknowns = options_.parallel_from_unknowns;
  const bool ok = krylov_.solve([this](const Eigen::VectorXd& in, Eigen::VectorXd& out) { multiply(in, out); },
                                [this](const Eigen::VectorXf& in, Eigen::VectorXf& out) { precondition(in, out); }, b,
                                dx, rel_tol, o);
  return ok && dx.allFinite();
}

}  // namespace oxystrat
