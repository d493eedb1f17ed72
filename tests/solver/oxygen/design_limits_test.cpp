// Heat, shear and cost of a solved case: the heat balance closes term by term, a cooling-limited
// case supports less biomass than its oxygen transfer, the Kolmogorov length per zone, and the
// compressor power against the isothermal formula.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "case_fixtures.hpp"
#include "input/case_reader.hpp"
#include "physics/heat.hpp"
#include "physics/solubility.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/oxygen/cautions.hpp"

namespace oxystrat {
namespace {

constexpr double kR = 8.314462618;  // J/(mol K), CODATA 2018
constexpr double kG = 9.80665;

TEST(HeatBalance, ClosesTermByTerm) {
  const Case c = fixtures::gassed_vessel(4, 10);
  const auto run = run_case(c, {false, false});
  ASSERT_TRUE(run.field);
  const auto& q = run.limits.heat;
  const auto& f = *run.field;
  // Metabolic heat = 440 kJ/mol x OUR (Cordier et al. 1987); agitation = gassed shaft power.
  EXPECT_NEAR(q.metabolic_w / (440e3 * f.our_total_mol_s), 1.0, 1e-12);
  EXPECT_NEAR(q.agitation_w, run.hydro.power_gassed_w, 1e-9 * run.hydro.power_gassed_w);
  // Isothermal expansion from the sparger's hydrostatic pressure to the head's, at broth temperature.
  const double n = run.hydro.gas_molar_flow_mol_s, t = c.vessel.temperature_k, p_top = c.vessel.head_pressure_pa;
  const double p_sparger = p_top + c.broth.density_kg_m3 * kG * (c.vessel.liquid_height_m - c.sparger.elevation_m);
  EXPECT_NEAR(q.gas_expansion_w / (n * kR * t * std::log(p_sparger / p_top)), 1.0, 1e-12);
  // Dry gas in at 20 degC (the default), out saturated at the broth temperature and head pressure.
  EXPECT_NEAR(q.gas_sensible_w / (n * 29.1 * (t - 293.15)), 1.0, 1e-12);
  const double pw = physics::water_vapour_pressure(t);
  const double dry_out = n - f.otr_total_mol_s + c.culture.rq * f.our_total_mol_s;
  const double water_mol_s = dry_out * pw / (p_top - pw);
  EXPECT_NEAR(q.water_evaporation_kg_s / (water_mol_s * 18.015e-3), 1.0, 1e-12);
  EXPECT_NEAR(q.gas_latent_w / (water_mol_s * 18.015e-3 * physics::water_latent_heat(t)), 1.0, 1e-12);
  // The duty: in - out. All terms are of order 1e3-1e4 W: relative round-off.
  const double in = q.metabolic_w + q.agitation_w + q.gas_expansion_w;
  EXPECT_NEAR(q.required_w, in - q.gas_sensible_w - q.gas_latent_w, 1e-12 * in);
  EXPECT_FALSE(q.available_w);  // no [cooling]: nothing to compare with, and no placeholder
  EXPECT_FALSE(q.max_biomass_kg_m3);
}

// The gassed vessel with a jacket whose coolant is only a few kelvin below the broth: cooling, not
// oxygen, sets the largest biomass.
Case cooling_limited() {
  Case c = fixtures::gassed_vessel(4, 10);
  c.cooling.given = true;
  c.cooling.jacket_area_m2 = 4.0;
  c.cooling.jacket_u_w_m2_k = 350.0;
  c.cooling.coolant_inlet_k = c.vessel.temperature_k - 8.0;
  c.cooling.coolant_mass_flow_kg_s = 0.5;
  c.constraints.min_cooling_margin = 0.0;
  return c;
}

TEST(HeatBalance, CoolingLimitedCaseSupportsLessBiomassThanItsOxygen) {
  const Case c = cooling_limited();
  const auto run = run_case(c, {true, false});
  const auto& q = run.limits.heat;
  ASSERT_TRUE(q.available_w && q.max_biomass_kg_m3 && q.max_our_mol_m3_s);
  // The available duty: U A x LMTD with the coolant's own outlet (effectiveness form; identity).
  const double cap = 0.5 * 4186.0, tb = c.vessel.temperature_k, tin = tb - 8.0;
  const double tout = tin + *q.available_w / cap;
  EXPECT_NEAR(*q.available_w / (4.0 * 350.0 * physics::log_mean_temperature_difference(tb - tin, tb - tout)), 1.0, 1e-12);
  EXPECT_GT(run.max_biomass_kg_m3, 0.0);
  EXPECT_LT(*q.max_biomass_kg_m3, run.max_biomass_kg_m3);
  bool caution = false;
  for (const auto& w : run.cautions) caution = caution || w.find("heat limits before oxygen") != std::string::npos;
  EXPECT_TRUE(caution);
  // At the heat-limited uptake the required duty equals the available one: the balance is linear in
  // the uptake (steady: OTR = OUR, CER = RQ OUR), so the solve is exact to round-off.
  const double x = *q.max_our_mol_m3_s * c.vessel.working_volume_m3;
  const auto at_limit = heat_balance(c, {run.hydro.power_gassed_w, run.hydro.gas_molar_flow_mol_s, x, x, c.culture.rq * x});
  EXPECT_NEAR(at_limit.required_w / *q.available_w, 1.0, 1e-10);
  EXPECT_NEAR(*q.max_biomass_kg_m3, *q.max_our_mol_m3_s / c.culture.q_o2_max_mol_kg_s, 1e-12);
}

TEST(Cautions, ChurningGasIsAPlumeOrTheVesselsGasFlow) {
  // The tall demo: 2.3 % of the volume above a holdup of 0.3, its sparger plume. The 150 m3 demo
  // at 1 vvm: ~96 %, the whole vessel's gas flow; the caution says so, with the dispersion's gas
  // fraction beside the holdup per liquid volume (which passes 100 % there: 95 %, i.e. 49 %).
  const auto churning = [](const std::string& file, const std::vector<Override>& o) {
    const Case c = read_case_file(fixtures::source_dir() + "/cases/" + file, o).data;
    const auto run = run_case(c, {false, false});
    for (const auto& w : run.cautions) {
      if (w.find("model range: gas holdup") != std::string::npos) return w;
    }
    return std::string();
  };
  const std::string plume = churning("tall-3rushton.toml", {});
  EXPECT_NE(plume.find("typically the sparger plume"), std::string::npos) << plume;
  const std::string vessel = churning("tall-bacterial-150m3.toml", {parse_override("operation.gas_flow=1 vvm")});
  EXPECT_NE(vessel.find("not a sparger plume but the gas flow itself"), std::string::npos) << vessel;
  EXPECT_NE(vessel.find("of the gassed dispersion"), std::string::npos) << vessel;
}

TEST(Cautions, HighPco2IsJudgedByTheCultureKind) {
  // 150 mmHg: the cell-culture threshold of Gray et al. (1996); microbial cultures are cautioned
  // from the same value with their own (wide, from memory) range, never with the cell-culture text.
  const double mmhg = 133.322;
  EXPECT_EQ(pco2_caution(CultureKind::cell, 149.0 * mmhg), "");
  EXPECT_EQ(pco2_caution(CultureKind::microbial, 149.0 * mmhg), "");
  const std::string cell = pco2_caution(CultureKind::cell, 160.0 * mmhg);
  EXPECT_NE(cell.find("pCO2 reaches 160 mmHg"), std::string::npos) << cell;
  EXPECT_NE(cell.find("Gray et al. 1996"), std::string::npos) << cell;
  const std::string microbial = pco2_caution(CultureKind::microbial, 160.0 * mmhg);
  EXPECT_NE(microbial.find("bacteria and fungi"), std::string::npos) << microbial;
  EXPECT_EQ(microbial.find("cell cultures"), std::string::npos) << microbial;
}

TEST(Cautions, ATemperatureBeyondTheSolubilityAndKlaDataIsCautioned) {
  // Benson & Krause (1984) fitted O2 solubility to about 40 degC and the 1.024 kLa factor is used
  // near 10-30 degC (both from memory): a thermophile at 65 degC and a culture at 5 degC are told,
  // the demo's 30 degC is not.
  const auto temperature_caution = [](const std::string& t) {
    const Case c = read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml",
                                  {parse_override("vessel.temperature=" + t)}).data;
    const auto run = run_case(c, {false, false});
    for (const auto& w : run.cautions) {
      if (w.find("degC the") != std::string::npos) return w;
    }
    return std::string();
  };
  EXPECT_EQ(temperature_caution("30 degC"), "");
  const std::string hot = temperature_caution("65 degC");
  EXPECT_NE(hot.find("at 65 degC the O2 solubility of Benson & Krause (1984)"), std::string::npos) << hot;
  EXPECT_NE(hot.find("here x2.9"), std::string::npos) << hot;  // 1.024^45 = 2.90
  const std::string cold = temperature_caution("5 degC");
  EXPECT_NE(cold.find("at 5 degC the kLa temperature factor"), std::string::npos) << cold;
  EXPECT_NE(cold.find("here x0.7"), std::string::npos) << cold;  // 1.024^-15 = 0.70
}

TEST(Cautions, ATopImpellerNearTheSurfaceIsCautioned) {
  // The tall demo's top Rushton (D = 1.1 m) at 5.9 m: 2.1 m of cover at the demo's 8 m (1.9 D),
  // 0.3 m (0.27 D) at 6.2 m, below the half diameter the caution uses (common practice).
  const auto near_surface = [](const std::string& level) {
    const Case c = read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml",
                                  {parse_override("vessel.liquid_height=" + level), parse_override("grid.axial=24")})
                       .data;
    const auto run = run_case(c, {false, false});
    for (const auto& w : run.cautions) {
      if (w.find("of liquid above it") != std::string::npos) return w;
    }
    return std::string();
  };
  EXPECT_EQ(near_surface("8 m"), "");
  const std::string w = near_surface("6.2 m");
  EXPECT_NE(w.find("impeller 2 has 0.3 m of liquid above it (0.27 of its diameter)"), std::string::npos) << w;
}

