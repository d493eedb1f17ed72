// Transient: single-zone re-aeration against the analytic curve (with its order of accuracy),
// relaxation to the steady field, the O2 balance over time, and a controller holding its set-point.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "case_fixtures.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/oxygen/transient.hpp"
#include "solver/oxygen/transient_cautions.hpp"
#include "solver/oxygen/transient_events.hpp"

namespace oxystrat {
namespace {

LoadedCase gassed(const std::vector<Override>& extra) {
  std::vector<Override> o{parse_override("grid.radial=1"), parse_override("grid.axial=1")};
  o.insert(o.end(), extra.begin(), extra.end());
  return read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml", o);
}

TEST(Transient, SingleZoneReaerationFollowsTheExponentialToFirstOrder) {
  // No culture, DO from 0: C(t) = C* - C* exp(-kLa t) (re-aeration; common practice). The gas
  // must hardly deplete for C* to stay put, hence much gas and little agitation. Implicit Euler is
  // first order: halving the step halves the error (ratio 2 +- 0.3 with the depletion left).
  const auto loaded = gassed({parse_override("culture.biomass=0 g/L"), parse_override("operation.gas_flow=5 vvm"),
                              parse_override("operation.speed=100 rpm")});
  const auto steady = run_case(loaded.data, {false, false});
  const double cstar = steady.field->cstar_mol_m3[0], kla = steady.field->kla_1_s[0];
  const auto error = [&](double step) {
    TransientOptions o;
    o.duration_s = 3.0 / kla;
    o.step_s = step;
    o.adaptive = false;
    o.initial_do_mol_m3 = 0.0;
    const auto r = run_transient(loaded, {}, o);
    double worst = 0.0;
    for (const auto& s : r.trace) worst = std::max(worst, std::abs(s.do_mean - cstar * (1.0 - std::exp(-kla * s.time_s))));
    return worst / cstar;
  };
  const double e1 = error(0.1 / kla), e2 = error(0.05 / kla);
  EXPECT_LT(e1, 0.06);
  EXPECT_NEAR(e1 / e2, 2.0, 0.3);
}

TEST(Transient, RelaxesToTheSteadyFieldAndConservesOxygen) {
  const auto loaded = read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml",
                                     {parse_override("grid.radial=4"), parse_override("grid.axial=10")});
  const auto steady = run_case(loaded.data, {false, false});
  TransientOptions o;
  o.duration_s = 600.0;
  o.step_s = 5.0;
  o.initial_do_mol_m3 = 0.0;
  const auto r = run_transient(loaded, {}, o);
  for (int z = 0; z < steady.net.size(); ++z) {
    EXPECT_NEAR(r.frames.back().do_mol_m3[z], steady.field->do_mol_m3[z], 1e-6) << "zone " << z;  // ~100 mixing times
  }
  // Fed = off-gas + taken up + stored, exactly for implicit Euler (Newton tolerance 1e-12).
  EXPECT_NEAR((r.o2_fed - r.o2_out - r.o2_taken_up - r.o2_stored_change) / r.o2_fed, 0.0, 1e-9);
}

// A controlled 300 L pilot. The cascade's lower speed stays above flooding (about 225 rpm here at
// 1 vvm, Nienow et al. 1985), as plants set it: a flooded impeller pumps little and the loop
// would hunt across the transition. Gain 3: the loaded impeller's kLa rises steeply with speed
// here, and gain 5 hunts.
const std::string kControlledPilot = R"toml(
[vessel]
diameter = "0.6 m"
working_volume = "300 L"
temperature = "30 degC"
[[impeller]]
type = "rushton"
diameter = "0.2 m"
elevation = "0.3 m"
[sparger]
type = "ring"
elevation = "0.18 m"
diameter = "0.16 m"
[operation]
speed = "300 rpm"
gas_flow = "1 vvm"
[culture]
biomass = "5 g/L"
q_o2_max = "4 mmol/g/h"
k_o2 = "0.002 mmol/L"
critical_do = "0.02 mmol/L"
[grid]
radial = 3
axial = 6
[control]
setpoint = "30 %"
gain = 3
speed_min = "250 rpm"
speed_max = "700 rpm"
interval = "5 s"
)toml";

