#include "solver/oxygen/limit_values.hpp"

#include "physics/solubility.hpp"

namespace oxystrat {

void append_limit_values(const Case& c, const CaseRun& run, std::vector<SummaryValue>& out) {
  const auto& q = run.limits.heat;
  const auto& s = run.limits.shear;
  const auto& k = run.limits.cost;
  const auto add = [&](const char* name, double si, const char* si_unit, const char* shown, const char* label) {
    out.push_back(summary_entry(name, si, si_unit, shown, label));
  };
  add("heat_metabolic", q.metabolic_w, "W", "kW", "heat from metabolism");
  add("heat_agitation", q.agitation_w, "W", "kW", "heat from agitation");
  add("heat_gas_expansion", q.gas_expansion_w, "W", "kW", "heat from gas expansion");
  add("heat_gas", q.heat_gas_w(), "W", "kW", "heat carried off by the gas");
  add("cooling_required", q.required_w, "W", "kW", "cooling duty required");
  if (q.available_w) add("cooling_available", *q.available_w, "W", "kW", "cooling available");
  if (q.margin) add("cooling_margin", *q.margin, "1", "%", "cooling margin");
  if (q.max_our_mol_m3_s) add("max_our_heat", *q.max_our_mol_m3_s, "mol/(m3 s)", "mmol/(L h)", "max OUR (cooling)");
  if (q.max_biomass_kg_m3) add("max_biomass_heat", *q.max_biomass_kg_m3, "kg/m3", "g/L", "max biomass (cooling)");
  add("dissipation_max", s.epsilon_max_w_kg, "W/kg", "W/kg", "max dissipation (impeller discharge)");
  add("kolmogorov_length_min", s.kolmogorov_min_m, "m", "um", "smallest Kolmogorov length");
  add("turbulent_stress_max", s.stress_max_pa, "Pa", "Pa", "max Kolmogorov-eddy stress");
  add("compressor_power", k.compressor_w, "W", "kW", "compressor power (drawn)");
  add("agitator_power", k.agitator_w, "W", "kW", "agitator power (drawn)");
  add("total_power", k.total_power_w, "W", "kW", "agitator + compressor (drawn)");
  add("oxygen_purchased", k.oxygen_purchased_mol_s * physics::molar_mass_o2, "kg/s", "kg/h", "pure O2 bought");
  if (k.total_per_h) {
    // A currency is not converted: per hour, as /summary/operating_cost.
    const std::string per_h = c.prices.currency + "/h", per_kg = c.prices.currency + "/kg";
    out.push_back({"operating_cost", per_h, *k.total_per_h, "operating cost", per_h, 1.0});
    if (k.per_kg_o2) out.push_back({"cost_per_kg_o2", per_kg, *k.per_kg_o2, "cost per kg O2 transferred", per_kg, 1.0});
  }
}

std::vector<std::string> limit_value_names(const Case& c) {
  std::vector<std::string> names{"heat_metabolic", "heat_agitation", "heat_gas_expansion", "heat_gas",
                                 "cooling_required"};
  if (c.cooling.given) names.insert(names.end(), {"cooling_available", "cooling_margin", "max_our_heat"});
  if (c.cooling.given && c.culture.q_o2_max_mol_kg_s > 0.0) names.push_back("max_biomass_heat");
  names.insert(names.end(), {"dissipation_max", "kolmogorov_length_min", "turbulent_stress_max", "compressor_power",
                             "agitator_power", "total_power", "oxygen_purchased"});
  if (c.prices.given) names.insert(names.end(), {"operating_cost", "cost_per_kg_o2"});
  return names;
}

}  // namespace oxystrat
