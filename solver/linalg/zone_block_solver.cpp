#include "solver/linalg/zone_block_solver.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {
namespace {

using Block = std::array<double, 4>;

// inv may be a itself.
bool invert(const Block& a, Block& inv) {
  const double det = a[0] * a[3] - a[1] * a[2];
  if (!(std::abs(det) > 0.0) || !std::isfinite(det)) return false;
  const Block r = {a[3] / det, -a[1] / det, -a[2] / det, a[0] / det};
  inv = r;
  return true;
}

Block multiply(const Block& a, const Block& b) {
  return {a[0] * b[0] + a[1] * b[2], a[0] * b[1] + a[1] * b[3], a[2] * b[0] + a[3] * b[2], a[2] * b[1] + a[3] * b[3]};
}

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

// Sum of a[k] b[k] with eight partial sums, so that the additions do not wait for each other
// (one running sum is a chain of dependent additions); a fixed order, so the same bits each time.
template <typename T>
double chunk_dot(const double* a, const T* b, int n) {
  double acc[8] = {0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0};
  int k = 0;
  for (; k + 8 <= n; k += 8) {
    for (int u = 0; u < 8; ++u) acc[u] += a[k + u] * b[k + u];
  }
  for (; k < n; ++k) acc[k % 8] += a[k] * b[k];
  return ((acc[0] + acc[1]) + (acc[2] + acc[3])) + ((acc[4] + acc[5]) + (acc[6] + acc[7]));
}

}  // namespace


bool ZoneBlockSolver::accept(const ZoneLayout& layout, const Triplets& t) {
  have_jacobian_ = false;
  if (begin_same_pattern(layout) && add_same_pattern(t) && finish_same_pattern()) return true;
  return accept(layout, [&t](const PieceTaker& take) { return take(t); });
}

