// Nested iteration: the coarse-to-fine interpolation reproduces linear fields, and a cold solve
// seeded from the halved grid gives the field of the direct cold solve, on any thread count.
#include <fmt/format.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <omp.h>

#include "case_fixtures.hpp"
#include "solver/oxygen/nested_start.hpp"
#include "solver/oxygen/oxygen_field.hpp"

namespace oxystrat {
namespace {

using fixtures::Chain;

// Newton options with the nested start from `zones` zones on.
NewtonOptions nesting_from(int zones) {
  NewtonOptions n;
  n.linear.nested_start_from_zones = zones;
  return n;
}

TEST(NestedStart, BilinearStencilsReproduceALinearField) {
  // Ellipsoidal bottom head: cut cells there take the containing coarse zone instead.
  const ZoneNetwork coarse = build_zone_geometry(fixtures::gassed_vessel(12, 40));
  const ZoneNetwork fine = build_zone_geometry(fixtures::gassed_vessel(24, 80));
  const auto linear = [](double r, double z) { return 2.0 + 3.0 * r - 0.5 * z; };
  std::vector<double> values(coarse.size());
  for (int k = 0; k < coarse.size(); ++k) values[k] = linear(coarse.r[k], coarse.z[k]);
  const auto stencils = interpolation_stencils(coarse, fine);
  const auto v = interpolate(stencils, values);
  int bilinear = 0;
  for (int k = 0; k < fine.size(); ++k) {
    const auto& s = stencils[k];
    EXPECT_NEAR(s.weight[0] + s.weight[1] + s.weight[2] + s.weight[3], 1.0, 1e-15);
    if (s.bilinear) {
      ++bilinear;
      // Exact up to round-off: values are O(1), a few operations of 1e-16 each.
      EXPECT_NEAR(v[k], linear(fine.r[k], fine.z[k]), 1e-13) << k;
    } else {
      // Fallback: the value of the one coarse zone the stencil holds, which contains the centroid
      // (or lies just above it where the coarse bottom head cuts the cell differently).
      EXPECT_DOUBLE_EQ(s.weight[0], 1.0);
      EXPECT_EQ(v[k], values[s.zone[0]]);
      const int kc = s.zone[0];
      EXPECT_GE(fine.r[k], coarse.r0[kc]);
      EXPECT_LE(fine.r[k], coarse.r1[kc]);
      EXPECT_LE(fine.z[k], coarse.z1[kc]);
    }
  }
  // Only the outer half cell of the grid and the cut cells of the head fall back.
  EXPECT_GT(bilinear, fine.size() * 8 / 10);
}

TEST(NestedStart, SeededSolveGivesTheFieldOfTheDirectSolve) {
  // The tall demo at about 4500 zones with the threshold lowered to 2000: one coarse level
  // (15 x 75, about 1100 zones, solved to the loose seed tolerance), then the fine solve from
  // its interpolation to the full Newton tolerance.
  const Case c = fixtures::tall_demo(30, 150);
  const Chain ch(c);
  const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
  ASSERT_GT(ch.net.size(), 4000);
  const OxygenField direct = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, nesting_from(1 << 30));
  const OxygenField nested = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, nesting_from(2000));
  // A warm start never nests.
  const auto warm = solve_oxygen_field(ctx, -1.0, &nested, nullptr, nesting_from(2000));
  EXPECT_EQ(warm.coarse_levels, 0);
  EXPECT_EQ(direct.coarse_levels, 0);
  EXPECT_EQ(nested.coarse_levels, 1);
  EXPECT_GT(nested.coarse_newton_iterations, 0);
  EXPECT_LT(nested.newton_iterations, direct.newton_iterations);  // the point of the seed
  // Both fields stop at a scaled residual below the Newton tolerance (1e-12); two such fields
  // differ by the tolerance times the conditioning of the balances, far above round-off
  // (measured here 2.5e-10 of the largest DO, 3e-12 in y_O2): 1e-8 of the largest value, as
  // between the two preconditioners in scalar_multigrid_test.
  double scale_o = 0.0, scale_c = 0.0;
  for (int k = 0; k < ch.net.size(); ++k) {
    scale_o = std::max(scale_o, std::abs(direct.do_mol_m3[k]));
    scale_c = std::max(scale_c, std::abs(direct.co2_mol_m3[k]));
  }
  double worst_o = 0.0, worst_y = 0.0;
  for (int k = 0; k < ch.net.size(); ++k) {
    EXPECT_NEAR(nested.do_mol_m3[k], direct.do_mol_m3[k], 1e-8 * scale_o) << k;
    EXPECT_NEAR(nested.co2_mol_m3[k], direct.co2_mol_m3[k], 1e-8 * scale_c) << k;
    EXPECT_NEAR(nested.y_o2[k], direct.y_o2[k], 1e-8) << k;  // mole fractions are O(0.2)
    worst_o = std::max(worst_o, std::abs(nested.do_mol_m3[k] - direct.do_mol_m3[k]) / scale_o);
    worst_y = std::max(worst_y, std::abs(nested.y_o2[k] - direct.y_o2[k]));
  }
  RecordProperty("worst_do_relative", fmt::format("{:.3g}", worst_o));
  RecordProperty("worst_y_o2", fmt::format("{:.3g}", worst_y));
  EXPECT_NEAR(nested.o2_balance_error, direct.o2_balance_error, 1e-9);
}