TEST(Cautions, AnImpellerAboveTheLiquidIsLeftOut) {
  // The tall demo filled to 5.5 m (its shell given): the top impeller's blades start at 5.79 m.
  const auto loaded = read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml",
                                     {parse_override("vessel.liquid_height=5.5 m"),
                                      parse_override("vessel.straight_side=8 m"), parse_override("grid.axial=24")});
  ASSERT_EQ(loaded.data.impellers.size(), 2u);
  const auto run = run_case(loaded.data, {false, false});
  ASSERT_EQ(run.hydro.impellers.size(), 2u);
  EXPECT_TRUE(run.field);
  // The power is the two submerged impellers' alone: the same as at full fill less the top one's
  // share (equal Rushtons at equal speed: a third, to the gassed factors' differences).
  const auto full = run_case(read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml",
                                            {parse_override("grid.axial=24")}).data, {false, false});
  EXPECT_NEAR(run.hydro.power_ungassed_w / full.hydro.power_ungassed_w, 2.0 / 3.0, 1e-9);
  // At 0.5 vvm the gassed broth rises from 5.5 m past 5.79 m, into the left-out impeller's blades:
  // a caution says so; filled to 4.5 m it stays below them.
  const auto reaches = [](const CaseRun& r) {
    return std::any_of(r.cautions.begin(), r.cautions.end(),
                       [](const std::string& w) { return w.find("into the blades") != std::string::npos; });
  };
  ASSERT_TRUE(run.field);
  EXPECT_GT(run.field->gassed_level_m, 5.79);
  EXPECT_TRUE(reaches(run));
  const auto lower = run_case(read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml",
                                             {parse_override("vessel.liquid_height=4.5 m"),
                                              parse_override("vessel.straight_side=8 m"), parse_override("grid.axial=24")})
                                  .data,
                              {false, false});
  ASSERT_TRUE(lower.field);
  EXPECT_LT(lower.field->gassed_level_m, 5.79);
  EXPECT_FALSE(reaches(lower));
}

