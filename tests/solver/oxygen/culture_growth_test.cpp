// Culture kinetics and the quasi-steady substrate field a constant feed holds.
#include <gtest/gtest.h>

#include <cmath>
#include <numeric>

#include "case_fixtures.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/oxygen/culture_growth.hpp"

namespace oxystrat {
namespace {

Culture yeast_like() {
  Culture c;
  c.q_o2_max_mol_kg_s = 5.0 / 3600.0;     // 5 mmol/g/h
  c.k_o2_mol_m3 = 0.002;
  c.growth_rate_max_s = 0.2 / 3600.0;
  c.k_substrate_kg_m3 = 0.1;
  c.yield_substrate = 0.5;
  c.maintenance_substrate_s = 0.01 / 3600.0;
  return c;
}

TEST(CultureGrowth, DerivedOxygenYieldGivesTheCasesUptakeAtSaturatingSubstrate) {
  const GrowthKinetics g(yeast_like());
  // Y_X/O = mu_max / q_O2,max = 0.2 / 5 kg/mol = 40 g/mol (1.25 g/g): our design choice, exact.
  EXPECT_NEAR(g.yield_o2_kg_mol, 0.04, 1e-15);
  EXPECT_NEAR(g.o2_uptake_capacity(1e300) * 3600.0, 5.0, 1e-12);
  // Monod (1949): half the maximum growth at S = K_S (and saturating O2).
  EXPECT_NEAR(g.growth_rate(0.1, 1e300) / g.mu_max_s, 0.5, 1e-12);
  // No substrate: no growth and no substrate maintenance; O2 maintenance (here 0) would stay.
  EXPECT_EQ(g.growth_rate(0.0, 0.2), 0.0);
  EXPECT_EQ(g.substrate_uptake(0.0, 0.2), 0.0);
}

TEST(CultureGrowth, SteadySubstrateOfOneZoneIsTheMonodInverse) {
  // One zone: feed = V X q_S(S) with q_S = (mu_max f_O / Y + m_S) S/(K_S + S), so
  // S = K_S r / (1 - r) with r = feed / (V X (mu_max f_O / Y + m_S)); exact algebra.
  const auto loaded = read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml",
                                     {parse_override("grid.radial=1"), parse_override("grid.axial=1")});
  const auto run = run_case(loaded.data, {false, false});
  const GrowthKinetics g(yeast_like());
  const double v = run.net.volume[0], x = 20.0, c = 0.1;
  const auto transport = transport_matrix(run.net, run.hydro.face_flow, run.hydro.face_exchange);
  const double top = x * v * (g.mu_max_s * c / (g.k_o2_mol_m3 + c) / g.yield_substrate + g.maintenance_substrate_s);
  const double feed = 0.6 * top;
  const auto s = steady_substrate_field(run.net, transport, g, {c}, {x}, {feed});
  EXPECT_NEAR(s[0], 0.1 * 0.6 / 0.4, 1e-9);  // Newton tolerance 1e-12 of the feed
  EXPECT_THROW(steady_substrate_field(run.net, transport, g, {c}, {x}, {1.01 * top}), std::runtime_error);
}

TEST(CultureGrowth, SteadySubstrateFieldTakesUpWhatIsFedAndPeaksAtTheFeed) {
  const auto loaded = read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml",
                                     {parse_override("grid.radial=5"), parse_override("grid.axial=16")});
  const auto run = run_case(loaded.data, {false, false});
  const GrowthKinetics g(yeast_like());
  const int n = run.net.size();
  const auto transport = transport_matrix(run.net, run.hydro.face_flow, run.hydro.face_exchange);
  std::vector<double> feed(n, 0.0), x(n, 30.0);
  const int at = run.net.zone_containing(1.2, 7.9);
  feed[at] = 0.07;  // 250 kg/h, about half the culture's capacity
  const auto s = steady_substrate_field(run.net, transport, g, run.field->do_mol_m3, x, feed);
  double taken = 0.0;
  for (int k = 0; k < n; ++k) taken += run.net.volume[k] * x[k] * g.substrate_uptake(s[k], run.field->do_mol_m3[k]);
  EXPECT_NEAR(taken, 0.07, 1e-9 * 0.07);  // L has zero column sums: exactly what is fed (Newton 1e-12 per zone)
  EXPECT_EQ(std::max_element(s.begin(), s.end()) - s.begin(), at);
  for (double v : s) EXPECT_GT(v, 0.0);
}

}  // namespace
}  // namespace oxystrat
