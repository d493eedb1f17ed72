// The valid base case reads into the SI values it states, with the documented defaults.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "case_text.hpp"
#include "physics/vessel_shape.hpp"
#include "tests/round_off.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

// Values are parsed by one multiplication each: round-off tolerance (kRoundOff).

TEST(CaseReader, BaseCaseInSi) {
  const auto loaded = load(CaseText());
  const Case& c = loaded.data;
  EXPECT_EQ(c.title, "test vessel");
  EXPECT_NEAR(c.vessel.diameter_m, 1.0, kRoundOff);
  EXPECT_NEAR(c.vessel.liquid_height_m, 1.5, kRoundOff);
  EXPECT_EQ(c.vessel.bottom, BottomShape::ellipsoidal);
  EXPECT_EQ(c.vessel.baffles, 4);
  EXPECT_NEAR(c.vessel.baffle_width_m, 0.1, kRoundOff);
  EXPECT_NEAR(c.vessel.head_pressure_pa, 151325.0, kRoundOff * 151325.0);
  EXPECT_NEAR(c.vessel.temperature_k, 303.15, kRoundOff * 303.15);
  ASSERT_EQ(c.impellers.size(), 2u);
  EXPECT_EQ(c.impellers[0].type, ImpellerType::rushton);
  EXPECT_EQ(c.impellers[1].type, ImpellerType::pitched_blade_down);
  EXPECT_NEAR(c.impellers[0].diameter_m, 0.35, kRoundOff);
  EXPECT_NEAR(c.impellers[1].elevation_m, 1.0, kRoundOff);
  EXPECT_TRUE(c.has_sparger);
  EXPECT_EQ(c.sparger.type, SpargerType::ring);
  EXPECT_NEAR(c.sparger.diameter_m, 0.28, kRoundOff);
  EXPECT_NEAR(c.operation.speed_rps, 2.5, kRoundOff);
  EXPECT_NEAR(c.broth.density_kg_m3, 1030.0, kRoundOff * 1030.0);
  EXPECT_NEAR(c.broth.viscosity_pa_s, 2e-3, kRoundOff * 2e-3);
  EXPECT_NEAR(c.culture.biomass_kg_m3, 20.0, kRoundOff * 20.0);
  EXPECT_NEAR(c.culture.q_o2_max_mol_kg_s, 4.0 / 3600.0, kRoundOff * 4.0 / 3600.0);
  EXPECT_EQ(c.grid.radial, 6);
  EXPECT_EQ(c.grid.axial, 12);
  EXPECT_TRUE(loaded.notes.empty());
  EXPECT_EQ(loaded.file_name, kCaseFile);
  EXPECT_EQ(loaded.source_text, kBaseCase);
}

TEST(CaseReader, WorkingVolumeIsTheVolumeBelowTheLiquidHeight) {
  const auto c = load(CaseText()).data;
  const VesselShape shape(1.0, BottomShape::ellipsoidal);
  EXPECT_NEAR(c.vessel.working_volume_m3, shape.volume_below(1.5), kRoundOff);
}

TEST(CaseReader, WorkingVolumeGivesTheLiquidHeight) {
  // 2:1 ellipsoidal head pi T^3/24 plus a cylinder pi T^2/4 (H - T/4) (Perry's Chemical
  // Engineers' Handbook, 8th ed., section 10).
  const double t = 1.0, h = 1.5;
  const double v = std::numbers::pi * t * t * t / 24.0 + std::numbers::pi * t * t / 4.0 * (h - t / 4.0);
  const auto volume_text = fmt::format("working_volume = \"{:.17g} L\"", v * 1e3);
  const auto c = load(CaseText().replace("liquid_height = \"1.5 m\"", volume_text)).data;
  // Above the head the height is linear in the volume: round-off only.
  EXPECT_NEAR(c.vessel.liquid_height_m, h, kRoundOff);
}

