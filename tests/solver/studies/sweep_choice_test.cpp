// The chosen point of a sweep: least objective among feasible points, never dominated on (objective,
// DO min); the constraints each point breaks; the edge of the swept range; a cost objective that
// needs prices; and a real sweep whose cheapest point is not its least-agitator-power point.
#include <gtest/gtest.h>

#include <cmath>

#include "case_fixtures.hpp"
#include "input/errors.hpp"
#include "solver/studies/sweep.hpp"
#include "solver/studies/sweep_choice.hpp"

namespace oxystrat {
namespace {

PointResult point(double objective, double do_min, bool feasible = true) {
  PointResult r;
  r.ok = true;
  r.feasible = feasible;
  r.values = {{"power_gassed", "W", objective, "", "kW", 1e-3}, {"do_min", "mol/m3", do_min, "", "mmol/L", 1.0}};
  if (!feasible) r.checks = {{"do_min", false, "too low"}, {"flooding", false, "flooded"}, {"tip_speed", true, "ok"}};
  return r;
}

TEST(SweepChoice, LeastObjectiveAmongFeasiblePoints) {
  const std::vector<PointResult> r{point(5.0, 0.1), point(2.0, 0.05, false), point(3.0, 0.02), point(4.0, 0.3)};
  EXPECT_EQ(choose_objective_point(r, "power_gassed"), 2);
  EXPECT_EQ(choose_objective_point(r, "power_gassed:max"), 0);
  EXPECT_EQ(choose_objective_point({point(1.0, 0.1, false)}, "power_gassed"), -1);
}

TEST(SweepChoice, ANameOfAnEarlierReleaseStillNamesItsValue) {
  // Format 2.0 renamed volume_below_critical to /summary's volume_fraction_below_critical.
  std::vector<PointResult> r{point(5.0, 0.1), point(3.0, 0.1)};
  r[0].values.push_back({"volume_fraction_below_critical", "1", 0.02, "", "%", 100.0});
  r[1].values.push_back({"volume_fraction_below_critical", "1", 0.01, "", "%", 100.0});
  EXPECT_EQ(choose_objective_point(r, "volume_below_critical"), 1);
  EXPECT_EQ(choose_objective_point(r, "volume_below_critical:max"), 0);
  EXPECT_EQ(current_summary_name("offgas_o2"), "offgas_y_o2");
  EXPECT_EQ(current_summary_name("volume_below_critical_p90"), "volume_fraction_below_critical_p90");
  EXPECT_EQ(current_summary_name("do_min"), "do_min");
}

TEST(SweepChoice, TiesGoToTheHigherDoMinSoTheChoiceIsNotDominated) {
  // Points 1 and 2 tie on the objective (within round-off, 1e-12 relative); point 2 has more DO.
  // The first found would be dominated by the second; the rule picks the second.
  const std::vector<PointResult> r{point(3.0, 0.5), point(2.0, 0.01), point(2.0 * (1 + 1e-12), 0.04)};
  const int chosen = choose_objective_point(r, "power_gassed");
  ASSERT_EQ(chosen, 2);
  for (size_t j = 0; j < r.size(); ++j) {  // no feasible point at least as good on both, better on one
    const double pj = r[j].values[0].value, dj = r[j].values[1].value;
    const double pc = r[chosen].values[0].value, dc = r[chosen].values[1].value;
    const bool tie = std::abs(pj - pc) <= 1e-9 * pc;  // objective values equal up to round-off
    const bool no_worse = (pj < pc || tie) && dj >= dc;
    const bool better = (pj < pc && !tie) || dj > dc;
    const bool dominates = j != static_cast<size_t>(chosen) && no_worse && better;
    EXPECT_FALSE(dominates) << j;
  }
}

TEST(SweepChoice, BrokenConstraintsAreNamed) {
  EXPECT_EQ(broken_constraints(point(2.0, 0.05, false)), "do_min; flooding");
  EXPECT_EQ(broken_constraints(point(2.0, 0.05, true)), "");
}

TEST(SweepChoice, ChosenOnTheEdgeOfTheSweptRange) {
  const auto plan = full_factorial({{"operation.speed", 100, 200, 3, "rpm", ""}, {"operation.gas_flow", 0.5, 0.5, 1, "vvm", ""}});
  EXPECT_EQ(edge_axes(plan, 0), std::vector<std::string>{"operation.speed"});
  EXPECT_TRUE(edge_axes(plan, 1).empty());  // 150 rpm lies inside; the fixed axis never counts
  EXPECT_EQ(edge_axes(plan, 2), std::vector<std::string>{"operation.speed"});
}

TEST(SweepChoice, AnObjectiveNoPointHasIsAnError) {
  const std::vector<PointResult> r{point(3.0, 0.1)};
  try {
    choose_objective_point(r, "operating_cost");
    FAIL() << "expected a CaseError";
  } catch (const CaseError& e) {
    EXPECT_NE(std::string(e.what()).find("[prices]"), std::string::npos) << e.what();
  }
  const Case c = fixtures::gassed_vessel(2, 4);
  EXPECT_THROW(check_objective_applies(c, "operating_cost"), CaseError);
  EXPECT_THROW(check_objective_applies(c, "max_biomass_heat:max"), CaseError);
  EXPECT_NO_THROW(check_objective_applies(c, "total_power"));
}

TEST(SweepChoice, CheapestPointIsNotTheLeastAgitatorPowerPoint) {
  // The 300 L pilot with prices, over speed and gas flow. Gassed power falls as the gas flow rises,
  // so the least agitator power sits at the most gas; but every m3 of air must be compressed to the
  // sparger, so the cheapest point uses less gas. Electricity 0.15 EUR/kWh (invented).
  auto base = read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml");
  const std::vector<Override> sets{parse_override("grid.radial=4"), parse_override("grid.axial=12"),
                                   parse_override("prices.currency=EUR"),
                                   parse_override("prices.electricity=0.15 EUR/kWh")};
  base = read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml", sets);
  const auto plan = full_factorial({{"operation.speed", 300, 500, 3, "rpm", ""}, {"operation.gas_flow", 0.5, 2.0, 4, "vvm", ""}});
  std::vector<PointResult> results(plan.points.size());
  run_sweep(base, sets, plan, {false, false, 0, 1, 0}, std::vector<bool>(plan.points.size(), false),
            [&](size_t i, const PointResult& r) { results[i] = r; });
  const int cheapest = choose_objective_point(results, "operating_cost");
  const int least_agitation = choose_objective_point(results, "power_gassed");
  ASSERT_GE(cheapest, 0);
  ASSERT_GE(least_agitation, 0);
  EXPECT_NE(cheapest, least_agitation);
  EXPECT_LT(plan.points[cheapest][1], plan.points[least_agitation][1]);  // less gas
  EXPECT_LT(summary_value(results[cheapest].values, "operating_cost"),
            summary_value(results[least_agitation].values, "operating_cost"));
}

}  // namespace
}  // namespace oxystrat
