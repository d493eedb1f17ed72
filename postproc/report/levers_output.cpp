#include "postproc/report/levers_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>

#include "input/errors.hpp"
#include "postproc/report/number_format.hpp"
#include "postproc/report/svg_plot.hpp"
#include "postproc/report/verdict_output.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

std::string status(const LeverResult& r) {
  if (r.already) return "meets already";
  return r.found ? "meets" : "does not meet";
}

std::string value_text(const LeverResult& r) {
  if (r.unit.empty()) return r.found ? "swap" : "-";
  return fmt::format("{:.4g} -> {:.4g} {}", r.current, r.value, r.unit);
}

std::string change_text(const LeverResult& r) {
  if (r.unit.empty() || r.current == 0.0) return "";
  return fmt::format("{:+.0f} %", 100.0 * (r.value / r.current - 1.0));
}

std::string safety(const LeverResult& r, const LeverEffects& base) {
  std::vector<std::string> w;
  const auto& e = r.effects;
  // Enrichment is flagged where the lever raises the O2 above air and above the case's own.
  if (e.oxygen_fraction > 0.2146 && e.oxygen_fraction > base.oxygen_fraction + 1e-9) {
    w.push_back(fmt::format("O2-enriched gas ({:.0f} % O2): oxygen service", 100.0 * e.oxygen_fraction));
  }
  if (e.flooded_impellers > base.flooded_impellers) w.push_back(fmt::format("{} impeller(s) flooded", e.flooded_impellers));
  if (e.pco2_max_pa > 150.0 * kMmHgPa) w.push_back(fmt::format("pCO2 {:.0f} mmHg", e.pco2_max_pa / kMmHgPa));
  if (e.head_pressure_pa > base.head_pressure_pa) w.push_back(fmt::format("vessel at {:.2f} bar(a)", e.head_pressure_pa / 1e5));
  if (e.cooling_margin && *e.cooling_margin < 0.0) w.push_back("cooling too small");
  std::string s;
  for (const auto& x : w) s += (s.empty() ? "" : "; ") + x;
  return s;
}

std::string watch_and_note(const LeverResult& r, const LeverEffects& base) {
  const auto w = safety(r, base);
  return w.empty() ? r.note : r.note.empty() ? w : w + "; " + r.note;
}

// First in the report: does any single lever fix the case, and which costs least power.
std::string levers_verdict_html(const LeversStudy& s) {
  if (s.base.feasible) {
    return verdict_box_html(true, "The case meets its constraints as it is; nothing needs to move.",
                            "The table shows each lever at the case's own value, for reference.");
  }
  std::vector<const LeverResult*> fixes;
  for (const auto& r : s.levers) {
    if (r.found) fixes.push_back(&r);
  }
  if (fixes.empty()) {
    return verdict_box_html(false, fmt::format("No single lever fixes the case within its limits (of {} tried).", s.levers.size()),
                            "Combine levers (a sweep over two of them), or change the equipment.");
  }
  const auto& best = *fixes.front();  // ranked: feasible first, least drawn power (or cost) first
  std::string each;
  for (const auto* r : fixes) {
    const double more_o2_kg_s = added_oxygen_kg_s(*r, s);
    each += fmt::format("{}{} {} ({}, drawn power {} kW{})", each.empty() ? "Each alone: " : "; ", r->name, value_text(*r),
                        change_text(*r), report::format_number(r->effects.total_power_w / 1e3),
                        more_o2_kg_s > 0.0 ? fmt::format(", plus {} t/day of pure O2", report::format_number(more_o2_kg_s * 86.4)) : "");
  }
  return verdict_box_html(false,
                          fmt::format("{} of {} levers fix the case alone; least drawn power: {} {}.", fixes.size(),
                                      s.levers.size(), best.name, value_text(best)),
                          each + ". The table below gives their side effects.");
}

}  // namespace

