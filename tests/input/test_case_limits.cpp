// The keys of heat, shear and cost: [cooling], [utilities], [prices], culture.kind and heat_yield,
// impeller.N.dissipation_ratio and their [constraints]: what they read to in SI, and every error
// naming file:line, the key and what was expected.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

CaseText with(const std::string& block) { return CaseText().insert_after("axial = 12", block); }

const std::string kCooling = "[cooling]\njacket_area = \"3 m2\"\njacket_u = \"400 W/(m2 K)\"\ncoil_area = \"2 m2\"\n"
                             "coil_u = \"0.6 kW/(m2 K)\"\ncoolant_temperature = \"12 degC\"\ncoolant_flow = \"3.6 m3/h\"";

TEST(CaseLimits, DefaultsWithoutTheTables) {
  const auto c = load(CaseText()).data;
  EXPECT_FALSE(c.cooling.given);
  EXPECT_FALSE(c.prices.given);
  EXPECT_EQ(c.culture.kind, CultureKind::microbial);
  EXPECT_DOUBLE_EQ(c.culture.heat_yield_j_mol, 440e3);  // Cordier et al. 1987 [pub]
  EXPECT_DOUBLE_EQ(c.utilities.supply_pressure_drop_pa, 0.3e5);
  EXPECT_DOUBLE_EQ(c.utilities.ambient_temperature_k, 293.15);
  EXPECT_DOUBLE_EQ(c.utilities.gas_temperature_k, 293.15);
  EXPECT_FALSE(c.constraints.min_cooling_margin);  // nothing to compare with
  EXPECT_FALSE(c.impellers[0].dissipation_ratio);
}

TEST(CaseLimits, CoolingSurfacesInSI) {
  const auto c = load(with(kCooling)).data;
  ASSERT_TRUE(c.cooling.given);
  EXPECT_DOUBLE_EQ(c.cooling.ua_w_k(), 3 * 400.0 + 2 * 600.0);
  EXPECT_DOUBLE_EQ(c.cooling.coolant_inlet_k, 285.15);
  EXPECT_DOUBLE_EQ(c.cooling.coolant_mass_flow_kg_s, 1.0);  // 3.6 m3/h of water at the default 1000 kg/m3
  EXPECT_DOUBLE_EQ(*c.constraints.min_cooling_margin, 0.0);  // with [cooling], the cooling must cover the duty
}

TEST(CaseLimits, CoolantAsMassFlowAndADutyGivenOutright) {
  auto c = load(with(kCooling), {"cooling.coolant_flow=\"7.2 t/h\""}).data;
  EXPECT_DOUBLE_EQ(c.cooling.coolant_mass_flow_kg_s, 2.0);
  c = load(with("[cooling]\nduty = \"250 kW\"")).data;
  EXPECT_DOUBLE_EQ(*c.cooling.duty_w, 250e3);
}

TEST(CaseLimits, DutyAndSurfacesTogetherAreRefused) {
  const auto c = with(kCooling + "\nduty = \"250 kW\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("duty =") + ": cooling.duty = \"250 kW\""));
  EXPECT_THAT(msg, HasSubstr("either the available duty or the surfaces"));
}

