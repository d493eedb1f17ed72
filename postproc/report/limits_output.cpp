#include "postproc/report/limits_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "input/units.hpp"
#include "postproc/report/number_format.hpp"
#include "physics/solubility.hpp"

namespace oxystrat {
namespace {

constexpr double kKw = 1e-3;

std::string degc(double k) { return fmt::format("{:.1f} degC", k - 273.15); }

std::string cooling_source(const Cooling& k) {
  if (k.duty_w) return "duty given";
  std::string s;
  if (k.jacket_area_m2 > 0.0) s += fmt::format("jacket {:.3g} m2 x {:.3g} W/(m2 K)", k.jacket_area_m2, k.jacket_u_w_m2_k);
  if (k.coil_area_m2 > 0.0) {
    s += fmt::format("{}coil {:.3g} m2 x {:.3g} W/(m2 K)", s.empty() ? "" : " + ", k.coil_area_m2, k.coil_u_w_m2_k);
  }
  return s + fmt::format(", coolant {:.3g} kg/s from {}", k.coolant_mass_flow_kg_s, degc(k.coolant_inlet_k));
}

struct Row {
  std::string label, value, unit;
};

std::string table(const std::string& title, const std::vector<Row>& rows) {
  std::string s = "<div><h3>" + svg::escape(title) + "</h3>\n<table><tr><th>quantity</th><th>value</th><th>unit</th></tr>\n";
  for (const auto& r : rows) {
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{}</td><td>{}</td></tr>\n", svg::escape(r.label), svg::escape(r.value),
                     svg::escape(r.unit));
  }
  return s + "</table></div>\n";
}

std::string num(double v) { return report::format_number(v); }

}  // namespace

std::vector<int> zones_near_shear_limit(const Case& c, const CaseRun& run, std::string* limit_text) {
  const auto& k = c.constraints;
  if (!k.max_dissipation_w_kg && !k.min_kolmogorov_length_m) return {};
  std::string text;
  if (k.max_dissipation_w_kg) text = fmt::format("{:.3g} W/kg", *k.max_dissipation_w_kg);
  if (k.min_kolmogorov_length_m) {
    text += fmt::format("{}{:.3g} um", text.empty() ? "" : ", ", 1e6 * *k.min_kolmogorov_length_m);
  }
  if (limit_text != nullptr) *limit_text = text;
  // Within a factor 2 in dissipation, which is 2^(1/4) in Kolmogorov length.
  std::vector<int> zones;
  const auto& eps = run.hydro.epsilon;
  const auto& eta = run.limits.shear.kolmogorov_m;
  for (size_t z = 0; z < eps.size(); ++z) {
    const bool near_eps = k.max_dissipation_w_kg && eps[z] >= 0.5 * *k.max_dissipation_w_kg;
    const bool near_eta = k.min_kolmogorov_length_m && eta[z] <= std::pow(2.0, 0.25) * *k.min_kolmogorov_length_m;
    if (near_eps || near_eta) zones.push_back(static_cast<int>(z));
  }
  std::stable_sort(zones.begin(), zones.end(), [&](int a, int b) { return eps[a] > eps[b]; });
  if (zones.size() > 8) zones.resize(8);
  return zones;
}