TEST(Transient, ControllerHoldsTheProbeAtItsSetPointAfterAnUptakeStep) {
  const auto loaded = read_case_text(kControlledPilot + R"toml(
[[event]]
time = "10 min"
set = "culture.biomass=12 g/L"
)toml",
                                     "controller");
  TransientOptions o;
  o.duration_s = 1800.0;
  o.step_s = 2.5;
  const auto r = run_transient(loaded, {}, o);
  const double setpoint = loaded.data.control.setpoint_mol_m3;
  EXPECT_NEAR(r.trace.back().probe_do / setpoint, 1.0, 0.02);  // PI: no offset once settled
  // With derivative action (on the measurement) the loop still settles at its set-point, and the
  // term acts: the speed history differs from the PI one. (This fast 300 L loop, sampled every 5 s,
  // tolerates little derivative time: 3 s already leaves it hunting.)
  const std::vector<Override> with_d{parse_override("control.derivative_time=1 s")};
  const auto pid = run_transient(read_case_text(loaded.source_text, "controller", with_d), with_d, o);
  EXPECT_NEAR(pid.trace.back().probe_do / setpoint, 1.0, 0.02);
  EXPECT_NE(pid.trace.back().speed_rps, r.trace.back().speed_rps);
  // More uptake after the step: the controller has raised the speed.
  double speed_before = 0.0;
  for (const auto& s : r.trace) {
    if (s.time_s <= 600.0) speed_before = s.speed_rps;
  }
  EXPECT_GT(r.trace.back().speed_rps, speed_before);
}

TEST(Transient, AdaptiveStepsMeetTheirToleranceWithFewerSteps) {
  // Re-aeration from DO 0 against a reference run with 200 fixed steps per 1/kLa (its own error,
  // first order, ~1e-3 x the coarse one's): the error of an adaptive run shrinks with its
  // tolerance, and its steps grow as the curve flattens.
  const auto loaded = gassed({parse_override("culture.biomass=0 g/L"), parse_override("operation.gas_flow=5 vvm"),
                              parse_override("operation.speed=100 rpm")});
  const auto steady = run_case(loaded.data, {false, false});
  const double kla = steady.field->kla_1_s[0], cstar = steady.field->cstar_mol_m3[0];
  const auto run = [&](double tol, bool adaptive, double step) {
    TransientOptions o;
    o.duration_s = 5.0 / kla;
    o.step_s = step;
    o.adaptive = adaptive;
    o.tolerance = tol;
    o.initial_do_mol_m3 = 0.0;
    return run_transient(loaded, {}, o);
  };
  const auto ref = run(0.0, false, 0.005 / kla);
  const auto worst = [&](const TransientResult& r) {
    double w = 0.0;
    for (const auto& s : r.trace) {  // reference interpolated linearly (error ~h^2 x''/8, negligible)
      size_t i = 1;
      while (i + 1 < ref.trace.size() && ref.trace[i].time_s < s.time_s) ++i;
      const auto &a = ref.trace[i - 1], &b = ref.trace[i];
      const double f = std::clamp((s.time_s - a.time_s) / (b.time_s - a.time_s), 0.0, 1.0);
      w = std::max(w, std::abs(s.do_mean - (a.do_mean + f * (b.do_mean - a.do_mean))));
    }
    return w / cstar;
  };
  const auto coarse = run(1e-2, true, 1.0 / kla), fine = run(1e-4, true, 1.0 / kla);
  EXPECT_LT(worst(fine), 0.1 * worst(coarse));  // first order: error ~ tolerance (x100 here)
  // The global error of a first-order method is the local ones accumulated over the run: tens of
  // tolerances (1e-4 of air saturation per step here).
  EXPECT_LT(worst(fine), 5e-3);
  EXPECT_GT(fine.trace.size(), coarse.trace.size());
  double largest = 0.0;
  for (const auto& s : fine.trace) largest = std::max(largest, s.step_s);
  EXPECT_GT(largest, 5.0 * fine.trace.front().step_s);  // x'' falls as exp(-kLa t): steps grow
}

// A small, well-aerated culture in one zone with plenty of substrate: batch growth.
LoadedCase batch_culture(const std::vector<Override>& extra) {
  std::vector<Override> o{parse_override("culture.biomass=0.2 g/L"), parse_override("culture.growth_rate_max=0.5 1/h"),
                          parse_override("culture.k_substrate=0.001 g/L"), parse_override("culture.k_o2=1e-6 mmol/L"), parse_override("culture.yield_substrate=0.5 g/g"),
                          parse_override("culture.substrate=20 g/L")};
  o.insert(o.end(), extra.begin(), extra.end());
  return gassed(o);
}

