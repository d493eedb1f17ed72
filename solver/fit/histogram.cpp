#include "solver/fit/histogram.hpp"

#include <omp.h>

#include <algorithm>
#include <bit>
#include <cmath>
#include <cstddef>
#include <cstdint>

namespace oxystrat {

// log_histogram with the range (smallest and largest positive value) known. Lists of 10^7 values
// at 10^5 cells are split over the threads (they are idle by now).
Histogram log_histogram_in_range(const std::vector<double>& values, int bins, int threads, double lo, double hi) {
  Histogram h;
  const auto n = static_cast<std::ptrdiff_t>(values.size());
  const double* x = values.data();
  threads = n > (1 << 16) ? std::max(threads, 1) : 1;
  constexpr int kWays = 4;
  const std::ptrdiff_t steps = n / kWays;
  if (hi <= 0.0) return h;
  if (hi <= lo) hi = lo * 1.0001;
  for (int i = 0; i <= bins; ++i) h.edges.push_back(lo * std::pow(hi / lo, static_cast<double>(i) / bins));
  // A value's bin is the last whose lower edge it reaches (the edges decide, so the counts agree
  // with the edges given). A first guess comes from the bits of the value: a positive double read
  // as an integer, over 2^52, less 1023, is log2 of it within 0.087 (exact at powers of two, the
  // mantissa taken as linear in between), no logarithm needed; where bins are wide enough (more
  // than 0.2 in log2) that guess is at most one bin off, and one comparison with an edge settles
  // it. Narrower bins take the logarithm for the guess.
  const double* edges = h.edges.data();
  const double log2_lo = std::log2(lo), per_log2 = bins / std::log2(hi / lo);
  const bool from_bits = per_log2 < 5.0;
  const double span = std::log(hi / lo);  // once: the compiler may not hoist it (log sets errno)
  auto bin_of = [&](double v) {
    const double guess = from_bits ? (static_cast<double>(std::bit_cast<std::int64_t>(v)) * 0x1p-52 - 1023.0 - log2_lo) * per_log2
                                   : std::log(v / lo) / span * bins;
    int b = std::clamp(static_cast<int>(guess), 0, bins - 1);
    if (b + 1 < bins && v >= edges[b + 1]) {
      ++b;
    } else if (b > 0 && v < edges[b]) {
      --b;
    }
    return b;
  };
  // Four partial counts a value apart, so that a count in the same bin does not wait for the one
  // before; integer counts do not depend on how the values are split.
  std::vector<long> counts(static_cast<size_t>(kWays) * bins, 0);  // [way][bin]
  long* c = counts.data();
  const int cells = kWays * bins;
#pragma omp parallel for num_threads(threads) reduction(+ : c[:cells])
  for (std::ptrdiff_t k = 0; k < steps; ++k) {
    for (int j = 0; j < kWays; ++j) {
      const double v = x[kWays * k + j];
      if (v > 0.0) ++c[j * bins + bin_of(v)];
    }
  }
  for (std::ptrdiff_t i = kWays * steps; i < n; ++i) {
    if (x[i] > 0.0) ++c[bin_of(x[i])];
  }
  h.counts.assign(bins, 0.0);
  for (int j = 0; j < kWays; ++j) {
    for (int b = 0; b < bins; ++b) h.counts[b] += static_cast<double>(c[j * bins + b]);
  }
  return h;
}

Histogram log_histogram(const std::vector<double>& values, int bins, int threads) {
  const auto n = static_cast<std::ptrdiff_t>(values.size());
  const double* x = values.data();
  // Four partial minima and maxima a value apart, so that no value waits for the one before it.
  threads = n > (1 << 16) ? std::max(threads, 1) : 1;
  constexpr int kWays = 4;
  const std::ptrdiff_t steps = n / kWays;
  double lo = 1e300, hi = 0.0;
#pragma omp parallel num_threads(threads)
  {
    double l[kWays] = {1e300, 1e300, 1e300, 1e300}, u[kWays] = {0.0, 0.0, 0.0, 0.0};
#pragma omp for nowait
    for (std::ptrdiff_t k = 0; k < steps; ++k) {
      for (int j = 0; j < kWays; ++j) {
        const double v = x[kWays * k + j];
        l[j] = std::min(l[j], v > 0.0 ? v : 1e300), u[j] = std::max(u[j], v);
      }
    }
#pragma omp critical(oxystrat_histogram_range)
    for (int j = 0; j < kWays; ++j) lo = std::min(lo, l[j]), hi = std::max(hi, u[j]);
  }
  for (std::ptrdiff_t i = kWays * steps; i < n; ++i) {
    if (x[i] > 0.0) lo = std::min(lo, x[i]), hi = std::max(hi, x[i]);
  }
  return log_histogram_in_range(values, bins, threads, lo, hi);
}

}  // namespace oxystrat
