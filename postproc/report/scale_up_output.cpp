#include "postproc/report/scale_up_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <iterator>

#include "input/errors.hpp"
#include "postproc/report/number_format.hpp"
#include "postproc/report/svg_plot.hpp"
#include "postproc/report/verdict_output.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

struct Column {
  const char* head;
  const char* unit;
  double (*get)(const ScaleMetrics&);
};

const Column kColumns[] = {
    {"speed", "rpm", [](const ScaleMetrics& m) { return 60.0 * m.speed_rps; }},
    {"gas", "vvm", [](const ScaleMetrics& m) { return m.vvm; }},
    {"P/V", "kW/m3", [](const ScaleMetrics& m) { return m.power_per_volume_w_m3 / 1e3; }},
    {"tip", "m/s", [](const ScaleMetrics& m) { return m.tip_speed_m_s; }},
    {"kLa", "1/h", [](const ScaleMetrics& m) { return 3600.0 * m.kla_1_s; }},
    {"vs", "mm/s", [](const ScaleMetrics& m) { return 1e3 * m.superficial_gas_m_s; }},
    {"theta95", "s", [](const ScaleMetrics& m) { return m.theta95_s; }},
    {"DO min", "mmol/L", [](const ScaleMetrics& m) { return m.do_min_mol_m3; }},
    {"max X", "g/L", [](const ScaleMetrics& m) { return m.max_biomass_kg_m3; }},
    {"pCO2", "mmHg", [](const ScaleMetrics& m) { return m.effects.pco2_max_pa / kMmHgPa; }},
};

std::string verdict(const ScaleMetrics& m) {
  const size_t n = m.effects.cautions.size();
  return std::string(m.effects.feasible ? "meets" : "fails") +
         (n == 0 ? "" : fmt::format(" ({} caution{})", n, n == 1 ? "" : "s"));
}

// The cautions of the production points, each said once: those every point shares first, then
// each point's own. A criterion not reached has no point of its own (it is shown at the nearer
// end of the speeds tried), so it has no cautions here.
struct CautionGroup {
  std::string where;
  std::vector<std::string> cautions;
};

std::vector<CautionGroup> production_cautions(const ScaleUpStudy& s) {
  std::vector<const ScaleUpRow*> rows;
  for (const auto& r : s.rows) {
    if (r.reached) rows.push_back(&r);
  }
  const auto has = [](const ScaleUpRow* r, const std::string& w) {
    const auto& c = r->production.effects.cautions;
    return std::find(c.begin(), c.end(), w) != c.end();
  };
  std::vector<CautionGroup> groups{{"every production point", {}}};
  if (rows.size() > 1) {
    for (const auto& w : rows.front()->production.effects.cautions) {
      if (std::all_of(rows.begin(), rows.end(), [&](const ScaleUpRow* r) { return has(r, w); })) groups[0].cautions.push_back(w);
    }
  }
  const auto shared = groups[0].cautions;  // a copy: groups grows below
  for (const auto* r : rows) {
    CautionGroup g{r->criterion, {}};
    for (const auto& w : r->production.effects.cautions) {
      if (std::find(shared.begin(), shared.end(), w) == shared.end()) g.cautions.push_back(w);
    }
    groups.push_back(std::move(g));
  }
  std::erase_if(groups, [](const CautionGroup& g) { return g.cautions.empty(); });
  return groups;
}

std::string broken(const ScaleMetrics& m) {
  std::string s;
  for (const auto& c : m.effects.checks) {
    if (!c.satisfied) s += (s.empty() ? "" : "; ") + c.detail;
  }
  return s;
}

// A bar label for a criterion: "equal P/V (gassed), equal superficial gas velocity" -> "P/V + vs".
std::string short_criterion(const std::string& criterion) {
  if (criterion.rfind("production case", 0) == 0) return "as written";
  std::string s = criterion;
  const auto erase = [&s](const std::string& what, const std::string& with = "") {
    for (auto at = s.find(what); at != std::string::npos; at = s.find(what)) s.replace(at, what.size(), with);
  };
  erase(", equal vvm");
  erase(", equal superficial gas velocity", " + vs");
  erase("equal ");
  for (auto open = s.find(" ("); open != std::string::npos; open = s.find(" (")) s.erase(open, s.find(')', open) - open + 1);
  return s;
}

// First in the report: which criteria give a production point that meets its constraints.
std::string scale_up_verdict_html(const ScaleUpStudy& s) {
  std::vector<std::string> ok;
  size_t criteria = 0;
  for (const auto& r : s.rows) {
    if (r.criterion == "production case as written") continue;
    ++criteria;
    if (r.reached && r.production.effects.feasible) ok.push_back(r.criterion);
  }
  std::string as_written;
  for (const auto& r : s.rows) {
    if (r.criterion == "production case as written") {
      as_written = r.production.effects.feasible ? "The production case as written meets its constraints. "
                                                 : "The production case as written does not meet its constraints. ";
    }
  }
  if (ok.empty()) {
    return verdict_box_html(false, fmt::format("None of the {} scale-up criteria gives a production point that meets its constraints.", criteria),
                            as_written + "The table shows what each criterion breaks; `oxystrat levers` on the production case shows what else could move.");
  }
  std::string list;
  for (const auto& n : ok) list += (list.empty() ? "" : "; ") + n;
  return verdict_box_html(true, fmt::format("{} of {} scale-up criteria give a production point that meets its constraints.", ok.size(), criteria),
                          as_written + "Meeting them: " + list + ".");
}

}  // namespace