TEST(Transient, BatchGrowthIsExponentialWithTheSubstrateFollowingTheYield) {
  // Unlimited exponential phase X = X0 exp(mu_max t), and S = S0 - (X - X0) / Y_X/S without
  // maintenance (Monod 1949). K_S and K_O2 are tiny, so f_S f_O = 1 - O(1e-4).
  const auto loaded = batch_culture({});
  TransientOptions o;
  o.duration_s = 4.0 * 3600.0;
  o.step_s = 120.0;
  o.tolerance = 1e-5;
  const auto r = run_transient(loaded, {}, o);
  ASSERT_TRUE(r.grows);
  const double mu = 0.5 / 3600.0, x0 = 0.2, t = r.trace.back().time_s;
  const double x = r.trace.back().biomass_mean;
  EXPECT_NEAR(x / (x0 * std::exp(mu * t)), 1.0, 3e-3);  // time error of the tolerance-held steps
  // Substrate and biomass are solved together: the yield holds to the Newton tolerance.
  EXPECT_NEAR(r.trace.back().substrate_mean, 20.0 - (x - x0) / 0.5, 1e-9 * 20.0);
  // Balances over the run: Newton stops each step at 1e-12 of (content / step), summed over the
  // steps and zones that is ~1e-9 of what grew.
  EXPECT_NEAR(r.biomass_grown, r.biomass_stored_change, 1e-7 * r.biomass_grown);
  EXPECT_NEAR(r.substrate_consumed, -r.substrate_stored_change, 1e-7 * r.substrate_consumed);
  // The O2 uptake follows the biomass of the step's start (operator splitting): OUR = q_O2,max X
  // with the derived Y_X/O (f_S f_O = 1 - O(1e-4)).
  const double q = loaded.data.culture.q_o2_max_mol_kg_s;
  const double x_start = r.trace[r.trace.size() - 2].biomass_mean;
  EXPECT_NEAR(r.trace.back().our_mol_s / (q * x_start * r.working_volume_m3), 1.0, 1e-3);
}

TEST(Transient, ASetPointEventRetunesTheController) {
  // The controlled pilot above with its set-point raised from 30 to 60 % at 10 min (no uptake
  // step): the probe follows to the new set-point. The controller used to keep the case's first
  // settings and hold 30 % whatever the event said.
  const std::string text = kControlledPilot + R"toml(
[[event]]
time = "10 min"
set = "control.setpoint=60 %"
)toml";
  const auto loaded = read_case_text(text, "set-point step");
  TransientOptions o;
  o.duration_s = 1800.0;
  o.step_s = 2.5;
  const auto r = run_transient(loaded, {}, o);
  const double air = loaded.data.do_percent.reference_mol_m3;
  double before = 0.0;
  for (const auto& smp : r.trace) {
    if (smp.time_s <= 600.0) before = smp.probe_do;
  }
  EXPECT_NEAR(before / (0.3 * air), 1.0, 0.05);  // near 30 % before the step (2.2 % off: still settling)
  EXPECT_NEAR(r.trace.back().probe_do / (0.6 * air), 1.0, 0.02);  // and at 60 % after it
}

TEST(Transient, TheCascadeAtItsTopIsJudgedByTheControllersOwnLimits) {
  // The controlled pilot at 40 g/L: 700 rpm cannot hold 30 %, so the speed-only cascade ends at
  // its top and a caution says so. Given O2 enrichment up to 60 % by an event at 10 min, the same
  // loop holds its set-point on the O2 stage: no caution (it used to be judged by the case's first
  // limits, and said "at the top" there too).
  TransientOptions o;
  o.duration_s = 1800.0;
  o.step_s = 2.5;
  const auto at_top = [&o](const std::string& extra) {
    const auto loaded = read_case_text(kControlledPilot + extra, "cascade");
    const auto r = run_transient(loaded, {}, o);
    const auto w = transient_cautions(loaded.data, r);
    return std::any_of(w.begin(), w.end(), [](const std::string& s) { return s.find("top of its cascade") != std::string::npos; });
  };
  const std::string heavy = "\n[[event]]\ntime = \"1 s\"\nset = \"culture.biomass=40 g/L\"\n";
  EXPECT_TRUE(at_top(heavy));
  EXPECT_FALSE(at_top(heavy + "[[event]]\ntime = \"10 min\"\nset = \"control.oxygen_max=0.6\"\n"));
}

