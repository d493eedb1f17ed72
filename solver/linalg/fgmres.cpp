#include "solver/linalg/fgmres.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>

#include "solver/linalg/parallel_loop.hpp"

namespace oxystrat {
namespace {

// Sum of a[k] b[k] with eight partial sums, so that the additions do not wait for each other; a
// fixed order, so the same bits each time.
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

// out = in in double, and out = in / divisor in single precision (the same arithmetic as the
// Eigen expressions they replace), split over the threads from `parallel_from` entries on.
void widen(const Eigen::VectorXf& in, Eigen::VectorXd& out, int parallel_from) {
  const auto n = in.size();
  out.resize(n);
  parallel_loop(n, n >= parallel_from, [&](Eigen::Index k) { out[k] = static_cast<double>(in[k]); });
}

void narrow_divided(const Eigen::VectorXd& in, double divisor, Eigen::VectorXf& out, int parallel_from) {
  const auto n = in.size();
  out.resize(n);
  parallel_loop(n, n >= parallel_from, [&](Eigen::Index k) { out[k] = static_cast<float>(in[k] / divisor); });
}

}  // namespace

// x += sum_i c_i z_i over the first `count` preconditioned vectors, entry by entry in one pass
// (each entry's sum in the order of i, as count separate updates would add it).
void Fgmres::add_combination(const Eigen::VectorXd& c, int count, Eigen::VectorXd& x, int parallel_from) const {
  const auto n = x.size();
  parallel_loop(n, n >= parallel_from, [&](Eigen::Index k) {
    double v = x[k];
    for (int i = 0; i < count; ++i) v += c[i] * static_cast<double>(z_basis_[i][k]);
    x[k] = v;
  });
}

double Fgmres::orthogonalise(Eigen::VectorXd& w, int count, Eigen::Ref<Eigen::VectorXd> h, int parallel_from) {
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
  const int width = count + 1;  // per chunk: the projections, then |w|^2
  partial_.resize(static_cast<size_t>(chunks) * width);
  double* wp = w.data();
  std::vector<double> d(count, 0.0);  // projections still to subtract
  const auto chunk_sum = [&](int i) {
    double sum = 0.0;
    for (int c = 0; c < chunks; ++c) sum += partial_[static_cast<size_t>(c) * width + i];
    return sum;
  };
  // One sweep over the chunks: subtract d, or project on the basis; then measure |w|^2.
  const auto sweep = [&](bool subtract) {
    parallel_loop(chunks, m >= parallel_from, [&](int c) {
      const int b = c * kChunk, e = std::min(m, b + kChunk);
      double* out = partial_.data() + static_cast<size_t>(c) * width;
      if (subtract) {
        for (int i = 0; i < count; ++i) {
          const float* v = basis_[i].data();
          const double di = d[i];
          for (int k = b; k < e; ++k) wp[k] -= di * v[k];
        }
      } else {
        for (int i = 0; i < count; ++i) out[i] = chunk_dot(wp + b, basis_[i].data() + b, e - b);
      }
      out[count] = chunk_dot(wp + b, wp + b, e - b);
    });
  };
  h.head(count).setZero();
  double norm2 = 0.0;
  for (int pass = 0; pass < 2; ++pass) {
    sweep(false);
    const double before = chunk_sum(count);
    for (int i = 0; i < count; ++i) h[i] += (d[i] = chunk_sum(i));
    sweep(true);
    norm2 = chunk_sum(count);
    // A second pass only where the first cancelled more than 90 % of the norm (see the header).
    if (!(norm2 < 1e-2 * before)) break;
  }
  return std::sqrt(norm2);
}

bool Fgmres::solve(const Operator& a, const Preconditioner& m, const Eigen::VectorXd& b, Eigen::VectorXd& x,
                   double rel_tol, const FgmresOptions& o) {
  iterations_ = 0;
  const auto n = b.size();
  const int restart = std::max(1, o.restart);
  const double target = rel_tol * b.norm();
  x.setZero(n);
  r_ = b;
  basis_.resize(restart + 1);
  z_basis_.resize(restart);
  Eigen::MatrixXd h = Eigen::MatrixXd::Zero(restart + 1, restart);
  Eigen::VectorXd cs(restart), sn(restart), s(restart + 1);
  double beta = r_.norm();
  bool converged = beta <= target;
  while (!converged && iterations_ < o.max_iterations) {
    narrow_divided(r_, beta, basis_[0], o.parallel_from_unknowns);
    s.setZero();
    s[0] = beta;
    int j = 0;
    for (; j < restart && iterations_ < o.max_iterations; ++j) {
      ++iterations_;
      m(basis_[j], z_basis_[j]);  // rounded as stored, and used as rounded
      widen(z_basis_[j], zd_, o.parallel_from_unknowns);
      a(zd_, w_);
      const double next = orthogonalise(w_, j + 1, h.col(j), o.parallel_from_unknowns);
      h(j + 1, j) = next;
      if (next > 0.0) narrow_divided(w_, next, basis_[j + 1], o.parallel_from_unknowns);
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
    // Update with the least-squares solution of the small Hessenberg system, then the true
    // residual in double.
    const Eigen::VectorXd c = h.topLeftCorner(j, j).triangularView<Eigen::Upper>().solve(s.head(j));
    add_combination(c, j, x, o.parallel_from_unknowns);
    a(x, w_);
    r_ = b - w_;
    beta = r_.norm();
    if (!std::isfinite(beta)) return false;
    converged = beta <= target;
  }
  return converged;
}

}  // namespace oxystrat
