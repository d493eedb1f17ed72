// Lifelines: the chain's long-run occupancy is the volume share, the mean residence time per
// visit is V / outflow, and runs are reproducible and independent of the thread count.
#include <gtest/gtest.h>

#include <cmath>

#include "case_fixtures.hpp"
#include "hydrodynamics.hpp"
#include "lifelines.hpp"

namespace oxystrat {
namespace {

struct Small {
  Case c = testing::single_impeller("rushton", 1.0 / 3.0, 3, 5);
  ZoneNetwork net = build_zone_geometry(c);
  Hydrodynamics h = compute_hydrodynamics(c, net);
};

TEST(Lifelines, OccupancyEqualsVolumeShareAndResidenceIsVolumeOverOutflow) {
  const Small s;
  LifelineOptions o;
  o.cells = 400;
  o.duration_s = 600.0;  // ~10^3 residence times per zone per cell
  const auto r = simulate_lifelines(s.net, s.h, {}, 0.0, o);
  const double v = s.net.total_volume();
  // Outflow of each zone: convective out plus exchange.
  std::vector<double> out(s.net.size(), 0.0);
  for (size_t f = 0; f < s.net.faces.size(); ++f) {
    const double q = s.h.face_flow[f], e = s.h.face_exchange[f];
    out[s.net.faces[f].zone_a] += (q > 0 ? q : 0) + e;
    out[s.net.faces[f].zone_b] += (q < 0 ? -q : 0) + e;
  }
  for (int k = 0; k < s.net.size(); ++k) {
    // Statistical tolerance: ~3e4 visits per zone give about 1 % relative error; 3 %
    // leaves room for the slowly mixing zones (correlated visits).
    EXPECT_NEAR(r.occupancy[k] / (s.net.volume[k] / v), 1.0, 0.03) << "zone " << k;
    EXPECT_NEAR(r.residence_mean_s[k] / (s.net.volume[k] / out[k]), 1.0, 0.03) << "zone " << k;
  }
}

TEST(Lifelines, SeededAndIndependentOfThreads) {
  const Small s;
  std::vector<double> field(s.net.size());
  for (int k = 0; k < s.net.size(); ++k) field[k] = s.net.z[k];  // "DO" rising with height
  LifelineOptions o;
  o.cells = 50;
  o.duration_s = 60.0;
  o.threads = 1;
  const auto a = simulate_lifelines(s.net, s.h, field, 0.5, o);
  o.threads = 2;
  const auto b = simulate_lifelines(s.net, s.h, field, 0.5, o);
  EXPECT_EQ(a.time_below_fraction, b.time_below_fraction);
  EXPECT_EQ(a.excursion_durations_s, b.excursion_durations_s);
  EXPECT_EQ(a.jumps, b.jumps);
  o.seed = 2;
  EXPECT_NE(simulate_lifelines(s.net, s.h, field, 0.5, o).jumps, a.jumps);  // another seed, another sample
  // Time below 0.5 m of height: about the volume share below it (cells sample the volume).
  double below = 0.0;
  for (int k = 0; k < s.net.size(); ++k) below += s.net.z[k] < 0.5 ? s.net.volume[k] : 0.0;
  EXPECT_NEAR(a.mean_time_below_fraction, below / s.net.total_volume(), 0.08);  // 50 cells x 60 s: sampling error
}

TEST(Lifelines, LogHistogramCountsEveryValue) {
  const auto h = log_histogram({0.1, 1.0, 10.0, 10.0}, 4);
  ASSERT_EQ(h.counts.size(), 4u);
  EXPECT_DOUBLE_EQ(h.counts[0] + h.counts[1] + h.counts[2] + h.counts[3], 4.0);
  EXPECT_NEAR(h.edges.front(), 0.1, 1e-12);
  EXPECT_NEAR(h.edges.back(), 10.0, 1e-9);
}

}  // namespace
}  // namespace oxystrat