std::string levers_text(const Case& c, const LeversStudy& s) {
  const bool priced = s.base.cost_per_h.has_value();
  std::string t = fmt::format("Levers for {} (each moved alone towards its limit; smallest change that meets [constraints])\n",
                              c.title);
  t += fmt::format("  now: DO min {:.4f} mmol/L, {:.1f} % of the volume below the floor, Pg {:.3g} kW, {}\n",
                   s.base.do_min_mol_m3, 100.0 * s.base.volume_fraction_below_critical, s.base.power_gassed_w / 1e3,
                   s.base.feasible ? "meets its constraints" : "does NOT meet its constraints");
  t += fmt::format("  {:<14} {:<14} {:<28} {:>7} {:>9} {:>9} {:>8} {:>9} {:>8} {:>9}{}\n", "lever", "result", "value",
                   "change", "Pg [kW]", "drawn", "P/V", "tip [m/s]", "eps max", "pCO2", priced ? "      cost" : "");
  t += fmt::format("  {:<14} {:<14} {:<28} {:>7} {:>9} {:>9} {:>8} {:>9} {:>8} {:>9}{}\n", "", "", "", "", "", "[kW]",
                   "[kW/m3]", "", "[W/kg]", "[mmHg]", priced ? fmt::format(" {:>9}", "[" + c.prices.currency + "/h]") : "");
  for (const auto& r : s.levers) {
    const auto& e = r.effects;
    t += fmt::format("  {:<14} {:<14} {:<28} {:>7} {:>9.4g} {:>9.4g} {:>8.3g} {:>9.3g} {:>8.3g} {:>9.0f}{}\n", r.name,
                     status(r), value_text(r), change_text(r), e.power_gassed_w / 1e3, e.total_power_w / 1e3,
                     e.power_per_volume_w_m3 / 1e3, e.tip_speed_m_s, e.epsilon_max_w_kg, e.pco2_max_pa / kMmHgPa,
                     priced && e.cost_per_h ? fmt::format(" {:>9.4g}", *e.cost_per_h) : "");
    const auto warn = safety(r, s.base);
    if (!warn.empty()) t += "      watch: " + warn + "\n";
    if (added_oxygen_kg_s(r, s) > 0.0) {
      t += fmt::format("      buys: {:.3g} t/day more pure O2 (not in the drawn power)\n", added_oxygen_kg_s(r, s) * 86.4);
    }
    if (!r.note.empty()) t += "      " + r.note + "\n";
    if (!r.found && !r.limit_reason.empty()) t += "      limit: " + r.limit_reason + "\n";
  }
  return t;
}

void write_levers_csv(const std::string& path, const LeversStudy& s) {
  std::ofstream out(path, std::ios::binary);
  out << "lever,key,result,unit,current,limit,value,power_gassed [kW],power_per_volume [kW/m3],tip_speed [m/s],"
         "flooded_impellers,dissipation_max [W/kg],pco2_max [mmHg],head_pressure [bar(a)],oxygen_fraction [%],"
         "do_min [mmol/L],volume_fraction_below_critical [%],kla_mean [1/h],note\n";
  for (const auto& r : s.levers) {
    const auto& e = r.effects;
    std::string note = r.note;
    for (auto& ch : note) {
      if (ch == ',' || ch == '\n') ch = ';';
    }
    out << fmt::format("{},{},{},{},{:.10g},{:.10g},{:.10g},{:.6g},{:.6g},{:.6g},{},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{}\n",
                       r.name, r.key, status(r), r.unit, r.current, r.limit, r.value, e.power_gassed_w / 1e3,
                       e.power_per_volume_w_m3 / 1e3, e.tip_speed_m_s, e.flooded_impellers, e.epsilon_max_w_kg,
                       e.pco2_max_pa / kMmHgPa, e.head_pressure_pa / 1e5, 100.0 * e.oxygen_fraction, e.do_min_mol_m3,
                       100.0 * e.volume_fraction_below_critical, 3600.0 * e.kla_mean_1_s, note);
  }
  finish_file(out, path);
}

