#include "solver/oxygen/design_limits.hpp"

#include <fmt/format.h>

namespace oxystrat {

DesignLimits design_limits(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h, const OxygenField* field) {
  DesignLimits d;
  HeatInputs in;
  in.power_gassed_w = h.power_gassed_w;
  in.inlet_gas_mol_s = h.gas_molar_flow_mol_s;
  if (field != nullptr) {
    in.our_mol_s = field->our_total_mol_s;
    in.otr_mol_s = field->otr_total_mol_s;
    in.cer_mol_s = c.culture.rq * field->our_total_mol_s;  // steady: the CO2 made leaves with the gas
  }
  d.heat = heat_balance(c, in);
  d.shear = shear_field(c, net, h);
  d.cost = operating_cost(c, h.power_gassed_w, h.gas_molar_flow_mol_s, in.otr_mol_s);
  return d;
}

std::vector<std::string> limit_cautions(const Case& c, const DesignLimits& d, double oxygen_max_biomass_kg_m3) {
  std::vector<std::string> out;
  const auto& q = d.heat;
  if (q.available_w) {
    const double kw = 1e-3;
    if (q.required_w > *q.available_w) {
      std::string s = fmt::format("COOLING: the heat duty {:.4g} kW is more than the cooling removes, {:.4g} kW: the "
                                  "broth would warm above {:.1f} degC",
                                  kw * q.required_w, kw * *q.available_w, c.vessel.temperature_k - 273.15);
      if (q.max_our_mol_m3_s) s += fmt::format("; the cooling holds an uptake of at most {:.4g} mmol/(L h)", 3600 * *q.max_our_mol_m3_s);
      if (q.max_biomass_kg_m3) s += fmt::format(" ({:.3g} g/L at q_O2,max)", *q.max_biomass_kg_m3);
      out.push_back(s + ". Lower the uptake or the power, or add cooling.");
    } else if (q.margin && *q.margin < 0.1) {
      out.push_back(fmt::format("cooling: only {:.0f} % margin over the duty of {:.4g} kW; fouling, a warmer coolant "
                                "supply or a lower coolant flow take margins of this size (10-20 % is common design "
                                "practice).",
                                100 * *q.margin, kw * q.required_w));
    }
    if (q.max_biomass_kg_m3 && oxygen_max_biomass_kg_m3 > 0.0 && *q.max_biomass_kg_m3 < oxygen_max_biomass_kg_m3) {
      out.push_back(fmt::format("heat limits before oxygen: the cooling supports {:.3g} g/L, the oxygen transfer {:.3g} "
                                "g/L (every zone above critical DO).",
                                *q.max_biomass_kg_m3, oxygen_max_biomass_kg_m3));
    }
  }
  if (c.culture.kind != CultureKind::cell) return out;
  const auto& s = d.shear;
  const double rho = c.broth.density_kg_m3;
  if (c.operation.gas_flow_normal_m3_s > 0.0 || (c.control.enabled && c.control.gas_max_m3_s > 0.0)) {
    out.push_back(std::string("CELL CULTURE, bubbles: in sparged cell cultures most damage comes from bubbles bursting "
                              "at the surface, and from bubble formation at the sparger, more than from the impeller's "
                              "turbulence (Chisti 2000; Walls et al. 2017); the smaller the bubble, the more intense its "
                              "burst. The zone dissipation here does not include them") +
                  (c.has_sparger && c.sparger.type == SpargerType::porous
                       ? ", and a porous sparger's fine bubbles are the intense kind"
                       : "") +
                  ". A protective surfactant (poloxamer 188) is common practice; follow your validated process and "
                  "licensed practice.");
  }
  const double peak_w_m3 = rho * s.epsilon_max_w_kg;
  if (peak_w_m3 >= 0.1 * cho_lethal_dissipation_low_w_m3) {
    out.push_back(fmt::format("SHEAR: the largest dissipation, {:.3g} W/m3 ({:.3g} W/kg{}), is {} the {:.0e}-{:.0e} "
                              "W/m3 published as lethal to CHO cells (Walls et al. 2017, from earlier studies); "
                              "sub-lethal effects on growth and product are reported below it.",
                              peak_w_m3, s.epsilon_max_w_kg,
                              s.worst_impeller >= 0 ? fmt::format(", discharge of impeller {}", s.worst_impeller) : "",
                              peak_w_m3 >= cho_lethal_dissipation_high_w_m3  ? "ABOVE"
                              : peak_w_m3 >= cho_lethal_dissipation_low_w_m3 ? "WITHIN"
                                                                             : "within a factor 10 of",
                              cho_lethal_dissipation_low_w_m3, cho_lethal_dissipation_high_w_m3));
  }
  return out;
}

std::vector<std::string> limit_notes(const Case& c, const DesignLimits& d) {
  std::vector<std::string> out;
  if (!c.cooling.given) {
    out.push_back(fmt::format("no [cooling] table: the heat duty ({:.4g} kW) is not compared with a cooling capacity",
                              1e-3 * d.heat.required_w));
  }
  if (d.heat.required_w < 0.0) {
    out.push_back("the gas carries off more heat than the broth receives: it needs heating to hold its temperature");
  }
  if (!c.prices.given) out.push_back("no [prices] table: power and oxygen use are reported, not priced");
  return out;
}

}  // namespace oxystrat
