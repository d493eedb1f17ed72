#include "postproc/report/display_bins.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat::report {
namespace {

constexpr double kFloorRatio = 1e-3;  // floor = largest / 1000: three decades are shown
constexpr double kBinsPerDecade = 4.0;
constexpr int kMaxBins = 16;

DisplayBins bin(const std::vector<double>& values, const std::vector<double>& weights) {
  DisplayBins out;
  double lo = HUGE_VAL, hi = 0.0;
  for (size_t i = 0; i < values.size(); ++i) {
    if (weights[i] > 0.0 && values[i] > 0.0 && std::isfinite(values[i])) lo = std::min(lo, values[i]), hi = std::max(hi, values[i]);
  }
  if (hi <= 0.0) return out;
  const double floor = std::max(lo, kFloorRatio * hi);
  // One bin for a single value (or values within a few per cent): a bin of +-10 % around it.
  const double top = hi > 1.05 * floor ? hi * (1.0 + 1e-9) : 1.1 * hi;
  const double bottom = hi > 1.05 * floor ? floor : hi / 1.1;
  const int n = std::clamp(static_cast<int>(std::ceil(kBinsPerDecade * std::log10(top / bottom))), 1, kMaxBins);
  for (int i = 0; i <= n; ++i) out.edges.push_back(bottom * std::pow(top / bottom, static_cast<double>(i) / n));
  out.counts.assign(n, 0.0);
  for (size_t i = 0; i < values.size(); ++i) {
    const double v = values[i];
    if (!(v >= bottom)) {
      out.below += weights[i];
      continue;
    }
    const int k = std::clamp(static_cast<int>(n * std::log(v / bottom) / std::log(top / bottom)), 0, n - 1);
    out.counts[k] += weights[i];
  }
  return out;
}

}  // namespace

DisplayBins display_bins(const std::vector<double>& values) { return bin(values, std::vector<double>(values.size(), 1.0)); }

DisplayBins display_bins(const Histogram& h) {
  std::vector<double> centres, counts;
  for (size_t i = 0; i < h.counts.size() && i + 1 < h.edges.size(); ++i) {
    centres.push_back(std::sqrt(std::max(h.edges[i], 0.0) * h.edges[i + 1]));
    counts.push_back(h.counts[i]);
  }
  return bin(centres, counts);
}

}  // namespace oxystrat::report