void write_limits_h5(H5Writer& h5, const Case& c, const CaseRun& run) {
  const auto& q = run.limits.heat;
  const auto& s = run.limits.shear;
  const auto& k = run.limits.cost;
  h5.write("/summary/heat_metabolic", q.metabolic_w, "W");
  h5.attribute("/summary/heat_metabolic", "meaning", fmt::format("heat yield {:.0f} kJ/mol O2 x O2 uptake", c.culture.heat_yield_j_mol / 1e3));
  h5.write("/summary/heat_yield", c.culture.heat_yield_j_mol, "J/mol");
  h5.write("/summary/heat_agitation", q.agitation_w, "W");
  h5.write("/summary/heat_gas_expansion", q.gas_expansion_w, "W");
  h5.attribute("/summary/heat_gas_expansion", "meaning", "isothermal expansion work of the gas from sparger to surface");
  h5.write("/summary/heat_gas", q.heat_gas_w(), "W");
  h5.attribute("/summary/heat_gas", "meaning", "heat the gas carries off: warming the dry inlet gas plus evaporation");
  h5.write("/summary/heat_gas_sensible", q.gas_sensible_w, "W");
  h5.write("/summary/heat_gas_latent", q.gas_latent_w, "W");
  h5.write("/summary/water_evaporation", q.water_evaporation_kg_s, "kg/s");
  h5.write("/summary/cooling_required", q.required_w, "W");
  h5.attribute("/summary/cooling_required", "meaning",
               "metabolic + agitation + gas expansion - heat_gas; negative: the broth needs heating");
  if (q.available_w) h5.write("/summary/cooling_available", *q.available_w, "W");
  if (q.margin) h5.write("/summary/cooling_margin", *q.margin, "1");
  if (q.max_our_mol_m3_s) h5.write("/summary/max_our_heat", *q.max_our_mol_m3_s, "mol/(m3 s)");
  if (q.max_biomass_kg_m3) {
    h5.write("/summary/max_biomass_heat", *q.max_biomass_kg_m3, "kg/m3");
    h5.attribute("/summary/max_biomass_heat", "meaning", "largest biomass the cooling holds, every cell at q_O2,max");
  }
  h5.write("/summary/culture_kind", to_string(c.culture.kind));
  h5.write("/fields/kolmogorov_length", s.kolmogorov_m, "m");
  h5.write("/fields/turbulent_stress", s.stress_pa, "Pa");
  h5.attribute("/fields/turbulent_stress", "meaning", "rho (eps nu)^(1/2), the stress of the Kolmogorov eddies");
  std::vector<double> mean, ratio, peak, eta, tau;
  for (const auto& i : s.impellers) {
    mean.push_back(i.epsilon_mean_w_kg);
    ratio.push_back(i.ratio);
    peak.push_back(i.epsilon_max_w_kg);
    eta.push_back(i.kolmogorov_min_m);
    tau.push_back(i.stress_max_pa);
  }
  h5.write("/impellers/dissipation_mean", mean, "W/kg");
  h5.attribute("/impellers/dissipation_mean", "meaning", "gassed power over the liquid of the impeller's domain");
  h5.write("/impellers/dissipation_ratio", ratio, "1");
  h5.write("/impellers/dissipation_max", peak, "W/kg");
  h5.attribute("/impellers/dissipation_max", "meaning", "largest dissipation in the discharge: ratio x mean");
  h5.write("/impellers/kolmogorov_length_min", eta, "m");
  h5.write("/impellers/turbulent_stress_max", tau, "Pa");
  h5.write("/summary/dissipation_max", s.epsilon_max_w_kg, "W/kg");
  h5.write("/summary/kolmogorov_length_min", s.kolmogorov_min_m, "m");
  h5.write("/summary/turbulent_stress_max", s.stress_max_pa, "Pa");
  h5.write("/summary/supply_pressure", k.supply_pressure_pa, "Pa");
  h5.attribute("/summary/supply_pressure", "meaning", "compressor outlet: sparger pressure + supply pressure drop (absolute)");
  h5.write("/summary/compressor_power", k.compressor_w, "W");
  h5.attribute("/summary/compressor_power", "meaning", "drawn: adiabatic power / compressor_efficiency");
  h5.write("/summary/compressor_power_isothermal", k.compressor_isothermal_w, "W");
  h5.write("/summary/compressor_power_adiabatic", k.compressor_adiabatic_w, "W");
  h5.write("/summary/agitator_power", k.agitator_w, "W");
  h5.attribute("/summary/agitator_power", "meaning", "drawn: gassed shaft power / drive_efficiency");
  h5.write("/summary/total_power", k.total_power_w, "W");
  h5.write("/summary/oxygen_purchased", k.oxygen_purchased_mol_s * physics::molar_mass_o2, "kg/s");
  if (!k.total_per_h) return;
  const std::string& cur = c.prices.currency;
  for (const auto& [name, value] : {std::pair{"operating_cost", *k.total_per_h}, std::pair{"electricity_cost", *k.electricity_per_h},
                                    std::pair{"oxygen_cost", *k.oxygen_per_h}}) {
    const std::string path = std::string("/summary/") + name;
    h5.write(path, value, cur + "/h");
    h5.attribute(path, "currency", cur);
  }
  if (k.per_kg_o2) {
    h5.write("/summary/cost_per_kg_o2", *k.per_kg_o2, cur + "/kg");
    h5.attribute("/summary/cost_per_kg_o2", "currency", cur);
  }
}

