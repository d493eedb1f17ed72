#include "postproc/report/verdict_output.hpp"

#include <fmt/format.h>

#include "physics/solubility.hpp"
#include "postproc/report/svg_plot.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

// Actual volume flow of the wet gas at the sparger's pressure and the broth temperature [m3/s].
double sparger_actual_flow(const Case& c) {
  const double t = c.vessel.temperature_k;
  const double p = c.vessel.head_pressure_pa + c.broth.density_kg_m3 * kG * (c.vessel.liquid_height_m - c.sparger.elevation_m);
  return c.operation.gas_flow_normal_m3_s / normal_molar_volume * kR * t / (p - physics::water_vapour_pressure(t));
}

std::string impellers_text(const Case& c) {
  std::string s;
  for (const auto& i : c.impellers) {
    s += fmt::format("{}{} D {:.3g} m at {:.3g} m", s.empty() ? "" : ", ", to_string(i.type), i.diameter_m, i.elevation_m);
  }
  return s;
}

}  // namespace

std::string cell_culture_text(const Culture& k) {
  // A cell culture is counted in cells/mL and its uptake per cell; only the cell's dry mass links
  // them to the biomass the model uses, so without it there is nothing to show.
  if (k.kind != CultureKind::cell || k.cell_dry_mass_kg <= 0.0) return "";
  const double cells_per_ml = k.biomass_kg_m3 / k.cell_dry_mass_kg * 1e-6;          // 1/m3 -> 1/mL
  const double pmol_cell_h = k.q_o2_max_mol_kg_s * k.cell_dry_mass_kg * 3600.0 * 1e12;  // mol/(cell s) -> pmol/cell/h
  return fmt::format("  cells {:.3g} cells/mL at {:.3g} pg dry mass each; q_O2,max {:.3g} pmol/cell/h ({:.3g} pmol/cell/day)\n",
                     cells_per_ml, k.cell_dry_mass_kg * 1e15, pmol_cell_h, 24.0 * pmol_cell_h);
}

std::string operating_point_text(const Case& c) {
  const auto& o = c.operation;
  const double vvm = 60.0 * o.gas_flow_normal_m3_s / c.vessel.working_volume_m3;
  std::string s = fmt::format("  speed {:.4g} rpm; gas {:.3g} vvm = {:.4g} Nm3/h", 60.0 * o.speed_rps, vvm, 3600.0 * o.gas_flow_normal_m3_s);
  if (c.has_sparger) s += fmt::format(" = {:.4g} m3/h actual at the sparger", 3600.0 * sparger_actual_flow(c));
  s += fmt::format("; O2 {:.3g} %; head pressure {:.4g} bar(a)\n", 100.0 * o.oxygen_fraction, c.vessel.head_pressure_pa / 1e5);
  s += fmt::format("  {:.3g} m3 in a {:.3g} m vessel, H/T {:.3g}; impellers (bottom up): {}\n", c.vessel.working_volume_m3,
                   c.vessel.diameter_m, c.vessel.liquid_height_m / c.vessel.diameter_m, impellers_text(c));
  s += fmt::format("  biomass {:.3g} g/L at q_O2,max {:.3g} mmol/(g h): uptake up to {:.3g} mmol/(L h)\n", c.culture.biomass_kg_m3,
                   3600.0 * c.culture.q_o2_max_mol_kg_s, 3600.0 * c.culture.biomass_kg_m3 * c.culture.q_o2_max_mol_kg_s);
  return s + cell_culture_text(c.culture);
}

std::string verdict_text(const Case& c, const Verdict& v) {
  std::string s = "Verdict  " + v.headline + "\n";
  s += "  " + v.advice + "\n";
  s += "Operating point\n" + operating_point_text(c);
  s += "Constraints\n";
  for (const auto& k : v.checks) s += fmt::format("  [{}] {}: {}\n", k.satisfied ? "ok  " : "FAIL", k.name, k.detail);
  return s;
}

std::string verdict_box_html(bool ok, const std::string& headline, const std::string& detail) {
  return fmt::format("<div class=\"verdict\" style=\"border-left:6px solid {};padding:4px 12px;margin:8px 0;background:#f7f7f7\">"
                     "<p style=\"font-size:17px;margin:6px 0\"><b>{}</b></p>{}</div>\n",
                     ok ? "#2ca02c" : "#d62728", svg::escape(headline),
                     detail.empty() ? "" : "<p>" + svg::escape(detail) + "</p>");
}

std::string verdict_html(const Case& c, const Verdict& v) {
  using svg::escape;
  std::string s = verdict_box_html(v.meets, v.headline, v.advice);
  s += "<h3>Operating point</h3>\n<pre>" + escape(operating_point_text(c)) + "</pre>\n";
  s += "<h3>Constraints</h3>\n<table><tr><th>constraint</th><th>status</th><th>detail</th></tr>\n";
  for (const auto& k : v.checks) {
    s += fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td></tr>\n", escape(k.name), k.satisfied ? "met" : "<b>FAILS</b>",
                     escape(k.detail));
  }
  return s + "</table>\n";
}

void write_verdict_h5(H5Writer& h5, const Verdict& v) {
  h5.write("/verdict/meets", std::vector<int>{v.meets ? 1 : 0}, "1");
  h5.attribute("/verdict/meets", "meaning", "1: every constraint holds (the case's [constraints], DO floor included)");
  h5.write("/verdict/headline", v.headline);
  if (!v.binding.empty()) h5.write("/verdict/binding", v.binding);
  if (!v.advice.empty()) h5.write("/verdict/advice", v.advice);
  h5.write("/verdict/do_floor", v.do_floor_mol_m3, "mol/m3");
  h5.write("/verdict/starved_volume_fraction", v.starved.volume_fraction, "1");
  if (v.starved.volume_fraction > 0.0) {
    h5.write("/verdict/starved_where", v.starved.where);
    h5.write("/verdict/starved_height_range", std::vector<double>{v.starved.z_lo, v.starved.z_hi}, "m");
    h5.write("/verdict/starved_radius_range", std::vector<double>{v.starved.r_lo, v.starved.r_hi}, "m");
  }
  std::vector<std::string> names, details;
  std::vector<int> ok;
  for (const auto& k : v.checks) names.push_back(k.name), details.push_back(k.detail), ok.push_back(k.satisfied);
  if (names.empty()) return;
  h5.write("/verdict/constraints/name", names);
  h5.write("/verdict/constraints/satisfied", ok, "1");
  h5.write("/verdict/constraints/detail", details);
}

}  // namespace oxystrat
