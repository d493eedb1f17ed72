#include "input/case_sections.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "physics/solubility.hpp"
#include "physics/constants.hpp"

namespace oxystrat::detail {
namespace {

// The flow curve: newtonian (broth.viscosity), power-law (consistency, flow_index),
// herschel-bulkley (yield_stress, consistency, flow_index) or casson (yield_stress, viscosity).
void read_rheology(TomlSource& src, Broth& b) {
  auto& r = b.rheology;
  const auto kind = src.choice("broth.rheology", {"newtonian", "power-law", "herschel-bulkley", "casson"}).value_or("newtonian");
  r.kind = kind == "power-law"          ? RheologyKind::power_law
           : kind == "herschel-bulkley" ? RheologyKind::herschel_bulkley
           : kind == "casson"           ? RheologyKind::casson
                                        : RheologyKind::newtonian;
  r.viscosity_pa_s = b.viscosity_pa_s;
  const bool power = r.kind == RheologyKind::power_law || r.kind == RheologyKind::herschel_bulkley;
  const bool yield = r.kind == RheologyKind::herschel_bulkley || r.kind == RheologyKind::casson;
  // Every key is read and checked; those of another flow curve are then ignored with a note.
  const auto k = src.quantity("broth.consistency", Dimension::consistency, {1e-4, 1000.0});
  const auto n = src.number("broth.flow_index", {0.05, 1.5});
  const auto tau = src.quantity("broth.yield_stress", Dimension::stress, {0.0, 1000.0});
  if (power) {
    if (!k) src.missing("broth.consistency", "the consistency K, e.g. consistency = \"2 Pa s^n\"");
    if (!n) src.missing("broth.flow_index", "the power-law index n, e.g. flow_index = 0.4");
    r.consistency = *k;
    r.flow_index = *n;
  }
  if (yield) {
    if (!tau) src.missing("broth.yield_stress", "the yield stress, e.g. yield_stress = \"5 Pa\"");
    r.yield_stress_pa = *tau;
  }
}

}  // namespace

void read_operation(TomlSource& src, Case& c) {
  src.allow_table("operation");
  if (!src.has("operation")) src.missing("operation", "the [operation] table with at least speed");
  auto& o = c.operation;
  o.speed_rps = src.require_quantity("operation.speed", Dimension::speed, {0.0, max_speed_rps, true}, "120 rpm");
  o.gas_flow_normal_m3_s = read_gas_flow(src, "operation.gas_flow", c.vessel);
  o.oxygen_fraction = src.number("operation.oxygen_fraction", {0.0, 1.0}).value_or(physics::air_o2_fraction);
  // Air's CO2 by default, but never more than the O2 leaves (pure O2 has none).
  o.co2_fraction = src.number("operation.co2_fraction", {0.0, 0.2}).value_or(std::min(0.00042, 1.0 - o.oxygen_fraction));
  if (o.oxygen_fraction + o.co2_fraction > 1.0) {
    src.fail("operation.co2_fraction", fmt::format("oxygen_fraction + co2_fraction must not exceed 1 ({:.4g} + {:.4g})",
                                                   o.oxygen_fraction, o.co2_fraction));
  }
  if (o.gas_flow_normal_m3_s > 0.0 && !c.has_sparger) {
    src.fail("operation.gas_flow", "gas is sparged but the case has no [sparger] table");
  }
}

void read_do_calibration(TomlSource& src, Case& c) {
  src.allow_table("do_calibration");
  auto& b = c.do_percent;
  const double t = c.vessel.temperature_k;
  const double salt = physics::salting_out_factor(physics::Gas::o2, t, c.broth.ions_mol_m3);
  b.in_vessel = src.choice("do_calibration.basis", {"air-1atm", "in-vessel"}).value_or("air-1atm") == "in-vessel";
  if (!b.in_vessel) {
    b.reference_mol_m3 = physics::o2_saturation_air_1atm(t) * salt;
    b.label = "% of air saturation at 1 atm";
    return;
  }
  const double h = c.vessel.liquid_height_m;
  b.probe_height_m = src.quantity("do_calibration.probe_height", Dimension::length, {0.0, h, true}).value_or(0.25 * h);
  b.gas_o2_fraction = src.choice("do_calibration.gas", {"air", "inlet"}).value_or("air") == "inlet"
                          ? c.operation.oxygen_fraction
                          : physics::air_o2_fraction;
  const double p = c.vessel.head_pressure_pa + c.broth.density_kg_m3 * kG * (h - b.probe_height_m);
  b.reference_mol_m3 = physics::henry_o2(t) * salt * b.gas_o2_fraction * (p - physics::water_vapour_pressure(t));
  b.label = fmt::format("% of in-vessel saturation ({:.3g} % O2 at {:.4g} bar(a), probe at {:.3g} m)",
                        100.0 * b.gas_o2_fraction, p / 1e5, b.probe_height_m);
}

void read_broth(TomlSource& src, Case& c) {
  src.allow_table("broth");
  auto& b = c.broth;
  b.density_kg_m3 = src.quantity_or("broth.density", Dimension::density, {500.0, 2000.0}, 1000.0);
  b.viscosity_pa_s = src.quantity_or("broth.viscosity", Dimension::viscosity, {2e-4, 10.0}, 1e-3);
  read_rheology(src, b);
  const auto coal = src.choice("broth.coalescence", {"coalescing", "non-coalescing"}).value_or("coalescing");
  b.coalescence = coal == "coalescing" ? Coalescence::coalescing : Coalescence::non_coalescing;
  src.allow_table("broth.ions");
  for (const auto& ion : src.keys("broth.ions")) {
    const std::string p = "broth.ions." + ion;
    if (!physics::known_ion(ion)) {
      src.fail(p, fmt::format("unknown ion; known ions are {} (quote the key: \"Na+\" = \"0.15 mol/L\")",
                              physics::known_ions()));
    }
    b.ions_mol_m3[ion] = *src.quantity(p, Dimension::concentration, {0.0, 5000.0});
  }
}

void read_culture(TomlSource& src, Case& c) {
  src.allow_table("culture");
  if (!src.has("culture")) return;
  auto& k = c.culture;
  read_culture_amounts(src, k);  // biomass or cells/mL; q_O2 per mass or per cell
  k.k_o2_mol_m3 = read_o2_concentration(src, "culture.k_o2", c, {0.0, 1.0}, "0.003 mmol/L");
  k.critical_do_mol_m3 = read_o2_concentration(src, "culture.critical_do", c, {0.0, 2.0}, "0.01 mmol/L");
  k.rq = src.number("culture.rq", {0.0, 3.0}).value_or(1.0);
  k.growth_rate_max_s = src.quantity_or("culture.growth_rate_max", Dimension::rate, {0.0, 5.0 / 3600.0}, 0.0);
  k.k_substrate_kg_m3 = src.quantity_or("culture.k_substrate", Dimension::biomass, {0.0, 100.0}, 0.0);
  k.yield_substrate = src.quantity_or("culture.yield_substrate", Dimension::mass_yield, {0.0, 5.0, true}, 0.5);
  k.yield_oxygen = src.quantity_or("culture.yield_oxygen", Dimension::mass_yield, {0.0, 20.0}, 0.0);
  k.maintenance_substrate_s =
      src.quantity_or("culture.maintenance_substrate", Dimension::mass_specific_rate, {0.0, 1.0 / 3600.0}, 0.0);
  k.maintenance_o2_mol_kg_s =
      src.quantity_or("culture.maintenance_o2", Dimension::specific_rate, {0.0, 20.0 / 3600.0}, 0.0);
  k.substrate_kg_m3 = src.quantity_or("culture.substrate", Dimension::biomass, {0.0, 1000.0}, 0.0);
  if (k.grows() && k.yield_oxygen == 0.0 && k.q_o2_max_mol_kg_s <= k.maintenance_o2_mol_kg_s) {
    src.fail("culture.maintenance_o2", "must be below culture.q_o2_max when culture.yield_oxygen is derived from them");
  }
}

}  // namespace oxystrat::detail
