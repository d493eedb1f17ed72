// Geometry that single keys cannot check alone: impellers and sparger inside the liquid, clear of
// the baffles and the bottom head, impellers bottom to top without overlap, H/T within 0.5-6.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

TEST(CaseGeometry, ImpellerWiderThanTheFreeWidthInsideTheBaffles) {
  // T = 1 m with 0.1 m baffles leaves 0.8 m.
  const CaseText c = CaseText().replace("diameter = \"0.35 m\"", "diameter = \"0.85 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("0.85 m") + ": impeller.0.diameter = \"0.85 m\""));
  EXPECT_THAT(msg, HasSubstr("does not fit inside the baffles"));
  EXPECT_THAT(msg, HasSubstr("less than T - 2 x baffle width = 0.8 m"));
}

TEST(CaseGeometry, UnbaffledVesselAllowsUpToTheWall) {
  const CaseText wide = CaseText()
                            .replace("baffles = 4", "baffles = 0")
                            .remove_line("baffle_width")
                            .replace("diameter = \"0.35 m\"", "diameter = \"0.85 m\"");
  EXPECT_NO_THROW(load(wide));
  const CaseText full = CaseText()
                            .replace("baffles = 4", "baffles = 0")
                            .remove_line("baffle_width")
                            .replace("diameter = \"0.35 m\"", "diameter = \"1.0 m\"");
  EXPECT_THAT(error_of(full), HasSubstr("less than T - 2 x baffle width = 1 m"));
}

TEST(CaseGeometry, BafflesNeedAWidth) {
  const CaseText c = CaseText().replace("baffle_width = \"0.1 m\"", "baffle_width = \"0 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("baffle_width") + ": vessel.baffle_width = \"0 m\""));
  EXPECT_THAT(msg, HasSubstr("must be more than 0 m when baffles > 0"));
}

TEST(CaseGeometry, ImpellerBladesAboveTheLiquidSurface) {
  // The upper impeller's band is D/5 sin 45 = 0.0424 m high: at 1.49 m it reaches 1.511 m > 1.5 m.
  const CaseText c = CaseText().replace("elevation = \"1.0 m\"", "elevation = \"1.49 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("1.49 m") + ": impeller.1.elevation = \"1.49 m\""));
  EXPECT_THAT(msg, HasSubstr("the impeller blades reach 1.511 m, above the liquid surface at 1.5 m"));
}

TEST(CaseGeometry, ImpellerBladesCutByTheSurfaceSayWhatLevelsWork) {
  // The pitched blade's band at 1.0 m is 0.979-1.021 m: a level of 1.0 m cuts it.
  const auto msg = error_of(CaseText().replace("liquid_height = \"1.5 m\"", "liquid_height = \"1.0 m\""));
  EXPECT_THAT(msg, HasSubstr("which cuts them (0.9788-1.021 m): a partly submerged impeller is not modelled"));
  EXPECT_THAT(msg, HasSubstr("raise the liquid above 1.021 m, or lower it below 0.9788 m to leave the impeller out"));
}

TEST(CaseGeometry, ImpellerAboveTheLiquidNeedsTheShell) {
  // Filled to 0.9 m, below the upper impeller's blades (from 0.979 m): without the shell's length a
  // mistyped elevation and a low fill look the same, so the reader refuses.
  const CaseText low = CaseText().replace("liquid_height = \"1.5 m\"", "liquid_height = \"0.9 m\"");
  const auto msg = error_of(low);
  EXPECT_THAT(msg, HasSubstr(low.where("elevation = \"1.0 m\"") + ": impeller.1.elevation = \"1.0 m\""));
  EXPECT_THAT(msg, HasSubstr("left out of the model only when vessel.straight_side gives the shell"));
}