TEST(Shear, KolmogorovLengthAndStressPerZone) {
  const Case c = fixtures::gassed_vessel(4, 10);
  const auto run = run_case(c, {false, false});
  const auto& s = run.limits.shear;
  ASSERT_EQ(s.kolmogorov_m.size(), run.hydro.epsilon.size());
  double zone_max = 0.0;
  for (size_t k = 0; k < s.kolmogorov_m.size(); ++k) {
    const double eps = run.hydro.epsilon[k];
    const double nu = run.hydro.apparent_viscosity[k] / c.broth.density_kg_m3;  // Newtonian here: mu/rho
    // (nu^3/eps)^(1/4) and rho (eps nu)^(1/2), by definition: round-off only.
    EXPECT_NEAR(s.kolmogorov_m[k] / std::pow(nu * nu * nu / eps, 0.25), 1.0, 1e-12) << k;
    EXPECT_NEAR(s.stress_pa[k] / (c.broth.density_kg_m3 * std::sqrt(eps * nu)), 1.0, 1e-12) << k;
    zone_max = std::max(zone_max, eps);
  }
  // Each Rushton: 40 x its power over the liquid of its domain (Zhou & Kresta 1996, from memory),
  // or the zones of its swept volume where they already hold more.
  std::vector<double> domain(2, 0.0), swept(2, 0.0);
  for (int k = 0; k < run.net.size(); ++k) {
    domain[run.net.region[k].domain] += run.net.volume[k];
    if (run.net.region[k].discharge >= 0) {
      swept[run.net.region[k].discharge] = std::max(swept[run.net.region[k].discharge], run.hydro.epsilon[k]);
    }
  }
  for (size_t i = 0; i < 2; ++i) {
    const double mean = run.hydro.impellers[i].power_gassed_w / (c.broth.density_kg_m3 * domain[i]);
    EXPECT_NEAR(s.impellers[i].epsilon_mean_w_kg / mean, 1.0, 1e-12);
    EXPECT_NEAR(s.impellers[i].epsilon_max_w_kg / std::max(40.0 * mean, swept[i]), 1.0, 1e-12);
  }
  EXPECT_GE(s.epsilon_max_w_kg, zone_max);
  EXPECT_LE(s.kolmogorov_min_m, *std::min_element(s.kolmogorov_m.begin(), s.kolmogorov_m.end()));
}

