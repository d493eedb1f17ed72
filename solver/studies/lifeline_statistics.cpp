#include "solver/studies/lifeline_statistics.hpp"

#include <cmath>
#include <utility>

#include "solver/fit/histogram.hpp"

namespace oxystrat::lifelines_detail {
namespace {

Histogram fixed_bin_histogram(const long* counts) {
  Histogram h;
  int lo = 0, hi = kBins - 1;
  while (lo < kBins && counts[lo] == 0) ++lo;
  while (hi >= 0 && counts[hi] == 0) --hi;
  if (lo > hi) return h;
  for (int i = lo; i <= hi + 1; ++i) h.edges.push_back(std::exp2((i - kBinOffset) / 4.0));
  for (int i = lo; i <= hi; ++i) h.counts.push_back(static_cast<double>(counts[i]));
  return h;
}

}  // namespace

void collect_statistics(LifelineResult& res, Totals& totals, const std::vector<LifelineField>& fields,
                        const LifelineRegimes& regimes, const LifelineOptions& opts, int threads) {
  const int n = static_cast<int>(totals.tally.zone.size());
  const int n_fields = static_cast<int>(fields.size());
  const int n_regimes = static_cast<int>(regimes.names.size());
  const int cells = res.cells;
  const Tally& total = totals.tally;
  auto& outside = totals.outside;
  auto& events = totals.events;

  res.occupancy.assign(n, 0.0);
  res.residence_mean_s.assign(n, 0.0);
  res.visits.assign(n, 0);
  double total_time = 0.0;
  for (int k = 0; k < n; ++k) total_time += total.zone[k].sum[0];
  for (int k = 0; k < n; ++k) {
    const double time = total.zone[k].sum[0];
    res.visits[k] = static_cast<long>(total.zone[k].sum[1]);
    res.jumps += res.visits[k];  // every completed visit ends in a move
    res.residence_mean_s[k] = res.visits[k] > 0 ? time / res.visits[k] : 0.0;
    res.occupancy[k] = total_time > 0.0 ? time / total_time : 0.0;
  }
  const double cell_hours = cells * opts.duration_s / 3600.0;
  for (int f = 0; f < n_fields; ++f) {
    const LifelineField& in = fields[f];
    FieldStatistics s;
    s.name = in.name, s.label = in.label, s.unit = in.unit, s.display_unit = in.display_unit;
    s.display_scale = in.display_scale, s.threshold = in.threshold, s.below = in.below;
    s.min_excursion_s = opts.min_excursion_s;
    s.time_outside_fraction = std::move(outside[f]);
    double sum = 0.0;
    for (double& x : s.time_outside_fraction) sum += (x /= opts.duration_s);
    s.mean_time_outside_fraction = cells > 0 ? sum / cells : 0.0;
    FieldEvents& ev = events[f];
    s.excursion_durations_s = std::move(ev.excursions);
    s.between_excursions_s = std::move(ev.between);
    s.long_excursion_durations_s = std::move(ev.long_excursions);
    s.between_long_excursions_s = std::move(ev.long_between);
    s.excursions_per_hour = cell_hours > 0 ? s.excursion_durations_s.size() / cell_hours : 0.0;
    s.long_excursions_per_hour = cell_hours > 0 ? s.long_excursion_durations_s.size() / cell_hours : 0.0;
    s.excursion_histogram = log_histogram_in_range(s.excursion_durations_s, 20, threads, ev.excursions_range.lo, ev.excursions_range.hi);
    s.between_histogram = log_histogram_in_range(s.between_excursions_s, 20, threads, ev.between_range.lo, ev.between_range.hi);
    s.long_excursion_histogram =
        log_histogram_in_range(s.long_excursion_durations_s, 20, threads, ev.long_excursions_range.lo, ev.long_excursions_range.hi);
    s.between_long_histogram = log_histogram_in_range(s.between_long_excursions_s, 20, threads, ev.long_between_range.lo, ev.long_between_range.hi);
    res.fields.push_back(std::move(s));
  }
  RegimeStatistics& rs = res.regimes;
  rs.names = regimes.names;
  rs.transitions_per_hour.resize(total.transitions.size());
  for (size_t i = 0; i < total.transitions.size(); ++i) rs.transitions_per_hour[i] = cell_hours > 0 ? total.transitions[i] / cell_hours : 0.0;
  rs.occupancy.assign(n_regimes, 0.0);
  for (int k = 0; k < n && n_regimes > 0; ++k) rs.occupancy[regimes.of_zone[k]] += res.occupancy[k];
  for (int g = 0; g < n_regimes; ++g) {
    rs.stays.push_back(total.stay_count[g]);
    rs.stay_mean_s.push_back(total.stay_count[g] > 0 ? total.stay_sum[g] / total.stay_count[g] : 0.0);
    rs.return_mean_s.push_back(total.return_count[g] > 0 ? total.return_sum[g] / total.return_count[g] : 0.0);
    rs.stay_histograms.push_back(fixed_bin_histogram(&total.stay_bins[static_cast<size_t>(g) * kBins]));
    rs.return_histograms.push_back(fixed_bin_histogram(&total.return_bins[static_cast<size_t>(g) * kBins]));
  }
}

}  // namespace oxystrat::lifelines_detail
