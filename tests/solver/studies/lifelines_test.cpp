// Lifelines: the chain's long-run occupancy is the volume share, the mean residence time per
// visit is V / outflow, and runs are reproducible and independent of the thread count; the
// generator, the exponential ziggurat and the alias tables reproduce their distributions; fields,
// long excursions and regime passages are consistent with each other and with Kac's lemma.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "case_fixtures.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/studies/lifelines.hpp"

namespace oxystrat {
namespace {

struct Small {
  Case c = fixtures::single_impeller("rushton", 1.0 / 3.0, 3, 5);
  ZoneNetwork net = build_zone_geometry(c);
  Hydrodynamics h = compute_hydrodynamics(c, net);
  //! A "field" rising with height: below `z` is outside.
  LifelineField height(double z, bool below = true) const {
    LifelineField f{below ? "low" : "high", below ? "low height" : "high height", "m", "m", 1.0, net.z, z, below};
    return f;
  }
  double volume_share_below(double z) const {
    double v = 0.0;
    for (int k = 0; k < net.size(); ++k) v += net.z[k] < z ? net.volume[k] : 0.0;
    return v / net.total_volume();
  }
};

TEST(Lifelines, OccupancyEqualsVolumeShareAndResidenceIsVolumeOverOutflow) {
  const Small s;
  LifelineOptions o;
  o.cells = 4000;
  o.duration_s = 600.0;  // ~10^3 residence times per zone per cell
  const auto r = simulate_lifelines(s.net, s.h, {}, {}, o);
  const double v = s.net.total_volume();
  // Outflow of each zone: convective out plus exchange.
  std::vector<double> out(s.net.size(), 0.0);
  for (size_t f = 0; f < s.net.faces.size(); ++f) {
    const double q = s.h.face_flow[f], e = s.h.face_exchange[f];
    out[s.net.faces[f].zone_a] += (q > 0 ? q : 0) + e;
    out[s.net.faces[f].zone_b] += (q < 0 ? -q : 0) + e;
  }
  for (int k = 0; k < s.net.size(); ++k) {
    // Statistical tolerance: over 30 seeds, the spread (one sigma) of a zone's occupancy was at
    // most 1.6 % with 400 cells, and of its mean residence 1.0 % (visits are correlated: zones
    // mix slowly), so about 0.5 % and 0.3 % with 4000 cells: 3 % is 6 sigma or more.
    EXPECT_NEAR(r.occupancy[k] / (s.net.volume[k] / v), 1.0, 0.03) << "zone " << k;
    EXPECT_NEAR(r.residence_mean_s[k] / (s.net.volume[k] / out[k]), 1.0, 0.03) << "zone " << k;
  }
}

TEST(Lifelines, SeededAndIndependentOfThreads) {
  const Small s;
  LifelineOptions o;
  o.cells = 2000;  // ~30 blocks of cells: both threads get work, and blocks finish out of order
  o.duration_s = 60.0;
  o.threads = 1;
  o.min_excursion_s = 0.5;
  const std::vector<LifelineField> fields{s.height(0.5), s.height(0.8, false)};
  const auto regimes = impeller_regimes(s.net);
  const auto a = simulate_lifelines(s.net, s.h, fields, regimes, o);
  o.threads = 2;
  const auto b = simulate_lifelines(s.net, s.h, fields, regimes, o);
  // Bit for bit: every sum is made in the same order whatever the thread count.
  EXPECT_EQ(a.occupancy, b.occupancy);
  EXPECT_EQ(a.residence_mean_s, b.residence_mean_s);
  EXPECT_EQ(a.jumps, b.jumps);
  ASSERT_EQ(a.fields.size(), 2u);
  for (size_t f = 0; f < a.fields.size(); ++f) {
    EXPECT_EQ(a.fields[f].time_outside_fraction, b.fields[f].time_outside_fraction);
    EXPECT_EQ(a.fields[f].excursion_durations_s, b.fields[f].excursion_durations_s);
    EXPECT_EQ(a.fields[f].between_excursions_s, b.fields[f].between_excursions_s);
    EXPECT_EQ(a.fields[f].long_excursion_durations_s, b.fields[f].long_excursion_durations_s);
    EXPECT_EQ(a.fields[f].between_long_excursions_s, b.fields[f].between_long_excursions_s);
  }
  EXPECT_EQ(a.regimes.transitions_per_hour, b.regimes.transitions_per_hour);
  EXPECT_EQ(a.regimes.stay_mean_s, b.regimes.stay_mean_s);
  EXPECT_EQ(a.regimes.return_mean_s, b.regimes.return_mean_s);
  ASSERT_EQ(a.trajectories.size(), 5u);
  EXPECT_EQ(a.trajectories[4].time_s, b.trajectories[4].time_s);
  o.seed = 2;
  EXPECT_NE(simulate_lifelines(s.net, s.h, fields, regimes, o).jumps, a.jumps);  // another seed, another sample
  // Time below 0.5 m of height: about the volume share below it (cells sample the volume).
  EXPECT_NEAR(a.fields[0].mean_time_outside_fraction, s.volume_share_below(0.5), 0.08);  // 150 cells x 60 s: sampling error
}

TEST(Lifelines, FieldBelowAndAboveTheSameThresholdAreComplementary) {
  const Small s;
  LifelineOptions o;
  o.cells = 60;
  o.duration_s = 120.0;
  o.trajectories = 0;
  const auto r = simulate_lifelines(s.net, s.h, {s.height(0.45), s.height(0.45, false)}, {}, o);
  const auto& low = r.fields[0];
  const auto& high = r.fields[1];
  ASSERT_EQ(low.time_outside_fraction.size(), 60u);
  for (int c = 0; c < 60; ++c) {
    // No zone centre sits exactly at 0.45 m, so a cell is always on one side: round-off only.
    EXPECT_NEAR(low.time_outside_fraction[c] + high.time_outside_fraction[c], 1.0, 1e-12) << "cell " << c;
  }
  // A stretch below is a stretch not above: the same numbers, recorded by two fields.
  EXPECT_EQ(low.excursion_durations_s, high.between_excursions_s);
  EXPECT_EQ(low.between_excursions_s, high.excursion_durations_s);
  EXPECT_FALSE(low.excursion_durations_s.empty());
  EXPECT_TRUE(low.long_excursion_durations_s.empty());  // no minimum: no long lists
}

TEST(Lifelines, LongExcursionsAreTheCompletedOnesAtLeastTheMinimum) {
  const Small s;
  LifelineOptions o;
  o.cells = 80;
  o.duration_s = 300.0;
  const auto all = simulate_lifelines(s.net, s.h, {s.height(0.3)}, {}, o);
  o.min_excursion_s = 1.0;
  const auto r = simulate_lifelines(s.net, s.h, {s.height(0.3)}, {}, o);
  const auto& f = r.fields[0];
  // The minimum selects, it does not change the sample: same seed, same paths.
  EXPECT_EQ(f.excursion_durations_s, all.fields[0].excursion_durations_s);
  EXPECT_EQ(f.time_outside_fraction, all.fields[0].time_outside_fraction);
  std::vector<double> expected;
  std::copy_if(f.excursion_durations_s.begin(), f.excursion_durations_s.end(), std::back_inserter(expected),
               [](double d) { return d >= 1.0; });
  ASSERT_FALSE(expected.empty());
  EXPECT_EQ(f.long_excursion_durations_s, expected);
  EXPECT_LT(f.long_excursion_durations_s.size(), f.excursion_durations_s.size());
  // One interval between consecutive long excursions of a cell: at most one fewer per cell.
  EXPECT_LE(f.between_long_excursions_s.size(), f.long_excursion_durations_s.size());
  EXPECT_GE(f.between_long_excursions_s.size() + o.cells, f.long_excursion_durations_s.size());
  // An interval between long excursions spans at least one short excursion or stretch inside.
  for (double d : f.between_long_excursions_s) EXPECT_GT(d, 0.0);
  EXPECT_DOUBLE_EQ(f.long_excursions_per_hour, f.long_excursion_durations_s.size() / (o.cells * o.duration_s / 3600.0));
}

TEST(Lifelines, RegimePassagesBalanceAndFollowKacsLemma) {
  const Small s;
  LifelineOptions o;
  o.cells = 200;
  o.duration_s = 900.0;
  const auto regimes = impeller_regimes(s.net);
  ASSERT_EQ(regimes.names, (std::vector<std::string>{"impeller1", "bulk1"}));
  const auto r = simulate_lifelines(s.net, s.h, {}, regimes, o);
  const auto& g = r.regimes;
  const size_t n = g.names.size();
  const double cell_hours = o.cells * o.duration_s / 3600.0;
  double occupancy = 0.0;
  for (size_t a = 0; a < n; ++a) occupancy += g.occupancy[a];
  EXPECT_NEAR(occupancy, 1.0, 1e-12);  // shares of the same total: round-off
  for (size_t a = 0; a < n; ++a) {
    double in = 0.0, out = 0.0;
    for (size_t b = 0; b < n; ++b) in += g.transitions_per_hour[b * n + a], out += g.transitions_per_hour[a * n + b];
    // Each cell enters a regime at most once more, or less, than it leaves it.
    EXPECT_LE(std::abs(in - out) * cell_hours, o.cells + 1e-9) << g.names[a];
    ASSERT_GT(in, 0.0) << g.names[a];
    // Kac's lemma (Kac 1947, Bull. AMS 53): in a stationary chain the mean time between two
    // entries into a set is one over the rate of entries. Returns longer than what is left of
    // a cell's 900 s are cut off, which biases the mean low by a few per cent at most here.
    EXPECT_NEAR(g.return_mean_s[a] / (3600.0 / in), 1.0, 0.05) << g.names[a];
    // Time in the regime = stays x mean stay (the uncounted first and last stays of each
    // cell are a few per cent of the stays here).
    EXPECT_NEAR(g.stays[a] * g.stay_mean_s[a] / (g.occupancy[a] * o.cells * o.duration_s), 1.0, 0.05) << g.names[a];
    double counted = 0.0;
    for (double c : g.stay_histograms[a].counts) counted += c;
    EXPECT_DOUBLE_EQ(counted, static_cast<double>(g.stays[a]));
  }
}

// Flow out of each zone to each neighbour (convective plus exchange), the chain's jump rates times V.
std::vector<std::vector<std::pair<int, double>>> outflows(const Small& s) {
  std::vector<std::vector<std::pair<int, double>>> out(s.net.size());
  for (size_t f = 0; f < s.net.faces.size(); ++f) {
    const int a = s.net.faces[f].zone_a, b = s.net.faces[f].zone_b;
    const double q = s.h.face_flow[f], e = s.h.face_exchange[f];
    out[a].push_back({b, (q > 0 ? q : 0) + e});
    out[b].push_back({a, (q < 0 ? -q : 0) + e});
  }
  return out;
}

TEST(Lifelines, RegimePassageRatesAreTheStationaryFlowsBetweenRegimes) {
  // Cells start in the stationary distribution (V_i / V), so the expected number of jumps from
  // zone i to j per unit time is exactly (V_i / V) (Q_ij / V_i) = Q_ij / V at every instant.
  const Small s;
  LifelineOptions o;
  o.cells = 200;
  o.duration_s = 900.0;
  const auto regimes = impeller_regimes(s.net);
  const auto r = simulate_lifelines(s.net, s.h, {}, regimes, o);
  const size_t n = regimes.names.size();
  std::vector<double> exact(n * n, 0.0);
  const auto out = outflows(s);
  for (int i = 0; i < s.net.size(); ++i) {
    for (const auto& [j, q] : out[i]) {
      const int a = regimes.of_zone[i], b = regimes.of_zone[j];
      if (a != b) exact[a * n + b] += 3600.0 * q / s.net.total_volume();
    }
  }
  for (size_t k = 0; k < n * n; ++k) {
    if (exact[k] == 0.0) {
      EXPECT_EQ(r.regimes.transitions_per_hour[k], 0.0);
      continue;
    }
    // ~10^5 passages: 0.3 % Poisson error, but passages come in runs (a cell near the boundary
    // crosses it back and forth) and the time in each regime fluctuates as the occupancy does:
    // the 3 % of the occupancy test.
    EXPECT_NEAR(r.regimes.transitions_per_hour[k] / exact[k], 1.0, 0.03) << "passage " << k / n << " -> " << k % n;
  }
}

TEST(Lifelines, KeptPathsJumpWithTheChainsProbabilitiesAfterExponentialDwells) {
  const Small s;
  LifelineOptions o;
  o.cells = 40;
  o.trajectories = 40;
  o.duration_s = 3000.0;
  const auto r = simulate_lifelines(s.net, s.h, {}, {}, o);
  const auto out = outflows(s);
  std::vector<double> total(s.net.size(), 0.0);
  for (int i = 0; i < s.net.size(); ++i) {
    for (const auto& [j, q] : out[i]) total[i] += q;
  }
  // Dwell over its exact mean V_i / outflow_i: unit exponential, whatever the zone.
  double n = 0.0, sum = 0.0, sum2 = 0.0;
  std::vector<std::vector<double>> jumps(s.net.size(), std::vector<double>(s.net.size(), 0.0));
  std::vector<double> leaves(s.net.size(), 0.0);
  for (const auto& p : r.trajectories) {
    for (size_t k = 0; k + 1 < p.zone.size(); ++k) {
      const int i = p.zone[k];
      const double d = (p.time_s[k + 1] - p.time_s[k]) / (s.net.volume[i] / total[i]);
      n += 1.0, sum += d, sum2 += d * d;
      jumps[i][p.zone[k + 1]] += 1.0;
      leaves[i] += 1.0;
    }
  }
  ASSERT_GT(n, 1e5);
  // Mean 1 and second moment 2, standard errors 1/sqrt(n) and sqrt(20/n): 5 sigma.
  EXPECT_NEAR(sum / n, 1.0, 5.0 / std::sqrt(n));
  EXPECT_NEAR(sum2 / n, 2.0, 5.0 * std::sqrt(20.0 / n));
  // Each jump out of i goes to j with probability Q_ij / sum_k Q_ik (binomial, 5 sigma).
  for (int i = 0; i < s.net.size(); ++i) {
    double known = 0.0;
    for (const auto& [j, q] : out[i]) {
      const double p = q / total[i];
      known += jumps[i][j];
      EXPECT_NEAR(jumps[i][j] / leaves[i], p, 5.0 * std::sqrt(p * (1 - p) / leaves[i]) + 1e-12) << i << " -> " << j;
    }
    EXPECT_EQ(known, leaves[i]) << "zone " << i << ": a jump to a zone that is not a neighbour";
  }
}

}  // namespace
}  // namespace oxystrat
