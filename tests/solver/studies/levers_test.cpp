// Levers and scale-up: each lever's value meets the constraints and the bisection finds the
// smallest one; a feasible case needs no change; each scale-up criterion holds its quantity.
#include <gtest/gtest.h>

#include <cmath>

#include "case_fixtures.hpp"
#include "input/case_reader.hpp"
#include "solver/studies/levers.hpp"
#include "solver/studies/scale_up.hpp"

namespace oxystrat {
namespace {

LoadedCase demo(const std::string& name, const std::vector<Override>& o = {}) {
  return read_case_file(fixtures::source_dir() + "/cases/" + name, o);
}

TEST(Levers, EachLeverMeetsTheConstraintsAtItsValueAndNotMuchBelow) {
  const auto loaded = demo("tall-3rushton.toml");
  LeverOptions o;
  const auto s = study_levers(loaded, {}, o);
  ASSERT_FALSE(s.base.feasible);  // the demo starves at the top
  ASSERT_EQ(s.levers.size(), 4u);
  for (const auto& r : s.levers) {
    ASSERT_TRUE(r.found) << r.name << ": " << r.note;
    EXPECT_TRUE(r.effects.feasible) << r.name;
    EXPECT_GT(r.value, r.current) << r.name;
    EXPECT_LT(r.value, r.limit) << r.name;
    // The bisection leaves the value within one step, (limit - current) / 8 / 2^7, above the last
    // failing value: 1.5 steps below it the case fails again (DO min rises with each lever here).
    const double step = (r.limit - r.current) / (o.scan_points * std::pow(2.0, o.refine_steps));
    const double back = r.value - 1.5 * step;
    const auto below = read_case_text(loaded.source_text, loaded.file_name,
                                      {parse_override(fmt::format("{}=\"{:.10g} {}\"", r.key, back, r.unit))});
    EXPECT_FALSE(lever_effects(below.data, run_case(below.data, {false, false})).feasible) << r.name;
  }
  // Ranked by the power the fix draws (agitator and compressor: the case has no prices), least first.
  for (size_t i = 1; i < s.levers.size(); ++i) EXPECT_LE(s.levers[i - 1].effects.total_power_w, s.levers[i].effects.total_power_w);
  for (const auto& r : s.levers) EXPECT_GT(r.effects.total_power_w, r.effects.power_gassed_w) << r.name;
}

TEST(Levers, AFeasibleCaseNeedsNoChange) {
  const auto loaded = demo("tall-3rushton.toml", {parse_override("culture.biomass=10 g/L")});
  const auto s = study_levers(loaded, {parse_override("culture.biomass=10 g/L")}, {});
  ASSERT_TRUE(s.base.feasible);
  for (const auto& r : s.levers) {
    EXPECT_TRUE(r.already) << r.name;
    EXPECT_EQ(r.value, r.current) << r.name;
  }
}

TEST(ScaleUp, EachCriterionHoldsItsQuantity) {
  const auto s = study_scale_up(demo("pilot-300L.toml"), demo("tall-3rushton.toml"), {});
  ASSERT_EQ(s.rows.size(), 7u);
  // Bisection on ln N to 1e-5: the held quantities agree to ~1e-4 relative (power ~N^3).
  const auto near = [](double a, double b) { return std::abs(a / b - 1.0) < 1e-3; };
  EXPECT_TRUE(near(s.rows[1].production.power_per_volume_w_m3, s.pilot.power_per_volume_w_m3));
  EXPECT_TRUE(near(s.rows[2].production.tip_speed_m_s, s.pilot.tip_speed_m_s));
  EXPECT_TRUE(near(s.rows[3].production.kla_1_s, s.pilot.kla_1_s));
  EXPECT_TRUE(near(s.rows[4].production.theta95_s, s.pilot.theta95_s));
  EXPECT_TRUE(near(s.rows[5].production.do_min_mol_m3, s.pilot.do_min_mol_m3));
  EXPECT_TRUE(near(s.rows[6].production.superficial_gas_m_s, s.pilot.superficial_gas_m_s));
  for (int i = 1; i <= 5; ++i) EXPECT_NEAR(s.rows[i].production.vvm, s.pilot.vvm, 1e-9) << i;  // equal vvm rows
  // The production case as written is the case itself.
  const auto direct = demo("tall-3rushton.toml").data;
  EXPECT_DOUBLE_EQ(s.rows[0].production.speed_rps, direct.operation.speed_rps);
}

TEST(ScaleUp, ToASmallerVesselSearchesOnlyTheSpeedsACaseMayGive) {
  // From the 60 m3 demo to the 300 L pilot (at 400 rpm): the search once reached 8 x 400 rpm, past
  // the 3000 rpm a case may give, and every criterion ended in that range error.
  const auto s = study_scale_up(demo("tall-3rushton.toml"), demo("pilot-300L.toml"), {});
  ASSERT_EQ(s.rows.size(), 7u);
  for (size_t i = 1; i < s.rows.size(); ++i) EXPECT_TRUE(s.rows[i].reached) << s.rows[i].criterion << ": " << s.rows[i].note;
  EXPECT_NEAR(s.rows[2].production.tip_speed_m_s / s.pilot.tip_speed_m_s, 1.0, 1e-3);  // bisection to 1e-5 in ln N
}

}  // namespace
}  // namespace oxystrat