std::string limits_summary(const Case& c, const CaseRun& run) {
  const auto& q = run.limits.heat;
  const auto& s = run.limits.shear;
  const auto& k = run.limits.cost;
  const auto& u = c.utilities;
  std::string t = "Heat              (cooling duty = heat into the broth - heat the gas carries off)\n";
  t += fmt::format("  into the broth metabolism {:.4g} kW ({:.0f} kJ/mol O2), agitation {:.4g} kW, gas expansion {:.4g} kW\n",
                   kKw * q.metabolic_w, c.culture.heat_yield_j_mol / 1e3, kKw * q.agitation_w, kKw * q.gas_expansion_w);
  t += fmt::format("  gas carries    {:.4g} kW: warming from {} {:.3g} kW, evaporation {:.4g} kW ({:.3g} kg/h of water)\n",
                   kKw * q.heat_gas_w(), degc(u.gas_temperature_k), kKw * q.gas_sensible_w, kKw * q.gas_latent_w,
                   3600.0 * q.water_evaporation_kg_s);
  if (q.available_w) {
    t += fmt::format("  cooling        required {:.4g} kW, available {:.4g} kW ({}){}\n", kKw * q.required_w,
                     kKw * *q.available_w, cooling_source(c.cooling),
                     q.margin ? fmt::format(", margin {:+.0f} %", 100.0 * *q.margin) : "");
  } else {
    t += fmt::format("  cooling        required {:.4g} kW (no [cooling] table to compare with)\n", kKw * q.required_w);
  }
  if (q.max_our_mol_m3_s) {
    t += fmt::format("  cooling holds  OUR up to {:.4g} mmol/(L h)", 3600.0 * *q.max_our_mol_m3_s);
    if (q.max_biomass_kg_m3) {
      t += fmt::format(", biomass {:.4g} g/L at q_O2,max (oxygen: {:.4g} g/L)", *q.max_biomass_kg_m3, run.max_biomass_kg_m3);
    }
    t += "\n";
  }
  t += fmt::format("Shear             ({} culture)\n", to_string(c.culture.kind));
  const double rho = c.broth.density_kg_m3;
  if (s.worst_impeller >= 0) {
    const auto& w = s.impellers[s.worst_impeller];
    const std::string why = w.from_zones ? fmt::format("its swept zones; {:.3g} x its mean would be {:.3g} W/kg", w.ratio,
                                                       w.ratio * w.epsilon_mean_w_kg)
                                         : fmt::format("{:.3g} x its mean {:.3g} W/kg; zones up to {:.3g} W/kg", w.ratio,
                                                       w.epsilon_mean_w_kg, s.zone_epsilon_max_w_kg);
    t += fmt::format("  dissipation    largest {:.3g} W/kg ({:.3g} W/m3) in the discharge of impeller {} ({})\n",
                     s.epsilon_max_w_kg, rho * s.epsilon_max_w_kg, s.worst_impeller, why);
  } else {
    t += fmt::format("  dissipation    largest {:.3g} W/kg ({:.3g} W/m3), in a zone\n", s.epsilon_max_w_kg, rho * s.epsilon_max_w_kg);
  }
  double eta_max = 0.0;
  for (double e : s.kolmogorov_m) eta_max = std::isfinite(e) ? std::max(eta_max, e) : eta_max;
  // Beyond a centimetre the zone is barely stirred (a stagnant broth's runs to kilometres): no
  // eddy scale to speak of, so no number.
  constexpr double kBarelyStirred_m = 0.01;
  const std::string largest = eta_max > kBarelyStirred_m ? std::string("over 10000 um where the broth is barely stirred")
                                                         : fmt::format("{:.0f} um", 1e6 * eta_max);
  t += fmt::format("  eddies         Kolmogorov length from {:.0f} um (smallest anywhere) to {}; stress up to {:.3g} Pa\n",
                   1e6 * s.kolmogorov_min_m, largest, s.stress_max_pa);
  if (c.culture.kind == CultureKind::cell) {
    t += fmt::format("  cells          {:.2g} x the {:.0e} W/m3 where lethal effects on CHO cells begin (Walls et al. "
                     "2017); cells on microcarriers were damaged with eddies below 1/2-2/3 of the bead diameter "
                     "(Croughan et al. 1987, from memory)\n",
                     rho * s.epsilon_max_w_kg / cho_lethal_dissipation_low_w_m3, cho_lethal_dissipation_low_w_m3);
  }
  std::string limit;
  const auto near = zones_near_shear_limit(c, run, &limit);
  if (!limit.empty()) {
    t += fmt::format("  near the limit {}{} zone{} within a factor 2 in dissipation of {}", near.size() == 8 ? "at least " : "",
                     near.size(), near.size() == 1 ? "" : "s", limit);
    for (size_t i = 0; i < std::min<size_t>(near.size(), 3); ++i) {
      const int z = near[i];
      t += fmt::format("{} zone {} (r {:.2f} m, z {:.2f} m) {:.3g} W/kg", i == 0 ? ":" : ",", z, run.net.r[z], run.net.z[z],
                       run.hydro.epsilon[z]);
    }
    t += "\n";
  }
  t += "Power and cost\n";
  t += fmt::format("  drawn          agitator {:.4g} kW (shaft {:.4g} kW / {:.2f}), compressor {:.4g} kW, total {:.4g} kW\n",
                   kKw * k.agitator_w, kKw * run.hydro.power_gassed_w, u.drive_efficiency, kKw * k.compressor_w,
                   kKw * k.total_power_w);
  if (k.air_mol_s > 0.0) {
    t += fmt::format("  compressor     air from 1 atm, {} to {} (sparger + {:.3g} bar supply drop): adiabatic {:.4g} kW / "
                     "{:.2f}; isothermal least {:.4g} kW\n",
                     degc(u.ambient_temperature_k), units::format(units::Dimension::pressure, k.supply_pressure_pa),
                     u.supply_pressure_drop_pa / 1e5, kKw * k.compressor_adiabatic_w, u.compressor_efficiency,
                     kKw * k.compressor_isothermal_w);
  }
  if (k.oxygen_purchased_mol_s > 0.0) {
    t += fmt::format("  oxygen bought  {:.4g} kg/h of pure O2 blended into the air\n",
                     3600.0 * k.oxygen_purchased_mol_s * physics::molar_mass_o2);
  }
  if (k.total_per_h) {
    const std::string& cur = c.prices.currency;
    t += fmt::format("  cost           {:.4g} {}/h: electricity {:.4g}, oxygen {:.4g}", *k.total_per_h, cur,
                     *k.electricity_per_h, *k.oxygen_per_h);
    if (k.per_kg_o2) t += fmt::format("; {:.3g} {}/kg O2 transferred", *k.per_kg_o2, cur);
    t += " (cooling water not priced)\n";
  }
  return t;
}

