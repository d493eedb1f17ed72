#include "solver/oxygen/limit_values.hpp"

#include "physics/solubility.hpp"

namespace oxystrat {

void append_limit_values(const Case& c, const CaseRun& run, std::vector<SummaryValue>& out) {
  const auto& q = run.limits.heat;
  const auto& s = run.limits.shear;
  const auto& k = run.limits.cost;
  const double kw = 1e-3;
  out.push_back({"heat_metabolic", "kW", kw * q.metabolic_w, "heat from metabolism"});
  out.push_back({"heat_agitation", "kW", kw * q.agitation_w, "heat from agitation"});
  out.push_back({"heat_gas_expansion", "kW", kw * q.gas_expansion_w, "heat from gas expansion"});
  out.push_back({"heat_gas", "kW", kw * q.heat_gas_w(), "heat carried off by the gas"});
  out.push_back({"cooling_required", "kW", kw * q.required_w, "cooling duty required"});
  if (q.available_w) out.push_back({"cooling_available", "kW", kw * *q.available_w, "cooling available"});
  if (q.margin) out.push_back({"cooling_margin", "%", 100.0 * *q.margin, "cooling margin"});
  if (q.max_our_mol_m3_s) out.push_back({"max_our_heat", "mmol/(L h)", 3600.0 * *q.max_our_mol_m3_s, "max OUR (cooling)"});
  if (q.max_biomass_kg_m3) out.push_back({"max_biomass_heat", "g/L", *q.max_biomass_kg_m3, "max biomass (cooling)"});
  out.push_back({"dissipation_max", "W/kg", s.epsilon_max_w_kg, "max dissipation (impeller discharge)"});
  out.push_back({"kolmogorov_min", "um", 1e6 * s.kolmogorov_min_m, "smallest Kolmogorov length"});
  out.push_back({"turbulent_stress_max", "Pa", s.stress_max_pa, "max Kolmogorov-eddy stress"});
  out.push_back({"compressor_power", "kW", kw * k.compressor_w, "compressor power (drawn)"});
  out.push_back({"agitator_power", "kW", kw * k.agitator_w, "agitator power (drawn)"});
  out.push_back({"total_power", "kW", kw * k.total_power_w, "agitator + compressor (drawn)"});
  out.push_back({"oxygen_purchased", "kg/h", 3600.0 * k.oxygen_purchased_mol_s * physics::molar_mass_o2, "pure O2 bought"});
  if (k.total_per_h) {
    const std::string& cur = c.prices.currency;
    out.push_back({"operating_cost", cur + "/h", *k.total_per_h, "operating cost"});
    if (k.per_kg_o2) out.push_back({"cost_per_kg_o2", cur + "/kg", *k.per_kg_o2, "cost per kg O2 transferred"});
  }
}

std::vector<std::string> limit_value_names(const Case& c) {
  std::vector<std::string> names{"heat_metabolic", "heat_agitation", "heat_gas_expansion", "heat_gas",
                                 "cooling_required"};
  if (c.cooling.given) names.insert(names.end(), {"cooling_available", "cooling_margin", "max_our_heat"});
  if (c.cooling.given && c.culture.q_o2_max_mol_kg_s > 0.0) names.push_back("max_biomass_heat");
  names.insert(names.end(), {"dissipation_max", "kolmogorov_min", "turbulent_stress_max", "compressor_power",
                             "agitator_power", "total_power", "oxygen_purchased"});
  if (c.prices.given) names.insert(names.end(), {"operating_cost", "cost_per_kg_o2"});
  return names;
}

}  // namespace oxystrat