TEST(Transient, EventsTheRunCannotTakeAreRefusedBeforeItStarts) {
  // The fed-batch demo (controlled, growing, fed) on a coarse grid. Each refused event would have
  // mixed two networks' states, moved a point the run had fixed, or been overridden in silence.
  const auto refused = [](const std::string& set, const std::string& gas = "operation.gas_flow=0.5 vvm") {
    const std::vector<Override> o{parse_override("grid.radial=4"), parse_override("grid.axial=12"), parse_override(gas),
                                  parse_override("event.0.set=" + set)};
    const auto loaded = read_case_file(fixtures::source_dir() + "/cases/fedbatch-60m3.toml", o);
    try {
      check_transient_events(loaded, o);
    } catch (const CaseError& e) {
      return std::string(e.what());
    }
    return std::string();
  };
  EXPECT_NE(refused("grid.axial=16").find("changes the zone network"), std::string::npos);
  EXPECT_NE(refused("impeller.0.type=hydrofoil-down").find("changes the zone network"), std::string::npos);
  EXPECT_NE(refused("control.probe_height=3 m").find("moves the DO probe or the feed point"), std::string::npos);
  EXPECT_NE(refused("culture.biomass=80 g/L").find("the run's own state"), std::string::npos);
  EXPECT_NE(refused("operation.speed=120 rpm").find("are the controller's"), std::string::npos);
  const std::string named = refused("operation.speed=120 rpm");
  EXPECT_NE(named.find("event 0 (at 3 h) sets 'operation.speed=120 rpm'"), std::string::npos) << named;
  for (const char* allowed : {"vessel.head_pressure=1.0 bar(g)", "control.setpoint=40 %", "culture.q_o2_max=6 mmol/g/h",
                              "control.speed_max=150 rpm"}) {
    EXPECT_EQ(refused(allowed), "") << allowed;
  }
  // A gas flow in actual m3/min changes its normal value with the head pressure; the event sets
  // the pressure, not the controller's gas flow.
  EXPECT_EQ(refused("vessel.head_pressure=1.0 bar(g)", "operation.gas_flow=30 m3/min"), "");
}

TEST(Transient, AFedBatchClosesItsBalancesAndShowsAGradientAtTheFeed) {
  // Substrate-limited fed-batch in the 300 L pilot on a real grid; the feed enters at the surface.
  const auto loaded = read_case_file(
      fixtures::source_dir() + "/cases/pilot-300L.toml",
      {parse_override("grid.radial=4"), parse_override("grid.axial=12"), parse_override("culture.biomass=10 g/L"),
       parse_override("culture.growth_rate_max=0.4 1/h"), parse_override("culture.k_substrate=0.05 g/L"),
       parse_override("culture.yield_substrate=0.5 g/g"), parse_override("culture.maintenance_substrate=0.02 g/g/h"),
       parse_override("culture.substrate=0.05 g/L"), parse_override("feed.concentration=500 g/L"),
       parse_override("feed.height=0.7 m"), parse_override("feed.radius=0.1 m"), parse_override("feed.times=[\"0 h\", \"1 h\"]"),
       parse_override("feed.rates=[\"1 L/h\", \"2 L/h\"]")});
  TransientOptions o;
  o.duration_s = 3600.0;
  o.step_s = 20.0;
  const auto r = run_transient(loaded, {}, o);
  ASSERT_GE(r.feed_zone, 0);
  // Fed over the hour: (1 + 2)/2 L/h x 1 h x 500 g/L = 0.75 kg (trapezoid of the linear profile).
  EXPECT_NEAR(r.substrate_fed, 0.75, 1e-12);
  // fed = consumed + stored and grown = stored, exactly per step; Newton's 1e-12 of (content /
  // step) per zone and step sums to ~1e-8 of the totals over 48 zones and ~200 steps.
  EXPECT_NEAR(r.substrate_fed - r.substrate_consumed - r.substrate_stored_change, 0.0, 1e-7 * r.substrate_fed);
  EXPECT_NEAR(r.biomass_grown - r.biomass_stored_change, 0.0, 1e-7 * r.biomass_grown);
  EXPECT_NEAR((r.o2_fed - r.o2_out - r.o2_taken_up - r.o2_stored_change) / r.o2_fed, 0.0, 1e-9);
  // The feed zone holds the most substrate; the substrate-limited bulk less (a 300 L pilot mixes
  // in seconds, so the gradient is mild here; the 60 m3 demo shows a strong one).
  const auto& s = r.frames.back().substrate_kg_m3;
  EXPECT_EQ(std::max_element(s.begin(), s.end()) - s.begin(), r.feed_zone);
  EXPECT_GT(r.trace.back().substrate_max, 1.2 * r.trace.back().substrate_mean);
}

TEST(Transient, FeedWithoutAGrowingCultureIsRefused) {
  EXPECT_THROW(gassed({parse_override("feed.concentration=500 g/L"), parse_override("feed.times=[\"0 h\"]"),
                       parse_override("feed.rates=[\"1 L/h\"]")}),
               CaseError);
}

}  // namespace
}  // namespace oxystrat