std::vector<CellArray> limits_cell_arrays(const CaseRun& run) {
  std::vector<double> um(run.limits.shear.kolmogorov_m.size());
  for (size_t k = 0; k < um.size(); ++k) um[k] = 1e6 * run.limits.shear.kolmogorov_m[k];
  return {{"kolmogorov_length_um", um, {}}, {"turbulent_stress", run.limits.shear.stress_pa, {}}};
}

std::string limits_report_html(const Case& c, const CaseRun& run, const std::vector<svg::Outline>& outlines) {
  const auto& q = run.limits.heat;
  const auto& s = run.limits.shear;
  const auto& k = run.limits.cost;
  std::string h = "<h3>Heat, shear and cost</h3>\n<div class=\"row\">\n";
  std::vector<Row> heat{{"metabolism (" + num(c.culture.heat_yield_j_mol / 1e3) + " kJ/mol O2)", num(kKw * q.metabolic_w), "kW"},
                        {"agitation (gassed shaft power)", num(kKw * q.agitation_w), "kW"},
                        {"gas expansion", num(kKw * q.gas_expansion_w), "kW"},
                        {"carried off by the gas", num(kKw * q.heat_gas_w()), "kW"},
                        {"water evaporated", num(3600.0 * q.water_evaporation_kg_s), "kg/h"},
                        {"cooling required", num(kKw * q.required_w), "kW"}};
  if (q.available_w) heat.push_back({"cooling available", num(kKw * *q.available_w), "kW"});
  if (q.margin) heat.push_back({"margin", num(100.0 * *q.margin), "%"});
  if (q.max_our_mol_m3_s) heat.push_back({"largest OUR the cooling holds", num(3600.0 * *q.max_our_mol_m3_s), "mmol/(L h)"});
  if (q.max_biomass_kg_m3) heat.push_back({"largest biomass (cooling)", num(*q.max_biomass_kg_m3), "g/L"});
  if (run.max_biomass_kg_m3 > 0.0) heat.push_back({"largest biomass (oxygen)", num(run.max_biomass_kg_m3), "g/L"});
  h += table("Heat balance", heat);
  std::vector<Row> shear;
  for (size_t i = 0; i < s.impellers.size(); ++i) {
    const auto& m = s.impellers[i];
    const std::string how = m.from_zones ? "its swept zones" : fmt::format("{:.3g} x mean", m.ratio);
    shear.push_back({fmt::format("impeller {}: max dissipation ({})", i, how), num(m.epsilon_max_w_kg), "W/kg"});
    shear.push_back({fmt::format("impeller {}: smallest eddies", i), num(1e6 * m.kolmogorov_min_m), "um"});
  }
  shear.push_back({"largest zone-mean dissipation", num(s.zone_epsilon_max_w_kg), "W/kg"});
  shear.push_back({"largest Kolmogorov-eddy stress", num(s.stress_max_pa), "Pa"});
  h += table("Shear (" + to_string(c.culture.kind) + " culture)", shear);
  std::vector<Row> cost{{"agitator (drawn)", num(kKw * k.agitator_w), "kW"},
                        {"compressor (drawn)", num(kKw * k.compressor_w), "kW"},
                        {"compressor, isothermal least", num(kKw * k.compressor_isothermal_w), "kW"},
                        {"compressor outlet", num(k.supply_pressure_pa / 1e5), "bar(a)"},
                        {"total power", num(kKw * k.total_power_w), "kW"}};
  if (k.oxygen_purchased_mol_s > 0.0) {
    cost.push_back({"pure O2 bought", num(3600.0 * k.oxygen_purchased_mol_s * physics::molar_mass_o2), "kg/h"});
  }
  if (k.total_per_h) {
    const std::string& cur = c.prices.currency;
    cost.push_back({"operating cost", num(*k.total_per_h), cur + "/h"});
    if (k.per_kg_o2) cost.push_back({"per kg O2 transferred", num(*k.per_kg_o2), cur + "/kg"});
  }
  h += table("Power and cost", cost);
  std::string limit;
  const auto near = zones_near_shear_limit(c, run, &limit);
  if (!limit.empty()) {
    std::vector<Row> rows;
    for (int z : near) {
      rows.push_back({fmt::format("zone {} at r {:.2f} m, z {:.2f} m", z, run.net.r[z], run.net.z[z]),
                      num(run.hydro.epsilon[z]), "W/kg"});
    }
    if (rows.empty()) rows.push_back({"none", "", ""});
    h += table(fmt::format("Zones within a factor 2 in dissipation of the shear limits ({})", limit), rows);
  }
  h += "</div>\n<div class=\"row\">\n";
  std::vector<double> um(s.kolmogorov_m.size());
  for (size_t z = 0; z < um.size(); ++z) um[z] = 1e6 * s.kolmogorov_m[z];
  h += svg::zone_map(run.net, um, "Kolmogorov length in the (r, z) section", "um", outlines);
  return h + "</div>\n";
}

}  // namespace oxystrat
