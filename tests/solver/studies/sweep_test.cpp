// Sweeps: plans, thread-count independence, equality with one-by-one runs, constraints, Pareto.
#include <gtest/gtest.h>

#include <cmath>
#include <cstring>

#include "case_fixtures.hpp"
#include "solver/studies/constraints.hpp"
#include "solver/studies/sweep.hpp"

namespace oxystrat {
namespace {

LoadedCase base_case() {
  return read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml", {parse_override("grid.radial=4"),
                                                                             parse_override("grid.axial=12")});
}

std::vector<PointResult> sweep(const LoadedCase& base, const SweepPlan& plan, int threads) {
  std::vector<PointResult> out(plan.points.size());
  run_sweep(base, {parse_override("grid.radial=4"), parse_override("grid.axial=12")}, plan, {false, true, 0, 1, threads},
            std::vector<bool>(plan.points.size(), false), [&](size_t i, const PointResult& r) { out[i] = r; });
  return out;
}

bool bit_identical(const PointResult& a, const PointResult& b) {
  if (a.ok != b.ok || a.values.size() != b.values.size()) return false;
  for (size_t q = 0; q < a.values.size(); ++q) {
    if (std::memcmp(&a.values[q].value, &b.values[q].value, sizeof(double)) != 0) return false;
  }
  return true;
}

TEST(SweepPlan, FullFactorialVariesTheFirstAxisSlowest) {
  const auto plan = full_factorial({{"a", 1.0, 3.0, 3, "", ""}, {"b", 10.0, 20.0, 2, "rpm", ""}});
  ASSERT_EQ(plan.points.size(), 6u);
  EXPECT_EQ(plan.points[0], (std::vector<double>{1.0, 10.0}));
  EXPECT_EQ(plan.points[1], (std::vector<double>{1.0, 20.0}));
  EXPECT_EQ(plan.points[5], (std::vector<double>{3.0, 20.0}));
  EXPECT_EQ(point_overrides(plan, 1)[1].value, "20 rpm");
}

TEST(SweepPlan, LatinHypercubeFillsEveryStratumOnce) {
  const int n = 17;
  const auto plan = latin_hypercube({{"a", 0.0, 1.0, 1, "", ""}, {"b", 5.0, 7.0, 1, "", ""}}, n, 42);
  for (size_t d = 0; d < 2; ++d) {
    std::vector<int> hits(n, 0);
    for (const auto& p : plan.points) {
      const double x = (p[d] - plan.axes[d].start) / (plan.axes[d].stop - plan.axes[d].start);
      ++hits[std::min(n - 1, static_cast<int>(x * n))];
    }
    for (int h : hits) EXPECT_EQ(h, 1);
  }
  // Seeded: the same seed gives the same design.
  EXPECT_EQ(latin_hypercube(plan.axes, n, 42).points, plan.points);
}

TEST(SweepPlan, PointsAreDealtToRanksInTurnWithinTheBudget) {
  const std::vector<bool> done{true, false, false, true, false, false, false};
  const auto a = share_points(done, -1, 0, 2), b = share_points(done, -1, 1, 2);
  EXPECT_EQ(a.skip, (std::vector<bool>{true, false, true, true, false, true, false}));
  EXPECT_EQ(b.skip, (std::vector<bool>{true, true, false, true, true, false, true}));
  EXPECT_EQ(a.here + b.here, 5u);
  EXPECT_EQ(a.now, 5u);
  EXPECT_EQ(a.later, 0u);
  // A budget of 3 new points: the first three not done, the rest left for later on every rank.
  const auto c = share_points(done, 3, 0, 2), d = share_points(done, 3, 1, 2);
  EXPECT_EQ(c.here + d.here, 3u);
  EXPECT_EQ(c.later, 2u);
  EXPECT_EQ(d.later, 2u);
}

TEST(SweepPlan, RefusedBeforeBuildingWhenTooLarge) {
  EXPECT_THROW(check_sweep_size({{"a", 1, 2, 10000, "", ""}, {"b", 1, 2, 10000, "", ""}}, 0), CaseError);
  EXPECT_NO_THROW(check_sweep_size({{"a", 1, 2, 300, "", ""}, {"b", 1, 2, 300, "", ""}}, 0));
  EXPECT_NO_THROW(check_sweep_size({{"a", 1, 2, 10000, "", ""}, {"b", 1, 2, 10000, "", ""}}, 50));
}

