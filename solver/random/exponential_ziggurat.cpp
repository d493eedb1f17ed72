#include "solver/random/exponential_ziggurat.hpp"

#include <cmath>

namespace oxystrat {

double ExponentialZiggurat::base_edge(int layers) {
  // Marsaglia & Tsang (2000): layers of equal area v = (r + 1) exp(-r) (the base layer is the
  // rectangle up to r plus the tail beyond it); from r, each layer's left edge follows from the one
  // below. The right r makes the top layer end at x = 0: v / x_1 + exp(-x_1) = 1. Too small an r
  // runs out of area before the top (the argument of the logarithm reaches 1).
  auto excess = [layers](double r) {
    const double v = (r + 1.0) * std::exp(-r);
    double x = r;
    for (int i = layers - 2; i >= 1; --i) {
      const double a = v / x + std::exp(-x);
      if (a >= 1.0) return 1.0;
      x = -std::log(a);
    }
    return v / x + std::exp(-x) - 1.0;
  };
  double lo = 1.0, hi = 40.0;
  for (int k = 0; k < 200 && hi - lo > 1e-15 * hi; ++k) {
    const double mid = 0.5 * (lo + hi);
    (excess(mid) > 0.0 ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

ExponentialZiggurat::ExponentialZiggurat() : r_([] {
  static const double edge = base_edge(kLayers);  // once: the bisection takes some 10^5 exp and log
  return edge;
}()) {
  // Marsaglia & Tsang (2000)'s set-up with 32-bit abscissae, for kLayers layers.
  constexpr int n = kLayers;
  const double m = 0x1.0p32;
  double d = r_, prev = d;
  const double v = (r_ + 1.0) * std::exp(-r_);
  const double q = v / std::exp(-d);
  k_[0] = static_cast<std::uint32_t>((d / q) * m);
  k_[1] = 0;
  w_[0] = q / m;
  w_[n - 1] = d / m;
  f_[0] = 1.0;
  f_[n - 1] = std::exp(-d);
  for (int i = n - 2; i >= 1; --i) {
    d = -std::log(v / d + std::exp(-d));
    k_[i + 1] = static_cast<std::uint32_t>((d / prev) * m);
    prev = d;
    f_[i] = std::exp(-d);
    w_[i] = d / m;
  }
  // Layer i >= 1 spans x in [0, x_i], y in [f_i, f_{i-1}]; its wedge is x in [x_{i-1}, x_i], with
  // x_0 = 0 (the top layer is all wedge).
  for (int i = 1; i < n; ++i) {
    x_[i] = w_[i] * m;
    const double left = i > 1 ? w_[i - 1] * m : 0.0;
    const double width = x_[i] - left, drop = f_[i - 1] - f_[i];
    inv_width_[i] = 1.0 / width;
    tangent_right_[i] = f_[i] * width / drop;     // < 1
    tangent_left_[i] = f_[i - 1] * width / drop;  // > 1
  }
}

double ExponentialZiggurat::slow(CellRandom& rng, unsigned i, std::uint32_t j) const {
  const Slow d = slow_words(rng.words(), i, j);
  rng = CellRandom(d.words);
  return d.x;
}

ExponentialZiggurat::Slow ExponentialZiggurat::slow_words(CellRandom::Words words, unsigned i, std::uint32_t j) const {
  CellRandom rng(words);
  for (;;) {
    if (i == 0) return {r_ - std::log1p(-rng.uniform()), rng.words()};  // memoryless tail beyond r
    const double x = static_cast<double>(j) * w_[i];
    // y = f_i + u (f_{i-1} - f_i) against exp(-x). With s the position under the chord (1 at
    // x_{i-1}, 0 at x_i): above the chord is above the curve; below either tangent is below it.
    // Only between them is exp needed (the same decisions, a few times fewer exp calls).
    const double u = rng.uniform();
    const double s = (x_[i] - x) * inv_width_[i];
    if (u <= s) {
      if (u < s * tangent_right_[i] || u < 1.0 - (1.0 - s) * tangent_left_[i]) return {x, rng.words()};
      if (f_[i] + u * (f_[i - 1] - f_[i]) < std::exp(-x)) return {x, rng.words()};
    }
    const std::uint64_t b = rng.next();
    i = layer(b);
    j = abscissa(b);
    if (j < k_[i]) return {static_cast<double>(j) * w_[i], rng.words()};
  }
}

}  // namespace oxystrat