void write_levers_h5(H5Writer& h5, const LeversStudy& s) {
  std::vector<std::string> names, keys, notes, units;
  std::vector<int> found, already, flooded;
  std::vector<double> current, limit, value, pg, pv, tip, eps, pco2, head, o2, gas, dmin, below, kla;
  for (const auto& r : s.levers) {
    const auto& e = r.effects;
    names.push_back(r.name), keys.push_back(r.key), notes.push_back(r.note);
    units.push_back(r.si_unit.empty() ? "1" : r.si_unit);
    found.push_back(r.found), already.push_back(r.already), flooded.push_back(e.flooded_impellers);
    // Files hold SI: the lever's own unit (rpm, vvm, bar(a), %) stays in the CSV and the text.
    current.push_back(r.current * r.si_per_unit), limit.push_back(r.limit * r.si_per_unit);
    value.push_back(r.value * r.si_per_unit);
    pg.push_back(e.power_gassed_w), pv.push_back(e.power_per_volume_w_m3), tip.push_back(e.tip_speed_m_s);
    eps.push_back(e.epsilon_max_w_kg), pco2.push_back(e.pco2_max_pa), head.push_back(e.head_pressure_pa);
    o2.push_back(e.oxygen_fraction), gas.push_back(e.gas_flow_normal_m3_s), dmin.push_back(e.do_min_mol_m3);
    below.push_back(e.volume_fraction_below_critical), kla.push_back(e.kla_mean_1_s);
  }
  h5.write("/levers/name", names);
  h5.write("/levers/key", keys);
  h5.write("/levers/note", notes);
  h5.write("/levers/value_unit", units);
  h5.attribute("/levers/value_unit", "meaning", "SI unit of current, limit and value of each lever (gas flow: normal m3/s)");
  h5.write("/levers/meets", found, "1");
  h5.write("/levers/meets_already", already, "1");
  h5.write("/levers/current", current, "see /levers/value_unit");
  h5.write("/levers/limit", limit, "see /levers/value_unit");
  h5.write("/levers/value", value, "see /levers/value_unit");
  h5.write("/levers/power_gassed", pg, "W");
  std::vector<double> drawn;
  for (const auto& r : s.levers) drawn.push_back(r.effects.total_power_w);
  h5.write("/levers/total_power", drawn, "W");
  h5.attribute("/levers/total_power", "meaning", "drawn: agitator drive + compressor");
  std::vector<double> bought;
  for (const auto& r : s.levers) bought.push_back(r.effects.oxygen_purchased_kg_s);
  h5.write("/levers/oxygen_purchased", bought, "kg/s");
  h5.attribute("/levers/oxygen_purchased", "meaning", "pure O2 blended into the inlet gas (not in total_power)");
  h5.write("/levers/power_per_volume", pv, "W/m3");
  h5.write("/levers/tip_speed", tip, "m/s");
  h5.write("/levers/flooded_impellers", flooded, "1");
  h5.write("/levers/dissipation_max", eps, "W/kg");  // the name of /summary (format 2.0)
  h5.write("/levers/pco2_max", pco2, "Pa");
  h5.write("/levers/head_pressure", head, "Pa");
  h5.write("/levers/oxygen_fraction", o2, "1");
  h5.write("/levers/gas_flow_normal", gas, "m3/s");
  h5.write("/levers/do_min", dmin, "mol/m3");
  h5.write("/levers/volume_fraction_below_critical", below, "1");
  h5.write("/levers/kla_mean", kla, "1/s");
  h5.write("/levers/base_do_min", s.base.do_min_mol_m3, "mol/m3");
  h5.write("/levers/base_power_gassed", s.base.power_gassed_w, "W");
}

std::string levers_report_body(const Case& c, const LeversStudy& s) {
  using svg::escape;
  // One P/V unit for the column, W/m3 for a gently stirred cell culture.
  double pv_largest = 0.0;
  for (const auto& r : s.levers) pv_largest = std::max(pv_largest, r.effects.power_per_volume_w_m3);
  const auto pv_unit = report::adapt_unit("W/m3", pv_largest);
  std::string b = levers_verdict_html(s) + "<h2>Levers: what fixes the oxygen supply, and what it costs</h2>\n<p>" +
                  escape(s.base.feasible ? "The case meets its constraints as it is; the table shows each lever at the "
                                           "case's own value."
                                         : "The case does not meet its constraints. Each lever was moved alone, from the "
                                           "case's value towards its limit, to the smallest value that meets them.") +
                  "</p>\n<table><tr><th>lever</th><th>result</th><th>value</th><th>change</th><th>Pg [kW]</th><th>drawn [kW]</th>"
                  "<th>P/V [" + pv_unit.unit + "]</th><th>tip speed [m/s]</th><th>&epsilon; max [W/kg]</th><th>pCO2 max [mmHg]</th>"
                  "<th>DO min [mmol/L]</th><th>watch</th></tr>\n";
  std::vector<std::string> cats;
  std::vector<double> pg, dmin;
  for (const auto& r : s.levers) {
    const auto& e = r.effects;
    using report::format_number;
    b += fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td>"
                     "<td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td>"
                     "<td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td></tr>\n",
                     escape(r.name), escape(status(r)), escape(value_text(r)), escape(change_text(r)),
                     format_number(e.power_gassed_w / 1e3), format_number(e.total_power_w / 1e3), format_number(e.power_per_volume_w_m3 * pv_unit.factor),
                     format_number(e.tip_speed_m_s, 3), format_number(e.epsilon_max_w_kg, 3),
                     format_number(e.pco2_max_pa / kMmHgPa, 3), format_number(e.do_min_mol_m3), escape(watch_and_note(r, s.base)));
    cats.push_back(r.name);
    pg.push_back(e.power_gassed_w / 1e3);
    dmin.push_back(e.do_min_mol_m3);
  }
  b += "</table>\n<div class=\"row\">";
  b += svg::bar_chart("Gassed power at each lever's value", "Pg [kW]", cats, {"gassed power"}, {pg});
  b += svg::bar_chart("DO min at each lever's value", "DO min [mmol/L]", cats, {"DO min"}, {dmin});
  b += "</div>\n<p>Floor: " + escape(fmt::format("{:.4f} mmol/L", c.constraints.min_do_mol_m3.value_or(c.culture.critical_do_mol_m3))) +
       ". Defer to local codes, the vessel's certification and licensed practice for pressure and oxygen service.</p>\n";
  return b;
}

}  // namespace oxystrat