std::string scale_up_text(const Case& pilot, const Case& production, const ScaleUpStudy& s) {
  std::string t = fmt::format("Scale-up from {} ({:.3g} m3) to {} ({:.3g} m3)\n", pilot.title, pilot.vessel.working_volume_m3,
                              production.title, production.vessel.working_volume_m3);
  std::string head = fmt::format("  {:<52}", "criterion"), units = fmt::format("  {:<52}", "");
  for (const auto& c : kColumns) head += fmt::format(" {:>8}", c.head), units += fmt::format(" {:>8}", std::string("[") + c.unit + "]");
  t += head + "  result\n" + units + "\n";
  const auto line = [&](const std::string& name, const ScaleMetrics& m, const std::string& result) {
    std::string l = fmt::format("  {:<52}", name);
    for (const auto& c : kColumns) l += fmt::format(" {:>8.4g}", c.get(m));
    return l + "  " + result + "\n";
  };
  t += line("pilot", s.pilot, "");
  for (const auto& r : s.rows) {
    t += line(r.criterion, r.production, r.reached ? verdict(r.production) : "not reached");
    if (!r.note.empty()) t += "      " + r.note + "\n";
    if (r.reached && !r.production.effects.feasible) t += "      breaks: " + broken(r.production) + "\n";
  }
  const auto groups = production_cautions(s);
  if (!groups.empty()) {
    t += "Cautions at the production points (defer to local codes, the vessel's certification and licensed "
         "practice)\n";
  }
  for (const auto& g : groups) {
    t += "  " + g.where + ":\n";
    for (const auto& w : g.cautions) t += "    - " + w + "\n";
  }
  return t;
}

void write_scale_up_csv(const std::string& path, const ScaleUpStudy& s) {
  std::ofstream out(path, std::ios::binary);
  out << "criterion";
  for (const auto& c : kColumns) out << "," << c.head << " [" << c.unit << "]";
  out << ",reached,meets constraints,breaks,cautions [1]\n";
  // A criterion that was not reached has no operating point: its cells stay empty.
  const auto row = [&](const std::string& name, const ScaleMetrics& m, bool reached) {
    out << name;
    for (const auto& c : kColumns) out << (reached ? fmt::format(",{:.8g}", c.get(m)) : ",");
    std::string b = reached ? broken(m) : "";
    for (auto& ch : b) ch = ch == ',' ? ';' : ch;
    out << "," << (reached ? "yes" : "no") << "," << (reached ? (m.effects.feasible ? "yes" : "no") : "") << "," << b << ","
        << (reached ? std::to_string(m.effects.cautions.size()) : "") << "\n";
  };
  row("pilot", s.pilot, true);
  for (const auto& r : s.rows) row(r.criterion, r.production, r.reached);
  finish_file(out, path);
}