TEST(CaseGeometry, ImpellerAboveTheLiquidIsLeftOutWithANote) {
  // The shell (head 0.25 m + 1.5 m straight side) ends at 1.75 m: the upper impeller fits in it,
  // above the 0.9 m of liquid; the case keeps the lower impeller only.
  const CaseText low =
      CaseText().replace("liquid_height = \"1.5 m\"", "liquid_height = \"0.9 m\"\nstraight_side = \"1.5 m\"");
  const auto loaded = load(low);
  ASSERT_EQ(loaded.data.impellers.size(), 1u);
  EXPECT_EQ(loaded.data.impellers[0].elevation_m, 0.4);
  EXPECT_THAT(loaded.notes,
              testing::Contains(HasSubstr(low.where("elevation = \"1.0 m\"") + ": impeller.1.elevation = \"1.0 m\": impeller 1 at 1 m is "
                                                                 "above the liquid surface at 0.9 m and is left out")));
  // Above the shell's top it is an error still.
  EXPECT_THAT(error_of(CaseText(low).replace("elevation = \"1.0 m\"", "elevation = \"1.8 m\"")),
              HasSubstr("the impeller at 1.8 m is above the top of the vessel's shell at 1.75 m (bottom head 0.25 m + "
                        "vessel.straight_side)"));
  // With every impeller above the liquid nothing stirs it.
  const CaseText empty =
      CaseText(low).replace("elevation = \"0.4 m\"", "elevation = \"0.95 m\"").replace("elevation = \"1.0 m\"", "elevation = \"1.4 m\"");
  EXPECT_THAT(error_of(empty), HasSubstr("every impeller is above the liquid surface at 0.9 m: nothing stirs the broth"));
}

TEST(CaseGeometry, ImpellerIntoTheBottomHead) {
  // The head surface at the tip radius 0.175 m is 0.25 (1 - sqrt(1 - 0.35^2)) = 0.0158 m high; a
  // 0.07 m band centred at 0.04 m reaches down to 0.005 m.
  const CaseText c = CaseText().replace("elevation = \"0.4 m\"", "elevation = \"0.04 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("0.04 m") + ": impeller.0.elevation = \"0.04 m\""));
  EXPECT_THAT(msg, HasSubstr("reach down to 0.005 m, into the vessel bottom"));
  EXPECT_THAT(msg, HasSubstr("0.01581"));
}

TEST(CaseGeometry, FlatBottomAllowsTheBladesDownToTheFloor) {
  const CaseText c = CaseText().replace("bottom = \"ellipsoidal\"", "bottom = \"flat\"")
                         .replace("elevation = \"0.4 m\"", "elevation = \"0.04 m\"");
  EXPECT_NO_THROW(load(c));
}

TEST(CaseGeometry, ImpellersNotListedBottomToTop) {
  const CaseText c = CaseText().replace("elevation = \"1.0 m\"", "elevation = \"0.3 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("0.3 m") + ": impeller.1.elevation = \"0.3 m\""));
  EXPECT_THAT(msg, HasSubstr("impellers must be listed bottom to top: 0.3 m is not above the previous impeller at 0.4 m"));
}

TEST(CaseGeometry, ImpellersOverlapping) {
  // Lower band 0.365-0.435 m; the upper band at 0.45 m starts at 0.45 - 0.0212 = 0.4288 m.
  const CaseText c = CaseText().replace("elevation = \"1.0 m\"", "elevation = \"0.45 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("0.45 m") + ": impeller.1.elevation = \"0.45 m\""));
  EXPECT_THAT(msg, HasSubstr("overlaps impeller 0"));
  EXPECT_THAT(msg, HasSubstr("reaches 0.435 m"));
}

TEST(CaseGeometry, ImpellersTouchingAreAllowed) {
  // Bands that meet at one plane do not overlap: 0.375 + 0.0625/2 = 0.4375 - 0.0625/2 = 0.40625 m
  // (all binary fractions, so the comparison is exact).
  const CaseText c = CaseText()
                         .replace("diameter = \"0.35 m\"", "diameter = \"0.35 m\"\nblade_height = \"0.0625 m\"")
                         .replace("elevation = \"0.4 m\"", "elevation = \"0.375 m\"")
                         .replace("type = \"pitched-blade-down\"", "type = \"rushton\"\nblade_height = \"0.0625 m\"")
                         .replace("elevation = \"1.0 m\"", "elevation = \"0.4375 m\"");
  const auto loaded = load(c);
  EXPECT_EQ(loaded.data.impellers.size(), 2u);
  ASSERT_FALSE(loaded.notes.empty());  // spacing 0.0625 m < D: powers do not simply add
  EXPECT_THAT(loaded.notes.front(), HasSubstr("spacing"));
}

