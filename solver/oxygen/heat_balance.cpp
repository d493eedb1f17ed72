#include "solver/oxygen/heat_balance.hpp"

#include <algorithm>
#include <cmath>

#include "physics/heat.hpp"
#include "physics/solubility.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
double sparger_pressure_pa(const Case& c) {
  if (!c.has_sparger) return c.vessel.head_pressure_pa;
  const double depth = std::max(0.0, c.vessel.liquid_height_m - c.sparger.elevation_m);
  return c.vessel.head_pressure_pa + c.broth.density_kg_m3 * kG * depth;
}

std::optional<double> cooling_available_w(const Case& c) {
  const auto& k = c.cooling;
  if (!k.given) return std::nullopt;
  if (k.duty_w) return *k.duty_w;
  // One coolant through jacket and coil in parallel, split in proportion to U A: both then have the
  // same NTU and act as one surface of the summed U A (our assumption; docs/method.md, section 16).
  return physics::coolant_duty(k.ua_w_k(), k.coolant_mass_flow_kg_s * k.coolant_heat_capacity_j_kg_k,
                               c.vessel.temperature_k, k.coolant_inlet_k);
}

HeatBalance heat_balance(const Case& c, const HeatInputs& in) {
  HeatBalance b;
  const double t = c.vessel.temperature_k;
  const double p_top = c.vessel.head_pressure_pa;
  const double yield = c.culture.heat_yield_j_mol;
  b.metabolic_w = yield * in.our_mol_s;
  b.agitation_w = in.power_gassed_w;
  // The gas expands isothermally at broth temperature from the sparger's pressure to the head's:
  // its work goes into the liquid and is dissipated (the power input of a bubble column).
  b.gas_expansion_w = in.inlet_gas_mol_s * kR * t * std::log(sparger_pressure_pa(c) / p_top);
  b.gas_sensible_w = in.inlet_gas_mol_s * physics::dry_gas_molar_heat_capacity * (t - c.utilities.gas_temperature_k);
  // Dry inlet, off-gas saturated with water at broth temperature and head pressure.
  const double pw = physics::water_vapour_pressure(t);
  const double water_per_dry = pw / (p_top - pw);
  const double latent_j_mol = physics::water_latent_heat(t) * physics::molar_mass_water;
  const double dry_out = std::max(0.0, in.inlet_gas_mol_s - in.otr_mol_s + in.cer_mol_s);
  b.water_evaporation_kg_s = dry_out * water_per_dry * physics::molar_mass_water;
  b.gas_latent_w = dry_out * water_per_dry * latent_j_mol;
  b.required_w = b.metabolic_w + b.agitation_w + b.gas_expansion_w - b.gas_sensible_w - b.gas_latent_w;
  b.available_w = cooling_available_w(c);
  if (!b.available_w) return b;
  if (b.required_w > 0.0) b.margin = (*b.available_w - b.required_w) / b.required_w;
  // At steady state OTR = OUR = x and CER = RQ x: required(x) = a + s x, linear; solve a + s x = available.
  const double a = b.agitation_w + b.gas_expansion_w - b.gas_sensible_w -
                   in.inlet_gas_mol_s * water_per_dry * latent_j_mol;
  const double slope = yield - (c.culture.rq - 1.0) * water_per_dry * latent_j_mol;
  const double x = slope > 0.0 ? std::max(0.0, (*b.available_w - a) / slope) : 0.0;
  b.max_our_mol_m3_s = x / c.vessel.working_volume_m3;
  // Every cell at its largest uptake: the heat per kg biomass can be no more (conservative).
  if (c.culture.q_o2_max_mol_kg_s > 0.0) b.max_biomass_kg_m3 = *b.max_our_mol_m3_s / c.culture.q_o2_max_mol_kg_s;
  return b;
}

}  // namespace oxystrat
