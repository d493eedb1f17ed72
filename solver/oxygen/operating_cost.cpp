#include "solver/oxygen/operating_cost.hpp"

#include <algorithm>

#include "input/units.hpp"
#include "physics/compression.hpp"
#include "physics/solubility.hpp"
#include "solver/oxygen/heat_balance.hpp"
#include "physics/constants.hpp"

namespace oxystrat {

OperatingCost operating_cost(const Case& c, double power_gassed_w, double inlet_gas_mol_s, double otr_mol_s) {
  OperatingCost k;
  const auto& u = c.utilities;
  const double a = physics::air_o2_fraction, y = c.operation.oxygen_fraction;
  // A share s of pure O2 in air gives y = s + (1 - s) a, so s = (y - a) / (1 - a).
  const double o2_share = y > a + air_fraction_tolerance ? std::min(1.0, (y - a) / (1.0 - a)) : 0.0;
  k.oxygen_purchased_mol_s = inlet_gas_mol_s * o2_share;
  k.air_mol_s = inlet_gas_mol_s - k.oxygen_purchased_mol_s;
  k.supply_pressure_pa = sparger_pressure_pa(c) + u.supply_pressure_drop_pa;
  const double p1 = units::standard_atmosphere_pa;
  const double q1 = k.air_mol_s * kR * u.ambient_temperature_k / p1;  // at the compressor inlet
  k.compressor_isothermal_w = physics::isothermal_compression_power(p1, q1, k.supply_pressure_pa);
  k.compressor_adiabatic_w = physics::adiabatic_compression_power(p1, q1, k.supply_pressure_pa);
  k.compressor_w = k.compressor_adiabatic_w / u.compressor_efficiency;
  k.agitator_w = power_gassed_w / u.drive_efficiency;
  k.total_power_w = k.agitator_w + k.compressor_w;
  const auto& p = c.prices;
  if (!p.given) return k;
  k.electricity_per_h = k.total_power_w * 3600.0 * p.electricity_per_j;
  k.oxygen_per_h = k.oxygen_purchased_mol_s * physics::molar_mass_o2 * 3600.0 * p.oxygen_per_kg.value_or(0.0);
  k.total_per_h = *k.electricity_per_h + *k.oxygen_per_h;
  const double o2_kg_h = otr_mol_s * physics::molar_mass_o2 * 3600.0;
  if (o2_kg_h > 0.0) k.per_kg_o2 = *k.total_per_h / o2_kg_h;
  return k;
}

}  // namespace oxystrat