void write_scale_up_h5(H5Writer& h5, const ScaleUpStudy& s) {
  std::vector<std::string> names{"pilot"};
  std::vector<const ScaleMetrics*> rows{&s.pilot};
  std::vector<int> reached{1}, meets{s.pilot.effects.feasible};
  std::vector<std::string> breaks{broken(s.pilot)}, notes{""};
  for (const auto& r : s.rows) {
    names.push_back(r.criterion), rows.push_back(&r.production);
    reached.push_back(r.reached), meets.push_back(r.reached && r.production.effects.feasible);
    breaks.push_back(r.reached ? broken(r.production) : ""), notes.push_back(r.note);
  }
  const bool all_reached = std::all_of(reached.begin(), reached.end(), [](int x) { return x != 0; });
  // A criterion not reached has no operating point: 0 there, marked by has_value (never NaN).
  const auto field = [&](const char* name, const char* unit, double (*get)(const ScaleMetrics&)) {
    std::vector<double> v;
    for (size_t i = 0; i < rows.size(); ++i) v.push_back(reached[i] ? get(*rows[i]) : 0.0);
    const std::string path = std::string("/scale_up/") + name;
    h5.write(path, v, unit);
    if (!all_reached) h5.attribute(path, "has_value", reached);
  };
  h5.write("/scale_up/breaks", breaks);
  h5.attribute("/scale_up/breaks", "meaning", "the constraints each row breaks, '; '-separated; empty: none");
  h5.write("/scale_up/note", notes);
  h5.write("/scale_up/criterion", names);
  h5.attribute("/scale_up/criterion", "meaning", "row 0 is the pilot, row 1 the production case as written");
  h5.write("/scale_up/reached", reached, "1");
  h5.write("/scale_up/meets_constraints", meets, "1");
  std::vector<std::string> cautions;
  std::vector<int> caution_rows;
  for (size_t i = 1; i < rows.size(); ++i) {  // the production points: row 0 is the pilot
    if (!reached[i]) continue;
    for (const auto& w : rows[i]->effects.cautions) cautions.push_back(w), caution_rows.push_back(static_cast<int>(i));
  }
  h5.write("/scale_up/cautions", cautions);
  h5.attribute("/scale_up/cautions", "meaning",
               "the cautions `run` gives at each production point (the pilot's are not included); "
               "/scale_up/caution_row says whose");
  h5.write("/scale_up/caution_row", caution_rows, "1");
  h5.attribute("/scale_up/caution_row", "meaning", "the row of /scale_up/criterion each entry of /scale_up/cautions belongs to");
  field("speed", "1/s", [](const ScaleMetrics& m) { return m.speed_rps; });
  field("gas_flow_normal", "m3/s", [](const ScaleMetrics& m) { return m.gas_normal_m3_s; });
  field("power_per_volume", "W/m3", [](const ScaleMetrics& m) { return m.power_per_volume_w_m3; });
  field("tip_speed", "m/s", [](const ScaleMetrics& m) { return m.tip_speed_m_s; });
  field("kla_vessel_correlation", "1/s", [](const ScaleMetrics& m) { return m.kla_1_s; });  // /summary's name
  field("superficial_gas_velocity", "m/s", [](const ScaleMetrics& m) { return m.superficial_gas_m_s; });
  field("theta95", "s", [](const ScaleMetrics& m) { return m.theta95_s; });
  field("do_min", "mol/m3", [](const ScaleMetrics& m) { return m.do_min_mol_m3; });
  field("max_biomass", "kg/m3", [](const ScaleMetrics& m) { return m.max_biomass_kg_m3; });
  field("pco2_max", "Pa", [](const ScaleMetrics& m) { return m.effects.pco2_max_pa; });
  field("power_gassed", "W", [](const ScaleMetrics& m) { return m.effects.power_gassed_w; });
}

std::string scale_up_report_body(const Case& pilot, const Case& production, const ScaleUpStudy& s) {
  using svg::escape;
  std::string b = scale_up_verdict_html(s) + "<h2>" + escape(pilot.title) + " &rarr; " + escape(production.title) + "</h2>\n";
  b += "<p>Each row keeps one quantity of the pilot's operating point and finds the production speed (and gas flow) "
       "that does so; every row is then run through the zone model of the production vessel and checked against its "
       "constraints.</p>\n<table><tr><th>criterion</th>";
  // Each column in one unit sized for its largest value (P/V of a cell culture in W/m3).
  std::vector<report::DisplayUnit> units;
  for (const auto& c : kColumns) {
    double largest = std::abs(c.get(s.pilot));
    for (const auto& r : s.rows) largest = std::max(largest, std::abs(c.get(r.production)));
    units.push_back(report::adapt_unit(c.unit, largest));
    b += fmt::format("<th>{} [{}]</th>", escape(c.head), escape(units.back().unit));
  }
  b += "<th>result</th></tr>\n";
  const auto line = [&](const std::string& name, const ScaleMetrics& m, const std::string& result, const std::string& note) {
    std::string l = "<tr><td>" + escape(name) + "</td>";
    for (size_t i = 0; i < std::size(kColumns); ++i) {
      l += "<td class=\"num\">" + report::format_number(units[i].factor * kColumns[i].get(m)) + "</td>";
    }
    return l + "<td>" + escape(result) + (note.empty() ? "" : ": " + escape(note)) + "</td></tr>\n";
  };
  b += line("pilot", s.pilot, "", "");
  std::vector<std::string> cats;
  std::vector<double> dmin, pv;
  for (const auto& r : s.rows) {
    b += line(r.criterion, r.production, r.reached ? verdict(r.production) : "not reached",
              r.reached ? broken(r.production) : r.note);
    cats.push_back(short_criterion(r.criterion));
    dmin.push_back(r.production.do_min_mol_m3);
    pv.push_back(r.production.power_per_volume_w_m3);
  }
  const auto pv_unit = units[2];  // the P/V column
  for (auto& x : pv) x *= pv_unit.factor / 1e3;  // kColumns' P/V is in kW/m3
  b += "</table>\n<div class=\"row\">";
  b += svg::bar_chart("DO min at scale, by criterion", "DO min [mmol/L]", cats, {"DO min"}, {dmin}, 640, 320);
  b += svg::bar_chart("Gassed P/V at scale, by criterion", "P/V [" + pv_unit.unit + "]", cats, {"P/V"}, {pv}, 640, 320);
  b += "</div>\n";
  const auto groups = production_cautions(s);
  if (!groups.empty()) {
    b += "<h3>Cautions at the production points</h3>\n<p>Defer to local codes, the vessel's certification and "
         "licensed practice.</p>\n";
  }
  for (const auto& g : groups) {
    b += "<h4>" + escape(g.where) + "</h4>\n<ul>\n";
    for (const auto& w : g.cautions) b += "<li>" + escape(w) + "</li>\n";
    b += "</ul>\n";
  }
  return b;
}

}  // namespace oxystrat