// Two passes over the pieces, so that the whole list never exists: the first checks the
// structure, adds the zone-local entries and counts the others per column (liquid blocks; one
// explicit diagonal each, which the preconditioner modifies in place) and per receiving zone
// (upstream gas); the second places the others in list order (so grouped stably). Each entry's
// slot is remembered on the way, so that the next Jacobian with this pattern is taken apart by
// one scatter. A slot is the part (top three bits) and the position in it: 4 bytes per entry,
// no copy of the pattern (the intake checks each entry against the parts' own structure).
bool ZoneBlockSolver::accept(const ZoneLayout& layout, const PieceList& pieces) {
  have_jacobian_ = false;
  slot_.clear();
  const int n = layout.zones;
  if (n <= 0 || layout.gas_order == nullptr || static_cast<int>(layout.gas_order->size()) != n) return false;
  if (n != n_) factored_ = false;
  n_ = n;
  order_ = *layout.gas_order;
  std::vector<int> position(n, -1);
  for (int i = 0; i < n; ++i) {
    if (order_[i] < 0 || order_[i] >= n || position[order_[i]] >= 0) return false;
    position[order_[i]] = i;
  }
  x01_.assign(n, 0.0);
  x10_.assign(n, 0.0);
  lg_.assign(n, Block{});
  gl_.assign(n, Block{});
  gg_.assign(n, Block{});
  std::vector<int> col_o(n + 1, 1), col_c(n + 1, 1);
  col_o[0] = col_c[0] = 0;
  up_start_.assign(n + 1, 0);
  std::size_t total = 0;
  const bool counted = pieces([&](const Triplets& piece) {
    for (const auto& e : piece) {
      const int zi = e.row() >> 2, si = e.row() & 3, zj = e.col() >> 2, sj = e.col() & 3;
      if (e.row() < 0 || e.col() < 0 || zi >= n || zj >= n) return false;
      const double v = e.value();
      if (si < 2 && sj < 2) {
        if (si == sj) {
          ++(si == 0 ? col_o : col_c)[zj + 1];
        } else if (zi == zj) {
          (si == 0 ? x01_ : x10_)[zi] += v;
        } else {
          return false;
        }
      } else if (si < 2) {
        if (zi != zj) return false;
        lg_[zi][2 * si + sj - 2] += v;
      } else if (sj < 2) {
        if (zi != zj) return false;
        gl_[zi][2 * (si - 2) + sj] += v;
      } else if (zi == zj) {
        gg_[zi][2 * (si - 2) + sj - 2] += v;
      } else {
        if (position[zj] >= position[zi]) return false;  // gas against the routing order
        ++up_start_[zi + 1];
      }
    }
    total += piece.size();
    return true;
  });
  if (!counted) return false;
  for (int k = 0; k < n; ++k) {
    col_o[k + 1] += col_o[k];
    col_c[k + 1] += col_c[k];
    up_start_[k + 1] += up_start_[k];
  }
  for (auto* m : {&j_oo_, &j_cc_}) {
    const auto& col = m == &j_oo_ ? col_o : col_c;
    m->resize(n, n);
    m->resizeNonZeros(col[n]);
  }
  std::vector<int> fill_o(col_o.begin(), col_o.end() - 1), fill_c(col_c.begin(), col_c.end() - 1);
  for (int k = 0; k < n; ++k) {
    for (auto* m : {&j_oo_, &j_cc_}) {
      const int at = (m == &j_oo_ ? fill_o : fill_c)[k]++;
      m->innerIndexPtr()[at] = k;
      m->valuePtr()[at] = 0.0;
    }
  }
  const std::size_t ups = up_start_[n];
  up_col_.resize(ups);
  up_row_.resize(ups);
  up_val_.resize(ups);
  std::vector<int> fill(up_start_.begin(), up_start_.end() - 1);
  const std::size_t largest = std::max({static_cast<std::size_t>(col_o[n]), static_cast<std::size_t>(col_c[n]), 4 * static_cast<std::size_t>(n), ups});
  const bool remember = largest < kSlotMask;  // else too large to encode: every Jacobian is taken apart in full
  if (remember) slot_.resize(total);
  std::size_t i = 0;
  const bool placed = pieces([&](const Triplets& piece) {
    if (i + piece.size() > total) return false;  // not the list of the first pass
    for (const auto& e : piece) {
      const int zi = e.row() >> 2, si = e.row() & 3, zj = e.col() >> 2, sj = e.col() & 3;
      std::uint32_t part = 0, offset = 0;
      if (si < 2 && sj < 2) {
        if (si == sj) {
          auto& m = si == 0 ? j_oo_ : j_cc_;
          const int at = (si == 0 ? fill_o : fill_c)[zj]++;
          m.innerIndexPtr()[at] = zi;
          m.valuePtr()[at] = e.value();
          part = si == 0 ? kOo : kCc, offset = static_cast<std::uint32_t>(at);  // renumbered after compression
        } else {
          part = si == 0 ? kX01 : kX10, offset = static_cast<std::uint32_t>(zi);
        }
      } else if (si < 2) {
        part = kLg, offset = 4 * zi + 2 * si + sj - 2;
      } else if (sj < 2) {
        part = kGl, offset = 4 * zi + 2 * (si - 2) + sj;
      } else if (zi == zj) {
        part = kGg, offset = 4 * zi + 2 * (si - 2) + sj - 2;
      } else {
        const int at = fill[zi]++;
        up_col_[at] = 2 * zj + sj - 2;
        up_row_[at] = static_cast<unsigned char>(si - 2);
        up_val_[at] = e.value();
        part = kUp, offset = static_cast<std::uint32_t>(at);
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
  std::vector<int> moved_o, moved_c;
  compress_columns(j_oo_, col_o, moved_o);
  compress_columns(j_cc_, col_c, moved_c);
  for (auto& s : slot_) {
    const std::uint32_t part = s >> kPartShift;
    if (part == kOo || part == kCc) s = part << kPartShift | static_cast<std::uint32_t>((part == kOo ? moved_o : moved_c)[s & kSlotMask]);
  }
  for (int k = 0; k < n; ++k) {
    if (!invert(gg_[k], gg_[k])) {
      slot_.clear();
      return false;
    }
  }
  have_jacobian_ = true;
  return true;
}

bool ZoneBlockSolver::begin_same_pattern(const ZoneLayout& layout) {
  have_jacobian_ = false;
  taken_ = 0;
  if (slot_.empty() || layout.zones != n_ || layout.gas_order == nullptr || *layout.gas_order != order_) return false;
  std::fill_n(j_oo_.valuePtr(), j_oo_.nonZeros(), 0.0);
  std::fill_n(j_cc_.valuePtr(), j_cc_.nonZeros(), 0.0);
  std::fill(x01_.begin(), x01_.end(), 0.0);
  std::fill(x10_.begin(), x10_.end(), 0.0);
  for (auto* blocks : {&lg_, &gl_, &gg_}) std::fill(blocks->begin(), blocks->end(), Block{});
  std::fill(up_val_.begin(), up_val_.end(), 0.0);
  return true;
}

// Each entry must land where the remembered slot says, and the slot must be the place of its
// (row, column) in the part: otherwise the pattern has changed and the caller takes it in full.
bool ZoneBlockSolver::add_same_pattern(const Triplets& piece) {
  if (taken_ + piece.size() > slot_.size()) return false;
  const std::uint32_t* slot = slot_.data() + taken_;
  const int* oo_outer = j_oo_.outerIndexPtr();
  const int* oo_inner = j_oo_.innerIndexPtr();
  const int* cc_outer = j_cc_.outerIndexPtr();
  const int* cc_inner = j_cc_.innerIndexPtr();
  for (size_t i = 0; i < piece.size(); ++i) {
    const auto& e = piece[i];
    const int zi = e.row() >> 2, si = e.row() & 3, zj = e.col() >> 2, sj = e.col() & 3;
    const std::uint32_t part = slot[i] >> kPartShift, at = slot[i] & kSlotMask;
    const int local = 2 * (si & 1) + (sj & 1);  // entry of a 2 x 2 block
    const double v = e.value();
    bool ok = zi < n_ && zj < n_;
    switch (part) {
      case kOo:
      case kCc: {
        const int* outer = part == kOo ? oo_outer : cc_outer;
        const int* inner = part == kOo ? oo_inner : cc_inner;
        ok = ok && si == sj && si == static_cast<int>(part - kOo) && static_cast<int>(at) >= outer[zj] &&
             static_cast<int>(at) < outer[zj + 1] && inner[at] == zi;
        if (ok) (part == kOo ? j_oo_ : j_cc_).valuePtr()[at] += v;
        break;
      }
      case kX01:
      case kX10:
        ok = ok && si < 2 && sj == 1 - si && si == static_cast<int>(part - kX01) && zi == zj && static_cast<int>(at) == zi;
        if (ok) (part == kX01 ? x01_ : x10_)[zi] += v;
        break;
      case kLg:
        ok = ok && si < 2 && sj >= 2 && zi == zj && at == static_cast<std::uint32_t>(4 * zi + local);
        if (ok) lg_[zi][local] += v;
        break;
      case kGl:
        ok = ok && si >= 2 && sj < 2 && zi == zj && at == static_cast<std::uint32_t>(4 * zi + local);
        if (ok) gl_[zi][local] += v;
        break;
      case kGg:
        ok = ok && si >= 2 && sj >= 2 && zi == zj && at == static_cast<std::uint32_t>(4 * zi + local);
        if (ok) gg_[zi][local] += v;
        break;
      default:  // kUp
        ok = ok && si >= 2 && sj >= 2 && zi != zj && static_cast<int>(at) >= up_start_[zi] &&
             static_cast<int>(at) < up_start_[zi + 1] && up_col_[at] == 2 * zj + sj - 2 && up_row_[at] == si - 2;
        if (ok) up_val_[at] += v;
        break;
    }
    if (!ok) return false;
  }
  taken_ += piece.size();
  return true;
}

bool ZoneBlockSolver::finish_same_pattern() {
  if (taken_ != slot_.size()) return false;
  for (int k = 0; k < n_; ++k) {
    if (!invert(gg_[k], gg_[k])) return false;
  }
  have_jacobian_ = true;
  return true;
}

bool ZoneBlockSolver::refresh_preconditioner() {
  factored_ = false;
  if (!have_jacobian_) return false;
  std::vector<double> shift_o(n_), shift_c(n_);
  p_co_.resize(n_);
  for (int k = 0; k < n_; ++k) {
    // Local Schur complement: the gas of the zone itself eliminated, the gas from below frozen.
    const Block c = multiply(lg_[k], multiply(gg_[k], gl_[k]));
    shift_o[k] = c[0];
    shift_c[k] = c[3];
    p_co_[k] = x10_[k] - c[2];
  }
  multigrid_ = n_ >= options_.multigrid_from_zones;
  if (multigrid_) {
    // The hierarchy takes the shifted blocks straight from the Jacobian's (no copy of them).
    // The two hierarchies are independent: built side by side (each sequential: the same for any
    // thread count).
    bool ok_o = false, ok_c = false;
#pragma omp parallel sections
    {
#pragma omp section
      ok_o = mg_o_.setup(j_oo_, shift_o, options_);
#pragma omp section
      ok_c = mg_c_.setup(j_cc_, shift_c, options_);
    }
    if (!ok_o || !ok_c) return false;
  } else {
    p_oo_ = j_oo_;
    p_cc_ = j_cc_;
    for (int k = 0; k < n_; ++k) {
      p_oo_.coeffRef(k, k) -= shift_o[k];
      p_cc_.coeffRef(k, k) -= shift_c[k];
    }
    if (!lu_o_.factorize(p_oo_, options_.supernodal_lu_from) || !lu_c_.factorize(p_cc_, options_.supernodal_lu_from))
      return false;
  }
  ++factorisations_;
  factored_ = true;
  return true;
}

void ZoneBlockSolver::gas_sweep(Eigen::VectorXd& g) const {
  for (const int k : order_) {
    double a = g[2 * k], b = g[2 * k + 1];
    for (int e = up_start_[k]; e < up_start_[k + 1]; ++e) (up_row_[e] == 0 ? a : b) -= up_val_[e] * g[up_col_[e]];
    const Block& m = gg_[k];
    g[2 * k] = m[0] * a + m[1] * b;
    g[2 * k + 1] = m[2] * a + m[3] * b;
  }
}

// Three independent parts: the gas response to v (a sweep in routing order) and each species'
// transport product; on a large network they run side by side, each sequential in itself (the
// same bits for any thread count). v may be a rounded Krylov vector (float): read as doubles.
template <typename V>
void ZoneBlockSolver::apply_schur(const V& v, Eigen::VectorXd& out) {
  t_gas_.resize(2 * n_);
  s_o_.resize(n_);
  s_c_.resize(n_);
  const auto gas = [&] {
    for (int k = 0; k < n_; ++k) {
      const Block& m = gl_[k];
      const double a = v[2 * k], b = v[2 * k + 1];
      t_gas_[2 * k] = m[0] * a + m[1] * b;
      t_gas_[2 * k + 1] = m[2] * a + m[3] * b;
    }
    gas_sweep(t_gas_);
  };
  const auto transport = [&](int species) {
    Eigen::VectorXd& in = species == 0 ? s_o_ : s_c_;
    for (int k = 0; k < n_; ++k) in[k] = v[2 * k + species];
    (species == 0 ? jo_ : jc_).noalias() = (species == 0 ? j_oo_ : j_cc_) * in;
  };
  if (multigrid_) {
#pragma omp parallel sections
    {
#pragma omp section
      gas();
#pragma omp section
      transport(0);
#pragma omp section
      transport(1);
    }
  } else {
    gas();
    transport(0);
    transport(1);
  }
  out.resize(2 * n_);
#pragma omp parallel for schedule(static) if (2 * n_ >= options_.parallel_from_unknowns)
  for (int k = 0; k < n_; ++k) {
    const Block& m = lg_[k];
    const double ga = t_gas_[2 * k], gb = t_gas_[2 * k + 1];
    out[2 * k] = jo_[k] + x01_[k] * v[2 * k + 1] - (m[0] * ga + m[1] * gb);
    out[2 * k + 1] = jc_[k] + x10_[k] * v[2 * k] - (m[2] * ga + m[3] * gb);
  }
}

void ZoneBlockSolver::precondition(const Eigen::VectorXf& v, Eigen::VectorXf& out) {
  out.resize(2 * n_);
  s_o_.resize(n_);
  s_c_.resize(n_);
  if (multigrid_) {
    // Block Jacobi between the species (the CO2 block does not wait for the O2 one), so the two
    // cycles run side by side on two threads; each is sequential in itself, so the result is
    // the same for any thread count. Measured 9808 / 97,953 zones: 94 / 116 Krylov iterations
    // instead of 93 / 108 with Gauss-Seidel between the species, 147 -> 95 ms and 2.55 -> 2.01 s.
    const auto cycle = [&](int species) {
      Eigen::VectorXd& z = species == 0 ? s_o_ : s_c_;
      for (int k = 0; k < n_; ++k) z[k] = v[2 * k + species];
      (species == 0 ? mg_o_ : mg_c_).solve(z);
    };
#pragma omp parallel sections
    {
#pragma omp section
      cycle(0);
#pragma omp section
      cycle(1);
    }
#pragma omp parallel for schedule(static) if (2 * n_ >= options_.parallel_from_unknowns)
    for (int k = 0; k < n_; ++k) {
      out[2 * k] = static_cast<float>(s_o_[k]);
      out[2 * k + 1] = static_cast<float>(s_c_[k]);
    }
    return;
  }
  for (int k = 0; k < n_; ++k) s_o_[k] = v[2 * k];
  lu_o_.solve(s_o_);
  for (int k = 0; k < n_; ++k) s_c_[k] = v[2 * k + 1] - p_co_[k] * s_o_[k];
  lu_c_.solve(s_c_);
  for (int k = 0; k < n_; ++k) {
    out[2 * k] = static_cast<float>(s_o_[k]);
    out[2 * k + 1] = static_cast<float>(s_c_[k]);
  }
}

// Classical Gram-Schmidt twice ("twice is enough": Giraud, Langou & Rozloznik 2005 [mem]) in
// chunks: each pass reads the basis once with the chunk of w held in cache, where modified
// Gram-Schmidt streams w once per basis vector; the chunks go to the threads, and their partial
// sums are added in chunk order (the same bits for any thread count).
double ZoneBlockSolver::orthogonalise(Eigen::VectorXd& w, int count, Eigen::Ref<Eigen::VectorXd> h) {
  constexpr int kChunk = 4096;
  const int m = static_cast<int>(w.size());
  const int chunks = (m + kChunk - 1) / kChunk;
  if (chunks == 1) {
    // A vector of one chunk stays in cache anyway: modified Gram-Schmidt, half the arithmetic.
    for (int i = 0; i < count; ++i) {
      h[i] = w.dot(basis_[i].cast<double>());
      w -= h[i] * basis_[i].cast<double>();
    }
    return w.norm();
  }
  partial_.resize(static_cast<size_t>(chunks) * count);
  double* wp = w.data();
  std::vector<double> d(count, 0.0);  // projections still to subtract
  const auto chunk_sum = [&](int i) {
    double sum = 0.0;
    for (int c = 0; c < chunks; ++c) sum += partial_[static_cast<size_t>(c) * count + i];
    return sum;
  };
  // One sweep over the chunks: subtract d (if asked), then either project on the basis or
  // measure |w|^2 (partial sums in partial_).
  const auto sweep = [&](bool subtract, bool measure) {
#pragma omp parallel for schedule(static) if (m >= options_.parallel_from_unknowns)
    for (int c = 0; c < chunks; ++c) {
      const int b = c * kChunk, e = std::min(m, b + kChunk);
      double* out = partial_.data() + static_cast<size_t>(c) * count;
      if (subtract) {
        for (int i = 0; i < count; ++i) {
          const float* v = basis_[i].data();
          const double di = d[i];
          for (int k = b; k < e; ++k) wp[k] -= di * v[k];
        }
      }
      if (measure) {
        out[0] = chunk_dot(wp + b, wp + b, e - b);
      } else {
        for (int i = 0; i < count; ++i) out[i] = chunk_dot(wp + b, basis_[i].data() + b, e - b);
      }
    }
  };
  h.head(count).setZero();
  for (int pass = 0; pass < 2; ++pass) {
    sweep(pass > 0, false);
    for (int i = 0; i < count; ++i) h[i] += (d[i] = chunk_sum(i));
  }
  sweep(true, true);
  return std::sqrt(chunk_sum(0));
}

bool ZoneBlockSolver::solve(const Eigen::VectorXd& b, Eigen::VectorXd& dx, double rel_tol) {
  last_iterations_ = 0;
  if (!have_jacobian_ || !factored_) return false;
  const int n = n_, m = 2 * n;
  // Gas eliminated: rhs of the Schur system.
  Eigen::VectorXd &rhs = rhs_, &y = y_, &r = r_, &w = w_;
  Eigen::VectorXd& g = w;  // the gas part, before and after the Krylov iteration
  g.resize(m);
  rhs.resize(m);
  for (int k = 0; k < n; ++k) g[2 * k] = b[4 * k + 2], g[2 * k + 1] = b[4 * k + 3];
  gas_sweep(g);
  for (int k = 0; k < n; ++k) {
    const Block& q = lg_[k];
    rhs[2 * k] = b[4 * k] - (q[0] * g[2 * k] + q[1] * g[2 * k + 1]);
    rhs[2 * k + 1] = b[4 * k + 1] - (q[2] * g[2 * k] + q[3] * g[2 * k + 1]);
  }
  // Restarted, right-preconditioned GMRES on S y = rhs (Gram-Schmidt as in orthogonalise(),
  // Givens rotations).
  // Right preconditioning keeps the residual GMRES minimises the true one, which is the whole
  // Newton system's: the gas rows are solved exactly. Flexible form (Saad 1993): the
  // preconditioned vectors are kept, so the preconditioner may vary from one iteration to the
  // next (a multigrid K-cycle does), and the update at a restart needs no further solve. Both the
  // basis and the images are stored in single precision, all arithmetic in double (a compressed
  // basis, as Aliaga et al. 2023 [mem] show for GMRES): a rounded image is only another varying
  // preconditioner, used as rounded, so the Arnoldi relation holds for it exactly; the rounded
  // basis is orthonormal to ~1e-7, which bounds what one cycle can gain (7 decades, more than a
  // Newton step asks), and every restart measures the true residual in double. Half the memory
  // and the traffic of the vectors, the largest store of a large network after the network.
  const double target = rel_tol * b.norm();
  const int restart = m > 400000 ? 15 : 30;
  const int max_iterations = 300;
  y.setZero(m);
  r = rhs;
  basis_.resize(restart + 1);
  z_basis_.resize(restart);
  Eigen::MatrixXd h = Eigen::MatrixXd::Zero(restart + 1, restart);
  Eigen::VectorXd cs(restart), sn(restart), s(restart + 1);
  double beta = r.norm();
  bool converged = beta <= target;
  while (!converged && last_iterations_ < max_iterations) {
    basis_[0] = (r / beta).cast<float>();
    s.setZero();
    s[0] = beta;
    int j = 0;
    for (; j < restart && last_iterations_ < max_iterations; ++j) {
      ++last_iterations_;
      precondition(basis_[j], z_basis_[j]);  // rounded as stored, and used as rounded
      apply_schur(z_basis_[j], w);
      const double next = orthogonalise(w, j + 1, h.col(j));
      h(j + 1, j) = next;
      if (next > 0.0) basis_[j + 1] = (w / next).cast<float>();
      for (int i = 0; i < j; ++i) {
        const double t = cs[i] * h(i, j) + sn[i] * h(i + 1, j);
        h(i + 1, j) = -sn[i] * h(i, j) + cs[i] * h(i + 1, j);
        h(i, j) = t;
      }
      const double rr = std::hypot(h(j, j), h(j + 1, j));
      if (!(rr > 0.0)) return false;
      cs[j] = h(j, j) / rr;
      sn[j] = h(j + 1, j) / rr;
      h(j, j) = rr;
      h(j + 1, j) = 0.0;
      s[j + 1] = -sn[j] * s[j];
      s[j] = cs[j] * s[j];
      if (std::abs(s[j + 1]) <= target || next == 0.0) {  // converged, or the space is invariant
        ++j;
        break;
      }
    }
    // Update with the least-squares solution of the small Hessenberg system.
    Eigen::VectorXd c = h.topLeftCorner(j, j).triangularView<Eigen::Upper>().solve(s.head(j));
    for (int i = 0; i < j; ++i) y += c[i] * z_basis_[i].cast<double>();
    apply_schur(y, w);
    r = rhs - w;
    beta = r.norm();
    converged = beta <= target;
    if (!std::isfinite(beta)) return false;
  }
  if (!converged) return false;
  // Back to the gas: J_gg dg = b_g - J_gl dl.
  for (int k = 0; k < n; ++k) {
    const Block& q = gl_[k];
    g[2 * k] = b[4 * k + 2] - (q[0] * y[2 * k] + q[1] * y[2 * k + 1]);
    g[2 * k + 1] = b[4 * k + 3] - (q[2] * y[2 * k] + q[3] * y[2 * k + 1]);
  }
  gas_sweep(g);
  dx.resize(4 * n);
  for (int k = 0; k < n; ++k) {
    dx[4 * k] = y[2 * k];
    dx[4 * k + 1] = y[2 * k + 1];
    dx[4 * k + 2] = g[2 * k];
    dx[4 * k + 3] = g[2 * k + 1];
  }
  return dx.allFinite();
}

}  // namespace oxystrat