TEST(CaseGeometry, SpargerInTheBottomHead) {
  // Head surface at the ring radius 0.14 m: 0.25 (1 - sqrt(1 - 0.28^2)) = 0.01 m.
  const CaseText c = CaseText().replace("elevation = \"0.25 m\"", "elevation = \"0.005 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("0.005 m") + ": sparger.elevation = \"0.005 m\""));
  EXPECT_THAT(msg, HasSubstr("lies in the vessel bottom"));
  EXPECT_THAT(msg, HasSubstr("at its radius 0.14 m"));
}

TEST(CaseGeometry, SpargerWiderThanTheFreeWidth) {
  const CaseText c = CaseText().replace("diameter = \"0.28 m\"", "diameter = \"0.85 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("0.85 m") + ": sparger.diameter = \"0.85 m\""));
  EXPECT_THAT(msg, HasSubstr("sparger diameter must be less than 0.8 m (inside the baffles)"));
}

TEST(CaseGeometry, SpargerAboveTheLowestImpellerIsANote) {
  const CaseText c = CaseText().replace("elevation = \"0.25 m\"", "elevation = \"0.6 m\"");
  const auto loaded = load(c);
  EXPECT_THAT(loaded.notes, testing::Contains(testing::AllOf(HasSubstr(c.where("0.6 m") + ": sparger.elevation"),
                                                             HasSubstr("above the lowest impeller"))));
}

TEST(CaseGeometry, HeightOverDiameterTooSmall) {
  const CaseText c = CaseText().replace("liquid_height = \"1.5 m\"", "liquid_height = \"0.45 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("0.45 m") + ": vessel.liquid_height = \"0.45 m\""));
  EXPECT_THAT(msg, HasSubstr("H/T = 0.45"));
  EXPECT_THAT(msg, HasSubstr("outside the supported 0.5 to 6"));
}

TEST(CaseGeometry, HeightOverDiameterTooLarge) {
  const CaseText c = CaseText().replace("liquid_height = \"1.5 m\"", "liquid_height = \"6.5 m\"");
  EXPECT_THAT(error_of(c), HasSubstr(c.where("6.5 m") + ": vessel.liquid_height = \"6.5 m\": liquid height / "
                                                        "diameter H/T = 6.5"));
}

TEST(CaseGeometry, HeightOverDiameterFromTheWorkingVolume) {
  // 10 m3 in a 1 m vessel is about 12.8 m of liquid.
  const CaseText c = CaseText().replace("liquid_height = \"1.5 m\"", "working_volume = \"10 m3\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("10 m3") + ": vessel.working_volume = \"10 m3\""));
  EXPECT_THAT(msg, HasSubstr("outside the supported 0.5 to 6"));
}

TEST(CaseGeometry, BothLiquidHeightAndWorkingVolume) {
  const CaseText c = CaseText().insert_after("liquid_height", "working_volume = \"1 m3\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("working_volume") + ": vessel.working_volume = \"1 m3\""));
  EXPECT_THAT(msg, HasSubstr("give either liquid_height or working_volume, not both"));
}

TEST(CaseGeometry, GasFlowWithoutSparger) {
  const CaseText c = CaseText().replace(kSpargerBlock, "");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("gas_flow") + ": operation.gas_flow = \"0.5 vvm\""));
  EXPECT_THAT(msg, HasSubstr("gas is sparged but the case has no [sparger] table"));
}

TEST(CaseGeometry, ZeroGasFlowWithoutSpargerIsValid) {
  EXPECT_NO_THROW(load(CaseText().replace(kSpargerBlock, "").replace("0.5 vvm", "0 vvm")));
}

}  // namespace
}  // namespace oxystrat::test