TEST(SweepPlan, AxesAreReadAtBothEndsBeforeAnyPointRuns) {
  const auto base = base_case();
  const auto check = [&](const std::string& vary) { check_sweep_axes(base, {}, {parse_vary(vary, base)}); };
  EXPECT_NO_THROW(check("operation.speed=300:500:3"));
  EXPECT_THROW(check("operation.sped=300:500:3:rpm"), CaseError);    // misspelt key
  EXPECT_THROW(check("operation.speed=300:500:3:kg"), CaseError);    // wrong unit
  EXPECT_THROW(check("operation.speed=300:5e6:3"), CaseError);       // out of range at the end
  EXPECT_THROW(parse_vary("operation.speed=nan:500:3", base), CaseError);
  EXPECT_THROW(parse_vary("operation.speed=300:inf:3", base), CaseError);
  EXPECT_THROW(parse_vary("operation.speed=300:500:3x", base), CaseError);
  // A bad value of the second axis is named as that axis's, not as the first one's (it was read
  // while the first axis stood at one of its ends).
  try {
    check_sweep_axes(base, {}, {parse_vary("operation.speed=300:500:3", base), parse_vary("vessel.head_pressure=1:2:2:bar", base)});
    ADD_FAILURE() << "a pressure without (a) or (g) was accepted";
  } catch (const CaseError& e) {
    EXPECT_EQ(std::string(e.what()).rfind("--vary 'vessel.head_pressure=1:2:2:bar' at vessel.head_pressure=1 bar: pressure unit", 0), 0u)
        << e.what();
  }
}

TEST(SweepPlan, ObjectiveIsCheckedAgainstTheValuesThePointsWillHave) {
  const auto base = base_case();
  const auto check_objective = [&](const std::string& objective, const SweepOptions& o) {
    oxystrat::check_objective(base.data, objective, o);
  };
  SweepOptions o;
  EXPECT_NO_THROW(check_objective("power_gassed", o));
  EXPECT_NO_THROW(check_objective("do_min:max", o));
  EXPECT_THROW(check_objective("foo", o), CaseError);
  EXPECT_THROW(check_objective("theta95", o), CaseError);
  o.with_mixing = true;
  EXPECT_NO_THROW(check_objective("theta95", o));
  EXPECT_THROW(check_objective("do_min_p10", o), CaseError);
  o.uncertainty_samples = 4;
  EXPECT_NO_THROW(check_objective("do_min_p10:max", o));
  EXPECT_NO_THROW(check_objective("max_biomass:max", o));
  o.supportable_biomass = false;  // --no-biomass: the points carry no supportable biomass
  EXPECT_THROW(check_objective("max_biomass:max", o), CaseError);
  EXPECT_NO_THROW(check_objective("max_biomass_p50:max", o));  // the uncertainty study searches its own
}

TEST(SweepPlan, VaryTakesTheCaseFilesUnitWhenNoneIsGiven) {
  const auto base = base_case();
  EXPECT_EQ(parse_vary("operation.speed=300:500:3", base).unit, "rpm");
  EXPECT_EQ(parse_vary("operation.gas_flow=0.5:1:2", base).unit, "vvm");
  EXPECT_EQ(parse_vary("operation.speed=5:8:2:rps", base).unit, "rps");
  EXPECT_THROW(parse_vary("operation.speed=300:500", base), CaseError);
  const auto check = [&](const std::string& vary) { check_sweep_axes(base, {}, {parse_vary(vary, base)}); };
  EXPECT_THROW(check("operation.nothing=1:2:2"), CaseError);
  // A key the case does not write: a dimensionless one takes plain numbers (a CO2 fraction of
  // 0.001 to 0.05, not 0.001 % to 0.05 %); one with units says which to give.
  const auto fraction = parse_vary("operation.co2_fraction=0.001:0.05:3", base);
  EXPECT_EQ(fraction.unit, "");
  EXPECT_NO_THROW(check_sweep_axes(base, {}, {fraction}));
  try {
    check("impeller.0.blade_height=0.02:0.04:2");
    ADD_FAILURE() << "a length without its unit was accepted";
  } catch (const CaseError& e) {
    EXPECT_NE(std::string(e.what()).find("give the unit: impeller.0.blade_height=START:STOP:COUNT:UNIT"), std::string::npos)
        << e.what();
  }
}

TEST(Sweep, NamesKnownBeforehandAreTheNamesThePointsCarry) {
  const auto base = base_case();
  for (const bool mixing : {false, true}) {
    const auto r = evaluate_point(base, mixing, false);
    ASSERT_TRUE(r.ok) << r.error;
    std::vector<std::string> names;
    for (const auto& v : r.values) names.push_back(v.name);
    SweepOptions o;
    o.with_mixing = mixing;
    EXPECT_EQ(names, sweep_value_names(base.data, o));
  }
}