TEST(NestedStart, LevelsRoutedBesideTheSolvesBelowGiveTheDirectFieldEveryTime) {
  // Two coarse levels, every gas routing by multigrid: each level's routing runs on a second
  // thread while the levels below it are solved, the first coarse level's from the fine routing
  // restricted. The field is the direct solve's (tolerance as in SeededSolveGivesTheFieldOfTheDirectSolve)
  // and the same bits on a second run, whichever thread finishes first.
  const Case c = fixtures::tall_demo(30, 150);
  SolverOptions multigrid;
  multigrid.multigrid_from_zones = 1;
  multigrid.multigrid_coarsest_size = 20;
  const Chain ch(c);
  const GasRouting routing = route_gas(c, ch.net, ch.hydro, multigrid);
  const OxygenContext ctx{c, ch.net, ch.hydro, routing};
  NewtonOptions direct_options = nesting_from(1 << 30), nested_options = nesting_from(1000);
  direct_options.linear = nested_options.linear = multigrid;
  direct_options.linear.nested_start_from_zones = 1 << 30;
  nested_options.linear.nested_start_from_zones = 1000;
  const OxygenField direct = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, direct_options);
  const OxygenField first = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, nested_options);
  const OxygenField second = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, nested_options);
  EXPECT_EQ(first.coarse_levels, 2);
  double scale_o = 0.0;
  for (double v : direct.do_mol_m3) scale_o = std::max(scale_o, std::abs(v));
  for (int k = 0; k < ch.net.size(); ++k) {
    EXPECT_NEAR(first.do_mol_m3[k], direct.do_mol_m3[k], 1e-8 * scale_o) << k;
    EXPECT_NEAR(first.y_o2[k], direct.y_o2[k], 1e-8) << k;
  }
  EXPECT_EQ(first.coarse_linear_iterations, second.coarse_linear_iterations);
  EXPECT_EQ(first.linear_iterations, second.linear_iterations);
  EXPECT_EQ(first.do_mol_m3, second.do_mol_m3);
  EXPECT_EQ(first.y_o2, second.y_o2);
}

TEST(NestedStart, OneAndTwoThreadsGiveBitIdenticalFields) {
  const Case c = fixtures::tall_demo(20, 100);
  const Chain ch(c);
  const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
  const int saved = omp_get_max_threads();
  omp_set_num_threads(1);
  const auto one = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, nesting_from(1000));
  omp_set_num_threads(2);
  const auto two = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, nesting_from(1000));
  omp_set_num_threads(saved);
  EXPECT_EQ(one.coarse_levels, 1);
  EXPECT_EQ(one.linear_iterations, two.linear_iterations);
  EXPECT_EQ(one.coarse_linear_iterations, two.coarse_linear_iterations);
  EXPECT_EQ(one.do_mol_m3, two.do_mol_m3);
  EXPECT_EQ(one.co2_mol_m3, two.co2_mol_m3);
}

}  // namespace
}  // namespace oxystrat