TEST(CaseLimits, CoolantWarmerThanTheBrothIsRefused) {
  const auto c = with(kCooling).replace("coolant_temperature = \"12 degC\"", "coolant_temperature = \"35 degC\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("coolant_temperature") + ": cooling.coolant_temperature"));
  EXPECT_THAT(msg, HasSubstr("not colder than the broth at 30 degC"));
}

TEST(CaseLimits, SurfaceWithoutItsCoefficientIsMissing) {
  const auto msg = error_of(with(kCooling).remove_line("coil_u"));
  EXPECT_THAT(msg, HasSubstr("missing key cooling.coil_u"));
  EXPECT_THAT(msg, HasSubstr("W/(m2 K)"));
}

TEST(CaseLimits, CoolantFlowInAWrongUnit) {
  const auto c = with(kCooling).replace("coolant_flow = \"3.6 m3/h\"", "coolant_flow = \"3.6 bar\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("coolant_flow") + ": cooling.coolant_flow"));
  EXPECT_THAT(msg, HasSubstr("kg/s"));
  EXPECT_THAT(msg, HasSubstr("m3/h"));
}

TEST(CaseLimits, PricesInTheirCurrency) {
  const auto c = load(with("[prices]\ncurrency = \"EUR\"\nelectricity = \"90 EUR/MWh\"\noxygen = \"120 EUR/t\"")).data;
  ASSERT_TRUE(c.prices.given);
  EXPECT_EQ(c.prices.currency, "EUR");
  EXPECT_NEAR(c.prices.electricity_per_j * 3.6e6, 0.09, 1e-15);  // per kWh; round-off only
  EXPECT_NEAR(*c.prices.oxygen_per_kg, 0.12, 1e-15);
}

TEST(CaseLimits, APriceInAnotherCurrencyIsRefused) {
  const auto c = with("[prices]\ncurrency = \"EUR\"\nelectricity = \"0.1 USD/kWh\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("electricity") + ": prices.electricity = \"0.1 USD/kWh\""));
  EXPECT_THAT(msg, HasSubstr("in 'USD' but prices.currency is 'EUR'"));
}

TEST(CaseLimits, APriceWithoutItsUnitIsRefused) {
  const auto c = with("[prices]\ncurrency = \"EUR\"\nelectricity = \"0.1\"");
  EXPECT_THAT(error_of(c), HasSubstr("e.g. electricity = \"0.12 EUR/kWh\""));
  const auto bare = with("[prices]\ncurrency = \"EUR\"\nelectricity = 0.1");
  const auto msg = error_of(bare);
  EXPECT_THAT(msg, HasSubstr(bare.where("electricity") + ": prices.electricity = 0.1"));
  EXPECT_THAT(msg, HasSubstr("as a string with its currency and unit"));
}

TEST(CaseLimits, EnrichedGasNeedsAnOxygenPrice) {
  const auto c = with("[prices]\ncurrency = \"EUR\"\nelectricity = \"0.1 EUR/kWh\"");
  const auto msg = error_of(c, {"operation.oxygen_fraction=0.3"});
  EXPECT_THAT(msg, HasSubstr("missing key prices.oxygen"));
  EXPECT_THAT(msg, HasSubstr("enriched"));
}

TEST(CaseLimits, CultureKindAndHeatYield) {
  const auto c = load(CaseText().insert_after("critical_do", "kind = \"cell\"\nheat_yield = \"0.12 kcal/mmol\"")).data;
  EXPECT_EQ(c.culture.kind, CultureKind::cell);
  EXPECT_NEAR(c.culture.heat_yield_j_mol, 502.08e3, 1e-6);  // 0.12 kcal/mmol, thermochemical kcal
  const auto bad = CaseText().insert_after("critical_do", "kind = \"mammalian\"");
  EXPECT_THAT(error_of(bad), HasSubstr("expected one of microbial | cell"));
}

TEST(CaseLimits, ShearConstraintsAndDissipationPerVolume) {
  const auto c = load(with("[constraints]\nmin_kolmogorov_length = \"40 um\"\nmax_dissipation = \"1030 W/m3\""),
                      {"impeller.0.dissipation_ratio=25"})
                     .data;
  EXPECT_DOUBLE_EQ(*c.constraints.min_kolmogorov_length_m, 40e-6);
  EXPECT_DOUBLE_EQ(*c.constraints.max_dissipation_w_kg, 1.0);  // 1030 W/m3 over the broth's 1030 kg/m3
  EXPECT_DOUBLE_EQ(*c.impellers[0].dissipation_ratio, 25.0);
}

TEST(CaseLimits, CoolingMarginWithoutCoolingIsRefused) {
  const auto c = with("[constraints]\nmin_cooling_margin = \"10 %\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("min_cooling_margin") + ": constraints.min_cooling_margin"));
  EXPECT_THAT(msg, HasSubstr("needs a [cooling] table"));
}

TEST(CaseLimits, UtilitiesPressureDropIsADifference) {
  const auto c = load(with("[utilities]\nsupply_pressure_drop = \"0.5 bar\"\ncompressor_efficiency = 0.75")).data;
  EXPECT_DOUBLE_EQ(c.utilities.supply_pressure_drop_pa, 0.5e5);
  EXPECT_DOUBLE_EQ(c.utilities.compressor_efficiency, 0.75);
  const auto bad = with("[utilities]\ncompressor_efficiency = 1.5");
  EXPECT_THAT(error_of(bad), HasSubstr("utilities.compressor_efficiency"));
}

}  // namespace
}  // namespace oxystrat::test