TEST(CaseReader, ImpellerDefaultsByType) {
  // Blade counts and band heights are the reader's documented defaults (input/case_vessel.cpp):
  // Rushton 6 blades, band D/5; 45 degree pitched blade 4 blades, band D/5 sin 45 degrees.
  const auto c = load(CaseText()).data;
  EXPECT_EQ(c.impellers[0].blades, 6);
  EXPECT_NEAR(c.impellers[0].blade_height_m, 0.2 * 0.35, kRoundOff);
  EXPECT_EQ(c.impellers[1].blades, 4);
  EXPECT_NEAR(c.impellers[1].blade_height_m, 0.2 * 0.30 * std::numbers::sqrt2 / 2.0, kRoundOff);
}

TEST(CaseReader, DefaultsWhenKeysAreAbsent) {
  const auto c = load(CaseText()
                          .remove_line("head_pressure =")
                          .remove_line("temperature =")
                          .remove_line("baffle_width =")
                          .remove_line("[grid]")
                          .remove_line("radial = 6")
                          .remove_line("axial = 12"))
                     .data;
  EXPECT_NEAR(c.vessel.head_pressure_pa, 101325.0, kRoundOff * 101325.0);
  EXPECT_NEAR(c.vessel.temperature_k, 310.15, kRoundOff * 310.15);
  EXPECT_NEAR(c.vessel.baffle_width_m, 0.1 * c.vessel.diameter_m, kRoundOff);  // T/10, common practice
  EXPECT_EQ(c.grid.radial, 12);
  EXPECT_EQ(c.grid.axial, 40);
  EXPECT_EQ(c.output.sectors, 24);
}

TEST(CaseReader, NoGasWithoutSpargerIsValid) {
  // A tracer test in water: no sparger and no gas flow.
  const auto c = load(CaseText().replace(kSpargerBlock, "").remove_line("gas_flow =")).data;
  EXPECT_FALSE(c.has_sparger);
  EXPECT_EQ(c.operation.gas_flow_normal_m3_s, 0.0);
}

TEST(CaseReader, NotesDoNotStopTheCase) {
  // An unbaffled vessel is valid but earns a note.
  const auto loaded = load(CaseText().replace("baffles = 4", "baffles = 0").remove_line("baffle_width ="));
  ASSERT_FALSE(loaded.notes.empty());
  EXPECT_THAT(loaded.notes.back(), HasSubstr("unbaffled"));
  EXPECT_THAT(loaded.notes.back(), HasSubstr("give impeller.0.power_number, impeller.0.flow_number"));
}

TEST(CaseReader, AnUnbaffledVesselNamesOnlyTheNumbersStillMissing) {
  // The bundled cell culture gives its unbaffled power number: only the flow number is asked for.
  const auto cells = read_case_file(OXYSTRAT_TEST_DATA_DIR "/../../cases/cell-culture-2m3.toml");
  ASSERT_FALSE(cells.notes.empty());
  EXPECT_THAT(cells.notes.back(), HasSubstr("give impeller.0.flow_number from your own data"));
  EXPECT_THAT(cells.notes.back(), testing::Not(HasSubstr("power_number")));
  // Both given: nothing to ask for.
  const auto both = read_case_file(OXYSTRAT_TEST_DATA_DIR "/../../cases/cell-culture-2m3.toml",
                                    {parse_override("impeller.0.flow_number=0.5")});
  for (const auto& n : both.notes) EXPECT_THAT(n, testing::Not(HasSubstr("unbaffled"))) << n;
}

TEST(CaseReader, ReadsAFileFromDisk) {
  const auto loaded = read_case_file(OXYSTRAT_TEST_DATA_DIR "/small-case.toml");
  EXPECT_THAT(loaded.file_name, HasSubstr("small-case.toml"));
  EXPECT_EQ(loaded.data.impellers.size(), 1u);
}

TEST(CaseReader, MissingFileIsACaseError) {
  try {
    read_case_file("/nonexistent/folder/none.toml");
    ADD_FAILURE() << "no error for a missing file";
  } catch (const CaseError& e) {
    EXPECT_THAT(e.what(), HasSubstr("/nonexistent/folder/none.toml: cannot open the case file"));
  }
}

}  // namespace
}  // namespace oxystrat::test
