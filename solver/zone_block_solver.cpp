#include "zone_block_solver.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {
namespace {

using Block = std::array<double, 4>;

bool invert(const Block& a, Block& inv) {
  const double det = a[0] * a[3] - a[1] * a[2];
  if (!(std::abs(det) > 0.0) || !std::isfinite(det)) return false;
  inv = {a[3] / det, -a[1] / det, -a[2] / det, a[0] / det};
  return true;
}

Block multiply(const Block& a, const Block& b) {
  return {a[0] * b[0] + a[1] * b[2], a[0] * b[1] + a[1] * b[3], a[2] * b[0] + a[3] * b[2], a[2] * b[1] + a[3] * b[3]};
}

}  // namespace

int ZoneBlockSolver::multigrid_from = 3000;

bool ZoneBlockSolver::accept(const ZoneLayout& layout, const Triplets& t) {
  have_jacobian_ = false;
  const int n = layout.zones;
  if (n <= 0 || layout.gas_order == nullptr || static_cast<int>(layout.gas_order->size()) != n) return false;
  if (accept_same_pattern(layout, t)) return true;
  slot_.clear();
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
  Triplets& oo = oo_scratch_;
  Triplets& cc = cc_scratch_;
  oo.clear();
  cc.clear();
  oo.reserve(t.size() / 4 + n);
  cc.reserve(t.size() / 4 + n);
  for (int k = 0; k < n; ++k) {  // explicit diagonals: the preconditioner modifies them in place
    oo.emplace_back(k, k, 0.0);
    cc.emplace_back(k, k, 0.0);
  }
  auto& up = up_scratch_;
  up.clear();
  for (const auto& e : t) {
    const int zi = e.row() >> 2, si = e.row() & 3, zj = e.col() >> 2, sj = e.col() & 3;
    if (zi >= n || zj >= n) return false;
    const double v = e.value();
    if (si < 2 && sj < 2) {
      if (si == sj) {
        (si == 0 ? oo : cc).emplace_back(zi, zj, v);
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
      up.push_back({zi, 2 * zj + sj - 2, static_cast<unsigned char>(si - 2), v});
    }
  }
  // Upstream entries grouped by receiving zone (counting sort keeps the triplet order: deterministic).
  up_start_.assign(n + 1, 0);
  for (const auto& u : up) ++up_start_[u.zone + 1];
  for (int k = 0; k < n; ++k) up_start_[k + 1] += up_start_[k];
  up_col_.resize(up.size());
  up_row_.resize(up.size());
  up_val_.resize(up.size());
  std::vector<int> fill(up_start_.begin(), up_start_.end() - 1);
  for (const auto& u : up) {
    const int at = fill[u.zone]++;
    up_col_[at] = u.col;
    up_row_[at] = u.row;
    up_val_[at] = u.value;
  }
  gg_inv_.resize(n);
  for (int k = 0; k < n; ++k) {
    if (!invert(gg_[k], gg_inv_[k])) return false;
  }
  j_oo_.resize(n, n);
  j_cc_.resize(n, n);
  j_oo_.setFromTriplets(oo.begin(), oo.end());
  j_cc_.setFromTriplets(cc.begin(), cc.end());
  remember_slots(t, fill);
  if (n >= multigrid_from) {
    // Large networks: memory is what limits them, and the scratch only serves a new pattern.
    Triplets().swap(oo);
    Triplets().swap(cc);
    std::vector<Upstream>().swap(up);
  }
  have_jacobian_ = true;
  return true;
}

// Where each triplet of the last full accept() went, so that a Jacobian with the same pattern
// (every Newton step of one problem) is taken apart by one scatter instead of sorting again.
void ZoneBlockSolver::remember_slots(const Triplets& t, std::vector<int>& fill) {
  std::copy(up_start_.begin(), up_start_.end() - 1, fill.begin());
  slot_.resize(t.size());
  pattern_.resize(t.size());
  for (size_t i = 0; i < t.size(); ++i) {
    const auto& e = t[i];
    pattern_[i] = {e.row(), e.col()};
    const int zi = e.row() >> 2, si = e.row() & 3, zj = e.col() >> 2, sj = e.col() & 3;
    double* to = nullptr;
    if (si < 2 && sj < 2) {
      to = si == sj ? &(si == 0 ? j_oo_ : j_cc_).coeffRef(zi, zj) : &(si == 0 ? x01_ : x10_)[zi];
    } else if (si < 2) {
      to = &lg_[zi][2 * si + sj - 2];
    } else if (sj < 2) {
      to = &gl_[zi][2 * (si - 2) + sj];
    } else if (zi == zj) {
      to = &gg_[zi][2 * (si - 2) + sj - 2];
    } else {
      to = &up_val_[fill[zi]++];  // the counting sort's order above
    }
    slot_[i] = to;
  }
}

bool ZoneBlockSolver::accept_same_pattern(const ZoneLayout& layout, const Triplets& t) {
  if (slot_.empty() || t.size() != slot_.size() || layout.zones != n_ || *layout.gas_order != order_) return false;
  for (size_t i = 0; i < t.size(); ++i) {
    if (t[i].row() != pattern_[i][0] || t[i].col() != pattern_[i][1]) return false;
  }
  std::fill_n(j_oo_.valuePtr(), j_oo_.nonZeros(), 0.0);
  std::fill_n(j_cc_.valuePtr(), j_cc_.nonZeros(), 0.0);
  std::fill(x01_.begin(), x01_.end(), 0.0);
  std::fill(x10_.begin(), x10_.end(), 0.0);
  for (auto* blocks : {&lg_, &gl_, &gg_}) std::fill(blocks->begin(), blocks->end(), Block{});
  std::fill(up_val_.begin(), up_val_.end(), 0.0);
  for (size_t i = 0; i < t.size(); ++i) *slot_[i] += t[i].value();
  for (int k = 0; k < n_; ++k) {
    if (!invert(gg_[k], gg_inv_[k])) return false;
  }
  have_jacobian_ = true;
  return true;
}

bool ZoneBlockSolver::refresh_preconditioner() {
  factored_ = false;
  if (!have_jacobian_) return false;
  p_oo_ = j_oo_;
  p_cc_ = j_cc_;
  p_co_.resize(n_);
  for (int k = 0; k < n_; ++k) {
    // Local Schur complement: the gas of the zone itself eliminated, the gas from below frozen.
    const Block c = multiply(lg_[k], multiply(gg_inv_[k], gl_[k]));
    p_oo_.coeffRef(k, k) -= c[0];
    p_cc_.coeffRef(k, k) -= c[3];
    p_co_[k] = x10_[k] - c[2];
  }
  multigrid_ = n_ >= multigrid_from;
  if (multigrid_) {
    if (!mg_o_.setup(p_oo_) || !mg_c_.setup(p_cc_)) return false;
    p_oo_ = Eigen::SparseMatrix<double>();  // the hierarchy holds its own copy
    p_cc_ = Eigen::SparseMatrix<double>();
  } else if (!lu_o_.factorize(p_oo_) || !lu_c_.factorize(p_cc_)) {
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
    const Block& m = gg_inv_[k];
    g[2 * k] = m[0] * a + m[1] * b;
    g[2 * k + 1] = m[2] * a + m[3] * b;
  }
}

void ZoneBlockSolver::apply_schur(const Eigen::VectorXd& v, Eigen::VectorXd& out) {
  t_gas_.resize(2 * n_);
  s_o_.resize(n_);
  s_c_.resize(n_);
  for (int k = 0; k < n_; ++k) {
    const Block& m = gl_[k];
    const double a = v[2 * k], b = v[2 * k + 1];
    t_gas_[2 * k] = m[0] * a + m[1] * b;
    t_gas_[2 * k + 1] = m[2] * a + m[3] * b;
    s_o_[k] = a;
    s_c_[k] = b;
  }
  gas_sweep(t_gas_);
  jo_.noalias() = j_oo_ * s_o_;
  jc_.noalias() = j_cc_ * s_c_;
  const Eigen::VectorXd &jo = jo_, &jc = jc_;
  out.resize(2 * n_);
  for (int k = 0; k < n_; ++k) {
    const Block& m = lg_[k];
    const double ga = t_gas_[2 * k], gb = t_gas_[2 * k + 1];
    out[2 * k] = jo[k] + x01_[k] * v[2 * k + 1] - (m[0] * ga + m[1] * gb);
    out[2 * k + 1] = jc[k] + x10_[k] * v[2 * k] - (m[2] * ga + m[3] * gb);
  }
}

void ZoneBlockSolver::precondition(const Eigen::VectorXd& v, Eigen::VectorXd& out) {
  s_o_.resize(n_);
  for (int k = 0; k < n_; ++k) s_o_[k] = v[2 * k];
  if (multigrid_) {
    // Block Jacobi between the species (the CO2 block does not wait for the O2 one), so the two
    // cycles run side by side on two threads; each is sequential in itself, so the result is
    // the same for any thread count. Measured 9808 / 97,953 zones: 94 / 116 Krylov iterations
    // instead of 93 / 108 with Gauss-Seidel between the species, 147 -> 95 ms and 2.55 -> 2.01 s.
    s_c_.resize(n_);
    for (int k = 0; k < n_; ++k) s_c_[k] = v[2 * k + 1];
#pragma omp parallel sections
    {
#pragma omp section
      mg_o_.solve(s_o_);
#pragma omp section
      mg_c_.solve(s_c_);
    }
    out.resize(2 * n_);
    for (int k = 0; k < n_; ++k) {
      out[2 * k] = s_o_[k];
      out[2 * k + 1] = s_c_[k];
    }
    return;
  }
  lu_o_.solve(s_o_);
  const Eigen::VectorXd& zo = s_o_;
  s_c_.resize(n_);
  for (int k = 0; k < n_; ++k) s_c_[k] = v[2 * k + 1] - p_co_[k] * zo[k];
  lu_c_.solve(s_c_);
  const Eigen::VectorXd& zc = s_c_;
  out.resize(2 * n_);
  for (int k = 0; k < n_; ++k) {
    out[2 * k] = zo[k];
    out[2 * k + 1] = zc[k];
  }
}

bool ZoneBlockSolver::solve(const Eigen::VectorXd& b, Eigen::VectorXd& dx, double rel_tol) {
  last_iterations_ = 0;
  if (!have_jacobian_ || !factored_) return false;
  const int n = n_, m = 2 * n;
  // Gas eliminated: rhs of the Schur system.
  Eigen::VectorXd g(m), rhs(m);
  for (int k = 0; k < n; ++k) g[2 * k] = b[4 * k + 2], g[2 * k + 1] = b[4 * k + 3];
  gas_sweep(g);
  for (int k = 0; k < n; ++k) {
    const Block& q = lg_[k];
    rhs[2 * k] = b[4 * k] - (q[0] * g[2 * k] + q[1] * g[2 * k + 1]);
    rhs[2 * k + 1] = b[4 * k + 1] - (q[2] * g[2 * k] + q[3] * g[2 * k + 1]);
  }
  // Restarted, right-preconditioned GMRES on S y = rhs (modified Gram-Schmidt, Givens rotations).
  // Right preconditioning keeps the residual GMRES minimises the true one, which is the whole
  // Newton system's: the gas rows are solved exactly. Flexible form (Saad 1993): the
  // preconditioned vectors are kept, so the preconditioner may vary from one iteration to the
  // next (a multigrid K-cycle does), and the update at a restart needs no further solve.
  const double target = rel_tol * b.norm();
  const int restart = m > 400000 ? 15 : 30;
  const int max_iterations = 300;
  Eigen::VectorXd y = Eigen::VectorXd::Zero(m), r = rhs, w(m);
  basis_.resize(restart + 1);
  z_basis_.resize(restart);
  Eigen::MatrixXd h = Eigen::MatrixXd::Zero(restart + 1, restart);
  Eigen::VectorXd cs(restart), sn(restart), s(restart + 1);
  double beta = r.norm();
  bool converged = beta <= target;
  while (!converged && last_iterations_ < max_iterations) {
    basis_[0] = r / beta;
    s.setZero();
    s[0] = beta;
    int j = 0;
    for (; j < restart && last_iterations_ < max_iterations; ++j) {
      ++last_iterations_;
      precondition(basis_[j], z_basis_[j]);
      apply_schur(z_basis_[j], w);
      for (int i = 0; i <= j; ++i) {
        h(i, j) = w.dot(basis_[i]);
        w -= h(i, j) * basis_[i];
      }
      const double next = w.norm();
      h(j + 1, j) = next;
      if (next > 0.0) basis_[j + 1] = w / next;
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
    for (int i = 0; i < j; ++i) y += c[i] * z_basis_[i];
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
