// Transient: single-zone re-aeration against the analytic curve (with its order of accuracy),
// relaxation to the steady field, the O2 balance over time, and a controller holding its set-point.
#include <gtest/gtest.h>

#include <cmath>

#include "case_fixtures.hpp"
#include "case_run.hpp"
#include "transient.hpp"

namespace oxystrat {
namespace {

LoadedCase gassed(const std::vector<Override>& extra) {
  std::vector<Override> o{parse_override("grid.radial=1"), parse_override("grid.axial=1")};
  o.insert(o.end(), extra.begin(), extra.end());
  return read_case_file(testing::source_dir() + "/cases/pilot-300L.toml", o);
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
  const auto loaded = read_case_file(testing::source_dir() + "/cases/pilot-300L.toml",
                                     {parse_override("grid.radial=4"), parse_override("grid.axial=10")});
  const auto steady = run_case(loaded.data, {false, false});
  TransientOptions o;
  o.duration_s = 600.0;
  o.step_s = 5.0;
  o.initial_do_mol_m3 = 0.0;
  const auto r = run_transient(loaded, {}, o);
  for (int z = 0; z < steady.net.size(); ++z) {
    EXPECT_NEAR(r.do_fields.back()[z], steady.field->do_mol_m3[z], 1e-6) << "zone " << z;  // ~100 mixing times
  }
  // Fed = off-gas + taken up + stored, exactly for implicit Euler (Newton tolerance 1e-12).
  EXPECT_NEAR((r.o2_fed - r.o2_out - r.o2_taken_up - r.o2_stored_change) / r.o2_fed, 0.0, 1e-9);
}

TEST(Transient, ControllerHoldsTheProbeAtItsSetPointAfterAnUptakeStep) {
  const auto loaded = read_case_text(R"toml(
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
speed_min = "150 rpm"
speed_max = "700 rpm"
interval = "5 s"
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
  // More uptake after the step: the controller has raised the speed.
  double speed_before = 0.0;
  for (const auto& s : r.trace) {
    if (s.time_s <= 600.0) speed_before = s.speed_rps;
  }
  EXPECT_GT(r.trace.back().speed_rps, speed_before);
}

}  // namespace
}  // namespace oxystrat