TEST(Sweep, AFailingRecordStopsTheSweepWithItsError) {
  const auto base = base_case();
  const auto plan = full_factorial({parse_vary("operation.speed=300:500:6", base)});
  size_t recorded = 0;
  EXPECT_THROW(run_sweep(base, {parse_override("grid.radial=4"), parse_override("grid.axial=12")}, plan,
                         {false, false, 0, 1, 2}, std::vector<bool>(plan.points.size(), false),
                         [&](size_t, const PointResult&) {
                           if (++recorded == 2) throw IoError("cannot write the journal");
                         }),
               IoError);
  EXPECT_EQ(recorded, 2u);  // points under way finish, but none is recorded after the failure
}

TEST(Sweep, EqualsTheSameCasesRunOneByOne) {
  // Each sweep thread keeps one Newton workspace across its points (orderings, symbolic factors,
  // Jacobian slots); a point must still come out as from a fresh run, to the bit.
  const auto base = base_case();
  const auto plan = full_factorial({parse_vary("operation.speed=300:500:2", base), parse_vary("operation.gas_flow=0.5:1.5:2", base)});
  const auto results = sweep(base, plan, 2);
  for (size_t i = 0; i < plan.points.size(); ++i) {
    auto overrides = std::vector<Override>{parse_override("grid.radial=4"), parse_override("grid.axial=12")};
    for (const auto& o : point_overrides(plan, i)) overrides.push_back(o);
    const auto single = evaluate_point(read_case_text(base.source_text, base.file_name, overrides), false, true);
    ASSERT_TRUE(results[i].ok) << results[i].error;
    EXPECT_TRUE(bit_identical(results[i], single)) << "point " << i;
  }
}

TEST(Sweep, OneAndTwoThreadsGiveBitIdenticalResults) {
  const auto base = base_case();
  const auto plan = latin_hypercube({parse_vary("operation.speed=300:500:1", base), parse_vary("vessel.head_pressure=0:1:1:bar(g)", base)}, 6, 7);
  const auto one = sweep(base, plan, 1);
  const auto two = sweep(base, plan, 2);
  for (size_t i = 0; i < one.size(); ++i) EXPECT_TRUE(bit_identical(one[i], two[i])) << "point " << i;
}

TEST(Constraints, EachLimitDecidesOnItsOwn) {
  Case c = fixtures::gassed_vessel(4, 10);
  c.culture.biomass_kg_m3 = 2.0;  // plenty of oxygen
  const auto run = run_case(c, {false});
  const double tip = run.hydro.impellers[0].tip_speed_m_s;
  EXPECT_TRUE(feasible(check_constraints(c, run)));
  c.constraints.max_tip_speed_m_s = 0.99 * tip;
  auto checks = check_constraints(c, run);
  EXPECT_FALSE(feasible(checks));
  c.constraints.max_tip_speed_m_s = 1.01 * tip;
  EXPECT_TRUE(feasible(check_constraints(c, run)));
  c.constraints.max_power_per_volume_w_m3 = 1.0;  // 1 W/m3: far below any agitated vessel
  EXPECT_FALSE(feasible(check_constraints(c, run)));
  c.constraints.max_power_per_volume_w_m3.reset();
  c.constraints.min_do_mol_m3 = 10.0;  // above saturation: every zone is "below"
  EXPECT_FALSE(feasible(check_constraints(c, run)));
  c.constraints.max_volume_below_critical = 1.0;  // ... unless the whole volume may be
  EXPECT_TRUE(feasible(check_constraints(c, run)));
}

TEST(Constraints, FloodingIsInfeasibleUnlessAllowed) {
  Case c = fixtures::gassed_vessel(4, 10);
  c.operation.speed_rps = 0.5;
  c.culture.biomass_kg_m3 = 0.5;
  const auto run = run_case(c, {false});
  ASSERT_EQ(run.hydro.impellers[0].regime, GasRegime::flooded);
  EXPECT_FALSE(feasible(check_constraints(c, run)));
  c.constraints.allow_flooding = true;
  c.constraints.max_volume_below_critical = 1.0;
  EXPECT_TRUE(feasible(check_constraints(c, run)));
}

TEST(Pareto, KeepsOnlyUndominatedPoints) {
  const auto point = [](double power, double do_min) {
    PointResult r;
    r.ok = true;
    r.values = {{"power_gassed", "W", power, "", "kW", 1e-3}, {"do_min", "mol/m3", do_min, "", "mmol/L", 1.0}};
    return r;
  };
  const std::vector<PointResult> pts{point(10, 0.1), point(20, 0.2), point(15, 0.05), point(30, 0.2), point(5, 0.01)};
  const auto front = pareto_front(pts);
  EXPECT_EQ(front, (std::vector<bool>{true, true, false, false, true}));
}

}  // namespace
}  // namespace oxystrat
