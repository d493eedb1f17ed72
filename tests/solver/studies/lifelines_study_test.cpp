// A lifelines study: on the steady field it is the steady oxygen field and the cells followed
// through it; frozen at T0 it takes the transient's operating point and last frame (DO and, for a
// growing culture, substrate) and follows the cells through the flow at that point.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "case_fixtures.hpp"
#include "solver/oxygen/transient.hpp"
#include "solver/oxygen/transient_cautions.hpp"
#include "solver/studies/lifelines_study.hpp"

namespace oxystrat {
namespace {

LoadedCase coarse(const std::string& name) {
  return read_case_file(fixtures::source_dir() + "/cases/" + name,
                        {parse_override("grid.radial=5"), parse_override("grid.axial=16")});
}

LifelineOptions few_cells() {
  LifelineOptions o;
  o.cells = 40;
  o.duration_s = 300.0;
  o.threads = 2;
  return o;
}

TEST(LifelineStudy, SteadyFieldIsTheSteadySolveAndTheSameCells) {
  const auto loaded = coarse("pilot-300L.toml");
  LifelineStudyOptions o;
  o.cells = few_cells();
  const auto s = run_lifeline_study(loaded, o);
  EXPECT_FALSE(s.frozen_at_s.has_value());
  EXPECT_EQ(s.at.operation.speed_rps, loaded.data.operation.speed_rps);
  const auto run = run_case(loaded.data, {false, false});
  ASSERT_TRUE(run.field.has_value());
  EXPECT_EQ(s.do_mol_m3, run.field->do_mol_m3);  // the same solve: bit for bit
  EXPECT_EQ(s.regimes.of_zone, impeller_regimes(run.net).of_zone);
  // Seeded: the study's cells are those simulate_lifelines follows on the same field.
  const auto direct = simulate_lifelines(run.net, run.hydro, {do_lifeline_field(run.field->do_mol_m3, loaded.data.culture.critical_do_mol_m3)},
                                         impeller_regimes(run.net), few_cells());
  EXPECT_EQ(s.result.jumps, direct.jumps);
  EXPECT_EQ(s.result.occupancy, direct.occupancy);
  ASSERT_NE(s.result.field("do"), nullptr);
  EXPECT_EQ(s.result.field("do")->time_outside_fraction, direct.field("do")->time_outside_fraction);
  EXPECT_EQ(s.result.field("substrate"), nullptr);
}

TEST(LifelineStudy, FrozenTransientSetsTheFlowAndTheFields) {
  const auto loaded = coarse("fedbatch-60m3.toml");
  const std::vector<Override> sets{parse_override("grid.radial=5"), parse_override("grid.axial=16")};
  LifelineStudyOptions o;
  o.cells = few_cells();
  o.after_s = 1200.0;
  o.overrides = sets;
  const auto s = run_lifeline_study(loaded, o);
  TransientOptions to;
  to.duration_s = 1200.0;
  to.output_interval_s = 1200.0;
  const auto tr = run_transient(loaded, sets, to);
  ASSERT_TRUE(s.frozen_at_s.has_value());
  EXPECT_EQ(*s.frozen_at_s, tr.frames.back().time_s);
  // The controller's actuators at T0, not the case's initial settings.
  EXPECT_EQ(s.at.operation.speed_rps, tr.trace.back().speed_rps);
  EXPECT_EQ(s.at.operation.gas_flow_normal_m3_s, tr.trace.back().gas_normal_m3_s);
  EXPECT_EQ(s.at.operation.oxygen_fraction, tr.trace.back().oxygen_fraction);
  EXPECT_EQ(s.do_mol_m3, tr.frames.back().do_mol_m3);
  ASSERT_EQ(s.result.fields.size(), 2u);
  EXPECT_EQ(s.result.fields[0].name, "do");
  EXPECT_EQ(s.result.fields[1].name, "substrate");
  EXPECT_EQ(s.result.fields[1].threshold, loaded.data.culture.k_substrate_kg_m3);  // K_S by default
  EXPECT_FALSE(s.result.fields[1].below);  // outside is above the threshold
  // A given threshold replaces K_S; the cells are the same, so only the substrate counts move.
  o.substrate_threshold_kg_m3 = 0.3;
  const auto t = run_lifeline_study(loaded, o);
  EXPECT_EQ(t.result.fields[1].threshold, 0.3);
  EXPECT_EQ(t.result.jumps, s.result.jumps);
  EXPECT_EQ(t.result.fields[0].time_outside_fraction, s.result.fields[0].time_outside_fraction);
  // What the frozen state rests on is said: the transient's own cautions up to T0.
  EXPECT_EQ(s.cautions, transient_cautions(loaded.data, tr));
  EXPECT_FALSE(s.cautions.empty());  // the probe reads above critical DO while the top starves
}

TEST(LifelineStudy, TheSteadyFieldCarriesTheRunsCautions) {
  // The tall demo's sparger plume churns beyond bubbly flow: the cells' field says so.
  const auto loaded = coarse("tall-3rushton.toml");
  LifelineStudyOptions o;
  o.cells = few_cells();
  const auto s = run_lifeline_study(loaded, o);
  EXPECT_EQ(s.cautions, run_case(loaded.data, {false, false}).cautions);
  EXPECT_FALSE(s.cautions.empty());
}

TEST(LifelineStudy, FrozenWithoutGrowthHasNoSubstrateField) {
  const auto loaded = coarse("pilot-300L.toml");
  ASSERT_FALSE(loaded.data.culture.grows());
  LifelineStudyOptions o;
  o.cells = few_cells();
  o.after_s = 120.0;
  o.substrate_threshold_kg_m3 = 0.3;  // nothing to apply it to
  const auto s = run_lifeline_study(loaded, o);
  ASSERT_EQ(s.result.fields.size(), 1u);
  EXPECT_EQ(s.result.fields[0].name, "do");
}

}  // namespace
}  // namespace oxystrat
