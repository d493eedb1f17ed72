#include "lifelines.hpp"

#include <omp.h>

#include <algorithm>
#include <cmath>
#include <random>

namespace oxystrat {
namespace {

// Outgoing transitions of every zone in compressed rows: rates [1/s] and cumulative shares.
struct Transitions {
  std::vector<int> start;         //!< per zone, index of its first transition (size zones + 1)
  std::vector<int> to;
  std::vector<double> cumulative; //!< cumulative probability within the zone's row
  std::vector<double> leave_rate; //!< total leaving rate [1/s]
};

Transitions build(const ZoneNetwork& net, const Hydrodynamics& h) {
  const int n = net.size();
  std::vector<std::vector<std::pair<int, double>>> out(n);
  for (size_t f = 0; f < net.faces.size(); ++f) {
    const int a = net.faces[f].zone_a, b = net.faces[f].zone_b;
    const double q = h.face_flow[f], e = h.face_exchange[f];
    const double ab = (q > 0.0 ? q : 0.0) + e, ba = (q < 0.0 ? -q : 0.0) + e;
    if (ab > 0.0) out[a].push_back({b, ab});
    if (ba > 0.0) out[b].push_back({a, ba});
  }
  Transitions t;
  t.start.push_back(0);
  t.leave_rate.resize(n);
  for (int k = 0; k < n; ++k) {
    double total = 0.0;
    for (const auto& [j, flow] : out[k]) total += flow;
    double acc = 0.0;
    for (const auto& [j, flow] : out[k]) {
      acc += flow / total;
      t.to.push_back(j);
      t.cumulative.push_back(acc);
    }
    if (!out[k].empty()) t.cumulative.back() = 1.0;
    t.leave_rate[k] = total / net.volume[k];
    t.start.push_back(static_cast<int>(t.to.size()));
  }
  return t;
}

// A cell's own generator: seeded from (seed, cell), so results do not depend on scheduling.
std::mt19937_64 cell_rng(std::uint64_t seed, int cell) {
  std::seed_seq seq{static_cast<std::uint32_t>(seed), static_cast<std::uint32_t>(seed >> 32),
                    static_cast<std::uint32_t>(cell), 0x6f78u};
  return std::mt19937_64(seq);
}

struct CellRecord {
  std::vector<double> time_in_zone;
  std::vector<long> visits;
  double below = 0.0;
  std::vector<double> excursions, between;
  long jumps = 0;
  Trajectory path;
};

}  // namespace

Histogram log_histogram(const std::vector<double>& values, int bins) {
  Histogram h;
  double lo = 1e300, hi = 0.0;
  for (double v : values) {
    if (v > 0.0) lo = std::min(lo, v), hi = std::max(hi, v);
  }
  if (hi <= 0.0) return h;
  if (hi <= lo) hi = lo * 1.0001;
  for (int i = 0; i <= bins; ++i) h.edges.push_back(lo * std::pow(hi / lo, static_cast<double>(i) / bins));
  h.counts.assign(bins, 0.0);
  for (double v : values) {
    if (v <= 0.0) continue;
    const int b = std::clamp(static_cast<int>(std::log(v / lo) / std::log(hi / lo) * bins), 0, bins - 1);
    h.counts[b] += 1.0;
  }
  return h;
}

LifelineResult simulate_lifelines(const ZoneNetwork& net, const Hydrodynamics& h, const std::vector<double>& do_field,
                                  double critical, const LifelineOptions& opts) {
  const int n = net.size();
  const Transitions t = build(net, h);
  // Start positions drawn from the stationary distribution V_i / V.
  std::vector<double> start_cdf(n);
  double acc = 0.0;
  for (int k = 0; k < n; ++k) start_cdf[k] = (acc += net.volume[k]);
  for (auto& c : start_cdf) c /= acc;
  const bool with_do = !do_field.empty();
  std::vector<CellRecord> cells(static_cast<size_t>(opts.cells));
  if (opts.threads > 0) omp_set_num_threads(opts.threads);
#pragma omp parallel for schedule(dynamic, 16)
  for (int c = 0; c < opts.cells; ++c) {
    auto rng = cell_rng(opts.seed, c);
    std::uniform_real_distribution<double> u(0.0, 1.0);
    CellRecord& rec = cells[c];
    rec.time_in_zone.assign(n, 0.0);
    rec.visits.assign(n, 0);
    int zone = static_cast<int>(std::lower_bound(start_cdf.begin(), start_cdf.end(), u(rng)) - start_cdf.begin());
    zone = std::min(zone, n - 1);
    double time = 0.0;
    bool below = with_do && do_field[zone] < critical;
    double state_since = 0.0;
    bool seen_change = false;  // the first interval started with the simulation: not a complete one
    const bool keep_path = c < opts.trajectories;
    while (time < opts.duration_s) {
      if (keep_path) rec.path.time_s.push_back(time), rec.path.zone.push_back(zone);
      const double rate = t.leave_rate[zone];
      const double dwell = rate > 0.0 ? -std::log(1.0 - u(rng)) / rate : opts.duration_s;
      const double stay = std::min(dwell, opts.duration_s - time);
      rec.time_in_zone[zone] += stay;
      rec.visits[zone] += dwell <= opts.duration_s - time ? 1 : 0;  // count completed visits only
      if (below) rec.below += stay;
      time += dwell;
      if (time >= opts.duration_s || t.start[zone] == t.start[zone + 1]) break;
      const double r = u(rng);
      int j = t.start[zone];
      while (j + 1 < t.start[zone + 1] && t.cumulative[j] < r) ++j;
      zone = t.to[j];
      ++rec.jumps;
      const bool now_below = with_do && do_field[zone] < critical;
      if (now_below != below) {
        if (seen_change) (below ? rec.excursions : rec.between).push_back(time - state_since);
        seen_change = true;
        state_since = time;
        below = now_below;
      }
    }
  }
  // Reduce in cell order: the same numbers whatever the thread count.
  LifelineResult res;
  res.occupancy.assign(n, 0.0);
  res.residence_mean_s.assign(n, 0.0);
  res.visits.assign(n, 0);
  double total_time = 0.0;
  long excursion_starts = 0;
  for (auto& rec : cells) {
    for (int k = 0; k < n; ++k) {
      res.occupancy[k] += rec.time_in_zone[k];
      res.visits[k] += rec.visits[k];
    }
    res.time_below_fraction.push_back(rec.below / opts.duration_s);
    res.excursion_durations_s.insert(res.excursion_durations_s.end(), rec.excursions.begin(), rec.excursions.end());
    res.between_excursions_s.insert(res.between_excursions_s.end(), rec.between.begin(), rec.between.end());
    excursion_starts += static_cast<long>(rec.excursions.size());
    res.jumps += rec.jumps;
    if (!rec.path.zone.empty()) res.trajectories.push_back(std::move(rec.path));
  }
  for (int k = 0; k < n; ++k) total_time += res.occupancy[k];
  for (int k = 0; k < n; ++k) {
    res.residence_mean_s[k] = res.visits[k] > 0 ? res.occupancy[k] / res.visits[k] : 0.0;
    res.occupancy[k] /= total_time;
  }
  double sum = 0.0;
  for (double f : res.time_below_fraction) sum += f;
  res.mean_time_below_fraction = opts.cells > 0 ? sum / opts.cells : 0.0;
  res.excursions_per_hour = excursion_starts / (opts.cells * opts.duration_s / 3600.0);
  res.excursion_histogram = log_histogram(res.excursion_durations_s);
  res.between_histogram = log_histogram(res.between_excursions_s);
  return res;
}

}  // namespace oxystrat
