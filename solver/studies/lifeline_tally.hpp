// Inside the lifelines (solver/studies/lifelines.hpp): what the cells add up as they move: each
// zone's time and visits, the regime passages in fixed logarithmic bins, each field's lists of
// excursions. One tally per thread, merged in block order, so that the sums do not depend on the
// thread count. Not a public interface.
#pragma once

#include <algorithm>
#include <bit>
#include <cstdint>
#include <vector>

namespace oxystrat::lifelines_detail {

// Fixed logarithmic bins for the regime statistics, merged as integers.
// Edges at 2^(i/4 - 12) s, i = 0 .. kBins: 0.24 ms to 18 h; values outside land in the end bins.
constexpr int kBins = 112;
constexpr int kBinOffset = 48;  // 4 * 12
// floor(4 log2 t) + offset, without a logarithm (called on every regime change): the binary
// exponent of t^4, two products. Their rounding moves a value to the next bin only within a few
// 1e-16 (relative) of an edge.
inline int log_bin(double t) {
  if (!(t > 0.0)) return 0;
  const double t2 = t * t;
  const int e = static_cast<int>(std::bit_cast<std::uint64_t>(t2 * t2) >> 52) - 1023;
  return std::clamp(e + kBinOffset, 0, kBins - 1);
}

// The smallest and largest positive value of a list (what its histogram spans).
struct ValueRange {
  double lo = 1e300, hi = 0.0;
  void add(const std::vector<double>& v) {
    for (double x : v) {
      if (x > 0.0) lo = std::min(lo, x), hi = std::max(hi, x);
    }
  }
};

struct FieldEvents {
  std::vector<double> excursions, between, long_excursions, long_between;
  // Of the lists as appended to (while a block's values are still in the cache: the merged lists
  // of 10^5 cells, hundreds of MB, are then not read once more for it).
  ValueRange excursions_range, between_range, long_excursions_range, long_between_range;
  void clear() { excursions.clear(), between.clear(), long_excursions.clear(), long_between.clear(); }
  void append_to(FieldEvents& to) const {
    auto append = [](std::vector<double>& a, ValueRange& r, const std::vector<double>& b) {
      a.insert(a.end(), b.begin(), b.end());
      r.add(b);
    };
    append(to.excursions, to.excursions_range, excursions), append(to.between, to.between_range, between);
    append(to.long_excursions, to.long_excursions_range, long_excursions);
    append(to.long_between, to.long_between_range, long_between);
  }
};

// Time [s] and completed visits of a zone, as one pair of doubles so that a move updates both
// with one packed add (visit counts stay exact in a double up to 2^53).
typedef double Pair __attribute__((vector_size(16)));
struct ZoneTally {
  Pair sum{0.0, 0.0};  // {time, visits}
};

// What a block of cells adds up apart from the per-cell event lists; one per thread, cleared
// per block, merged in block order (so the sums do not depend on the thread count).
struct Tally {
  std::vector<ZoneTally> zone;
  std::vector<long> transitions;          // R x R
  std::vector<double> stay_sum, return_sum;
  std::vector<long> stay_count, return_count;
  std::vector<long> stay_bins, return_bins;  // R x kBins

  Tally(int zones, int regimes)
      : zone(zones), transitions(static_cast<size_t>(regimes) * regimes), stay_sum(regimes), return_sum(regimes),
        stay_count(regimes), return_count(regimes), stay_bins(static_cast<size_t>(regimes) * kBins),
        return_bins(static_cast<size_t>(regimes) * kBins) {}
  void clear() {  // not the zone sums: a block's are copied in whole from the zone records
    for (auto* v : {&transitions, &stay_count, &return_count, &stay_bins, &return_bins}) std::fill(v->begin(), v->end(), 0);
    std::fill(stay_sum.begin(), stay_sum.end(), 0.0);
    std::fill(return_sum.begin(), return_sum.end(), 0.0);
  }
  void add(const Tally& o) {
    for (size_t k = 0; k < zone.size(); ++k) zone[k].sum += o.zone[k].sum;
    for (size_t i = 0; i < transitions.size(); ++i) transitions[i] += o.transitions[i];
    for (size_t i = 0; i < stay_sum.size(); ++i) {
      stay_sum[i] += o.stay_sum[i], return_sum[i] += o.return_sum[i];
      stay_count[i] += o.stay_count[i], return_count[i] += o.return_count[i];
    }
    for (size_t i = 0; i < stay_bins.size(); ++i) stay_bins[i] += o.stay_bins[i], return_bins[i] += o.return_bins[i];
  }
};

// Everything the threads add up, merged in block order.
struct Totals {
  Tally tally;
  std::vector<FieldEvents> events;  // per field
  std::vector<std::vector<double>> outside;  // [field][cell]: time outside [s]
};

}  // namespace oxystrat::lifelines_detail
