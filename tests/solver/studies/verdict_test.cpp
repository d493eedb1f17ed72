// The verdict: the demo starves at its top and says so; a lighter culture meets; the advice names
// the levers that fix it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "case_fixtures.hpp"
#include "input/case_reader.hpp"
#include "solver/studies/levers.hpp"
#include "solver/studies/verdict.hpp"

namespace oxystrat {
namespace {

using ::testing::HasSubstr;

TEST(Verdict, TheDemoStarvesAtItsTop) {
  const auto loaded = read_case_file(testing::source_dir() + "/cases/tall-3rushton.toml");
  const Case& c = loaded.data;
  const auto run = run_case(c);
  const auto v = make_verdict(c, run);
  EXPECT_FALSE(v.meets);
  EXPECT_NEAR(v.starved.volume_fraction, run.field->volume_fraction_below_critical, 1e-12);
  EXPECT_EQ(v.starved.z_hi, c.vessel.liquid_height_m);  // up to the surface
  EXPECT_GT(v.starved.z_lo, 0.5 * c.vessel.liquid_height_m);
  EXPECT_THAT(v.headline, HasSubstr("NOT FINE"));
  EXPECT_THAT(v.headline, HasSubstr("the top"));
  EXPECT_THAT(v.headline, HasSubstr("one-average-kLa answer says the tank is fine"));
  EXPECT_THAT(lever_advice(study_levers(loaded, {}, {})), HasSubstr("gas flow"));
}

TEST(Verdict, ALighterCultureMeets) {
  const auto c = read_case_file(testing::source_dir() + "/cases/tall-3rushton.toml", {parse_override("culture.biomass=10 g/L")}).data;
  const auto v = make_verdict(c, run_case(c));
  EXPECT_TRUE(v.meets);
  EXPECT_EQ(v.starved.volume_fraction, 0.0);
  EXPECT_THAT(v.headline, HasSubstr("FINE"));
}

}  // namespace
}  // namespace oxystrat