TEST(Shear, ShearThinningBrothUsesTheApparentViscosityOfEachZone) {
  // A power-law broth (K = 0.5 Pa s^n, n = 0.5, invented): each zone's eddies follow its own
  // apparent viscosity, which the hydrodynamics derives from its dissipation; round-off only.
  Case c = fixtures::gassed_vessel(4, 10);
  c.broth.rheology.kind = RheologyKind::power_law;
  c.broth.rheology.consistency = 0.5;
  c.broth.rheology.flow_index = 0.5;
  const auto run = run_case(c, {false, false});
  const auto& s = run.limits.shear;
  for (size_t k = 0; k < s.kolmogorov_m.size(); ++k) {
    const double nu = run.hydro.apparent_viscosity[k] / c.broth.density_kg_m3;
    EXPECT_NEAR(s.kolmogorov_m[k] / std::pow(nu * nu * nu / run.hydro.epsilon[k], 0.25), 1.0, 1e-12) << k;
  }
  // Thinner where the dissipation peaks: the impeller maximum sees a lower viscosity than the bulk.
  const double mu_max = apparent_viscosity(c.broth.rheology,
                                           dissipation_shear_rate(c.broth.rheology, c.broth.density_kg_m3,
                                                                  s.epsilon_max_w_kg));
  EXPECT_LT(mu_max, *std::max_element(run.hydro.apparent_viscosity.begin(), run.hydro.apparent_viscosity.end()));
}

TEST(OperatingCost, CompressorPowerAgainstTheIsothermalFormula) {
  Case c = fixtures::gassed_vessel(4, 10);
  const auto run = run_case(c, {false, false});
  const auto& k = run.limits.cost;
  // Air from 1 atm at 20 degC to the sparger's hydrostatic pressure plus the default 0.3 bar of
  // filters, piping and sparger; P = p1 Q1 ln(p2/p1) with p1 Q1 = n R T1 (ideal gas).
  const double n = run.hydro.gas_molar_flow_mol_s;
  const double p1 = 101325.0, q1 = n * kR * 293.15 / p1;
  const double p2 = c.vessel.head_pressure_pa +
                    c.broth.density_kg_m3 * kG * (c.vessel.liquid_height_m - c.sparger.elevation_m) + 0.3e5;
  EXPECT_NEAR(k.compressor_isothermal_w / (p1 * q1 * std::log(p2 / p1)), 1.0, 1e-12);
  EXPECT_GT(k.compressor_adiabatic_w, k.compressor_isothermal_w);  // isothermal is the least work
  EXPECT_NEAR(k.compressor_w, k.compressor_adiabatic_w / 0.70, 1e-9);
  EXPECT_NEAR(k.total_power_w, run.hydro.power_gassed_w / 0.90 + k.compressor_w, 1e-9);
  EXPECT_FALSE(k.total_per_h);  // no [prices]
}

TEST(OperatingCost, EnrichedGasBuysTheOxygenAboveAir) {
  Case c = fixtures::gassed_vessel(4, 10);
  c.operation.oxygen_fraction = 0.40;
  c.prices.given = true;
  c.prices.currency = "EUR";
  c.prices.electricity_per_j = 0.10 / 3.6e6;
  c.prices.oxygen_per_kg = 0.20;
  const auto run = run_case(c, {false, false});
  const auto& k = run.limits.cost;
  const double n = run.hydro.gas_molar_flow_mol_s, share = (0.40 - 0.20946) / (1.0 - 0.20946);
  EXPECT_NEAR(k.oxygen_purchased_mol_s / (n * share), 1.0, 1e-12);  // air + pure O2 that make 40 % O2
  EXPECT_NEAR(k.air_mol_s / (n * (1.0 - share)), 1.0, 1e-12);       // only the air is compressed
  ASSERT_TRUE(k.total_per_h && k.per_kg_o2);
  const double power_cost = k.total_power_w / 1e3 * 0.10;
  const double o2_cost = k.oxygen_purchased_mol_s * physics::molar_mass_o2 * 3600.0 * 0.20;
  EXPECT_NEAR(*k.total_per_h, power_cost + o2_cost, 1e-12 * *k.total_per_h);
  EXPECT_NEAR(*k.per_kg_o2, *k.total_per_h / (run.field->otr_total_mol_s * physics::molar_mass_o2 * 3600.0),
              1e-12 * *k.per_kg_o2);
}

}  // namespace
}  // namespace oxystrat
