#include "postproc/report/report.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <stdexcept>

#include "postproc/report/limits_output.hpp"
#include "postproc/report/number_format.hpp"
#include "postproc/report/svg_plot.hpp"
#include "postproc/report/sweep_notes.hpp"
#include "solver/studies/sweep_choice.hpp"
#include "postproc/report/verdict_output.hpp"
#include "solver/studies/verdict.hpp"
#include "input/errors.hpp"

namespace oxystrat {
namespace {

using svg::escape;

const char* kColors[] = {"#1f77b4", "#ff7f0e", "#2ca02c", "#9467bd", "#8c564b", "#e377c2"};

std::string number(double v) { return report::format_number(v); }

std::string values_table(const std::vector<SummaryValue>& values) {
  std::string s = "<table><tr><th>quantity</th><th>value</th><th>unit</th></tr>\n";
  for (const auto& v : values) {
    const auto d = report::adapt_unit(v.shown_unit(), v.display());
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{}</td><td>{}</td></tr>\n", escape(v.label), number(d.factor * v.display()),
                     escape(d.unit));
  }
  return s + "</table>\n";
}

// A named summary value with its own unit, adapted to its size: "0.0123 mmol/L", "350 W/m3".
std::string value_text(const std::vector<SummaryValue>& values, const std::string& name) {
  for (const auto& v : values) {
    if (v.name != name) continue;
    // The tables' unit (mmol/L for DO); power keeps the prefix that suits its size.
    if (v.display_unit.empty() || v.unit == "W") return report::format_quantity(v.value, v.unit);
    return report::format_number(v.display()) + " " + v.display_unit;
  }
  return "\xE2\x80\x93";
}

// What each compared case runs at, so that 100 and 125 rpm read apart.
std::string operating_rows(const std::vector<ComparedCase>& cases) {
  struct Row {
    const char* label;
    const char* unit;
    std::string (*get)(const Case&);
  };
  static const Row rows[] = {
      {"speed", "rpm", [](const Case& c) { return number(60.0 * c.operation.speed_rps); }},
      {"gas flow", "vvm", [](const Case& c) { return number(60.0 * c.operation.gas_flow_normal_m3_s / c.vessel.working_volume_m3); }},
      {"gas flow", "Nm3/h", [](const Case& c) { return number(3600.0 * c.operation.gas_flow_normal_m3_s); }},
      {"O2 in the inlet gas", "%", [](const Case& c) { return number(100.0 * c.operation.oxygen_fraction); }},
      {"head pressure", "bar(a)", [](const Case& c) { return number(c.vessel.head_pressure_pa / 1e5); }},
      {"working volume", "m3", [](const Case& c) { return number(c.vessel.working_volume_m3); }},
      {"impellers (bottom up)", "",
       [](const Case& c) {
         std::string t;
         for (const auto& i : c.impellers) t += (t.empty() ? "" : ", ") + to_string(i.type);
         return escape(t);
       }},
      {"biomass", "g/L", [](const Case& c) { return number(c.culture.biomass_kg_m3); }},
  };
  std::string s = fmt::format("<tr><th colspan=\"{}\" style=\"text-align:left\">operating point</th></tr>\n", cases.size() + 2);
  for (const auto& r : rows) {
    s += fmt::format("<tr><td>{}</td><td>{}</td>", r.label, r.unit);
    for (const auto& c : cases) s += "<td class=\"num\">" + r.get(*c.data) + "</td>";
    s += "</tr>\n";
  }
  return s + fmt::format("<tr><th colspan=\"{}\" style=\"text-align:left\">results</th></tr>\n", cases.size() + 2);
}

}  // namespace

std::string scatter_note(const std::string& name, const std::vector<SummaryValue>& values, bool meets) {
  const auto has = [&](const char* n) {
    return std::any_of(values.begin(), values.end(), [&](const SummaryValue& v) { return v.name == n; });
  };
  if (!meets || !has("volume_fraction_below_critical_p90") || !has("do_min_p10")) return "";
  if (!(summary_value(values, "volume_fraction_below_critical_p90") > 0.0)) return "";
  return fmt::format("{} meets its constraints as computed, but not across the model constants' scatter: at P90 {} of "
                     "the volume is below critical DO (DO min P10 {}).",
                     name, value_text(values, "volume_fraction_below_critical_p90"), value_text(values, "do_min_p10"));
}

namespace {

// The first sentence of a comparison: how many meet their constraints, and which has most oxygen.
std::string compare_verdict(const std::vector<ComparedCase>& cases) {
  std::vector<std::string> ok;
  for (const auto& c : cases) {
    if (feasible(c.checks)) ok.push_back(c.name);
  }
  std::string headline;
  if (ok.size() == cases.size()) {
    headline = fmt::format("All {} configurations meet their constraints.", cases.size());
  } else if (ok.empty()) {
    headline = fmt::format("None of the {} configurations meets its constraints.", cases.size());
  } else {
    std::string names;
    for (const auto& n : ok) names += (names.empty() ? "" : ", ") + n;
    headline = fmt::format("{} of {} configurations meet their constraints: {}.", ok.size(), cases.size(), names);
  }
  std::string detail;
  const ComparedCase* best = nullptr;
  for (const auto& c : cases) {
    const auto it = std::find_if(c.values.begin(), c.values.end(), [](const SummaryValue& v) { return v.name == "do_min"; });
    if (it == c.values.end() || !std::isfinite(it->value)) continue;
    if (best == nullptr || it->value > summary_value(best->values, "do_min")) best = &c;
  }
  if (best != nullptr) detail = fmt::format("Highest DO minimum: {} ({}). ", best->name, value_text(best->values, "do_min"));
  for (const auto& c : cases) {
    if (!feasible(c.checks)) detail += c.name + " breaks: " + broken_constraints(c.checks) + ". ";
    if (const auto note = scatter_note(c.name, c.values, feasible(c.checks)); !note.empty()) detail += note + " ";
  }
  return verdict_box_html(ok.size() == cases.size(), headline, detail);
}

std::string list(const std::vector<std::string>& items, const std::string& empty) {
  if (items.empty()) return "<p>" + escape(empty) + "</p>\n";
  std::string s = "<ul>\n";
  for (const auto& i : items) s += "<li>" + escape(i) + "</li>\n";
  return s + "</ul>\n";
}

std::vector<svg::Outline> outlines(const Case& c) {
  std::vector<svg::Outline> o;
  for (size_t m = 0; m < c.impellers.size(); ++m) {
    const auto& i = c.impellers[m];
    o.push_back({0.0, 0.5 * i.diameter_m, i.elevation_m - 0.5 * i.blade_height_m, i.elevation_m + 0.5 * i.blade_height_m,
                 fmt::format("impeller {} ({})", m, to_string(i.type))});
  }
  if (c.has_sparger) {
    o.push_back({0.0, 0.5 * c.sparger.diameter_m, c.sparger.elevation_m, c.sparger.elevation_m, "sparger"});
  }
  return o;
}

}  // namespace

void write_text_file(const std::string& path, const std::string& text) {
  std::ofstream out(path, std::ios::binary);
  out << text;
  finish_file(out, path);
}

std::string run_report_body(const Case& c, const CaseRun& run, std::optional<double> theta95_s, const Verdict* verdict,
                            bool heading, const std::vector<std::string>& case_notes) {
  std::string s = (heading ? "<h2>" + escape(c.title) + "</h2>\n" : std::string()) +
                  verdict_html(c, verdict ? *verdict : make_verdict(c, run)) +
                  "<div class=\"row\"><div>\n<h3>Summary</h3>\n";
  s += values_table(summary_values(c, run, theta95_s));
  s += "</div><div>\n<h3>Cautions</h3>\n" + list(run.cautions, "None apply.");
  std::vector<std::string> notes = case_notes;
  notes.insert(notes.end(), run.notes.begin(), run.notes.end());
  s += "<h3>Notes</h3>\n" + list(notes, "None.");
  // Without a DO field (no gas) there is nothing to draw for oxygen.
  if (!run.field) return s + "</div></div>\n" + limits_report_html(c, run, outlines(c));
  if (!run.single_zone) throw std::logic_error("the run report needs the single-zone field (run_case with single_zone)");
  const auto& f = *run.field;
  const auto p = height_profile(run.net, f.do_mol_m3);
  const double crit = c.culture.critical_do_mol_m3;
  // Where the tank starves, beside the summary: on the first screen, under the verdict it explains.
  s += "<div class=\"row\">\n";
  s += svg::line_chart("Dissolved O2 by height", "DO [mmol/L]", "height [m]",
                       {{"min", p.min, p.z, "#d62728"}, {"mean", p.mean, p.z, "#1f77b4"}, {"max", p.max, p.z, "#2ca02c"},
                        {"single zone", {run.single_zone->do_min, run.single_zone->do_min}, {0.0, run.net.liquid_height},
                         "#7f7f7f", true}},
                       {{true, crit, "critical DO"}});
  s += svg::zone_map(run.net, f.do_mol_m3, "DO in the (r, z) section", "mmol/L", outlines(c), crit);
  s += "</div></div></div>\n<div class=\"row\">\n";
  const std::vector<bool> gassed = gassed_zones(f);
  const auto ps = height_profile(run.net, f.cstar_mol_m3, gassed);
  const auto pk = height_profile(run.net, f.kla_1_s);
  std::vector<double> kla_h(pk.mean.size());
  for (size_t i = 0; i < kla_h.size(); ++i) kla_h[i] = 3600.0 * pk.mean[i];
  s += svg::line_chart("C* by height", "C* [mmol/L]", "height [m]", {{"C* (gassed zones)", ps.mean, ps.z, "#9467bd"}});
  s += svg::line_chart("kLa by height", "kLa [1/h]", "height [m]", {{"kLa (level mean)", kla_h, pk.z, "#ff7f0e"}});
  s += "</div>\n";
  return s + limits_report_html(c, run, outlines(c));
}

std::string compare_report_body(const std::vector<ComparedCase>& cases) {
  std::string s = compare_verdict(cases) + "<h2>Configurations side by side</h2>\n<table><tr><th>quantity</th><th>unit</th>";
  for (const auto& c : cases) s += "<th>" + escape(c.name) + "</th>";
  s += "</tr>\n";
  if (!cases.empty()) {
    s += operating_rows(cases);
    // Rows by name: a value that applies to some cases only (a cost without [prices]) shows a dash.
    std::vector<const SummaryValue*> rows;
    for (const auto& c : cases) {
      for (const auto& v : c.values) {
        bool seen = false;
        for (const auto* r : rows) seen = seen || r->name == v.name;
        if (!seen) rows.push_back(&v);
      }
    }
    for (const auto* r : rows) {
      // One unit per row, chosen by the row's largest value (in the row's display unit).
      double largest = 0.0;
      for (const auto& c : cases) {
        for (const auto& v : c.values) largest = v.name == r->name && std::isfinite(v.value) ? std::max(largest, std::abs(v.display())) : largest;
      }
      const auto d = report::adapt_unit(r->shown_unit(), largest);
      s += fmt::format("<tr><td>{}</td><td>{}</td>", escape(r->label), escape(d.unit));
      for (const auto& c : cases) {
        double x = std::nan("");
        for (const auto& v : c.values) x = v.name == r->name ? v.display() : x;
        s += "<td class=\"num\">" + number(d.factor * x) + "</td>";
      }
      s += "</tr>\n";
    }
    s += "<tr><td>constraints</td><td></td>";
    for (const auto& c : cases) {
      s += std::string("<td>") + (feasible(c.checks) ? "all met" : "<b>violated</b>: " + escape(broken_constraints(c.checks))) +
           "</td>";
    }
    s += "</tr>\n";
  }
  s += "</table>\n<div class=\"row\">\n";
  std::vector<std::string> names;
  std::vector<double> do_min, do_single, xmax, xmax_single, pg;
  for (const auto& c : cases) {
    names.push_back(c.name);
    do_min.push_back(summary_display(c.values, "do_min"));
    do_single.push_back(summary_display(c.values, "do_single_zone"));
    xmax.push_back(summary_display(c.values, "max_biomass"));
    xmax_single.push_back(summary_display(c.values, "max_biomass_single_zone"));
    pg.push_back(summary_display(c.values, "power_gassed"));
  }
  // Whiskers (P10-P90) where the comparison ran with --uncertainty.
  const auto band = [&](const char* name) {
    std::vector<std::vector<double>> lo(1), hi(1);
    for (const auto& c : cases) {
      bool found = false;
      for (const auto& v : c.values) found = found || v.name == std::string(name) + "_p10";
      lo[0].push_back(found ? summary_display(c.values, std::string(name) + "_p10") : std::nan(""));
      hi[0].push_back(found ? summary_display(c.values, std::string(name) + "_p90") : std::nan(""));
    }
    return std::pair{lo, hi};
  };
  const auto [do_lo, do_hi] = band("do_min");
  const auto [x_lo, x_hi] = band("max_biomass");
  s += svg::bar_chart("Minimum DO", "DO [mmol/L]", names, {"zone model", "single zone"}, {do_min, do_single}, 520, 300,
                      do_lo, do_hi);
  s += svg::bar_chart("Supportable biomass", "biomass [g/L]", names, {"zone model", "single zone"}, {xmax, xmax_single},
                      520, 300, x_lo, x_hi);
  s += svg::bar_chart("Gassed power", "power [kW]", names, {"Pg"}, {pg});
  std::vector<svg::Series> profiles;
  for (size_t i = 0; i < cases.size(); ++i) {
    if (!cases[i].run->field) continue;
    const auto p = height_profile(cases[i].run->net, cases[i].run->field->do_mol_m3);
    profiles.push_back({cases[i].name, p.mean, p.z, kColors[i % 6]});
  }
  if (!profiles.empty()) {
    s += svg::line_chart("Mean DO by height", "DO [mmol/L]", "height [m]", profiles,
                         {{true, cases.front().data->culture.critical_do_mol_m3, "critical DO"}});
  }
  s += "</div>\n";
  for (const auto& c : cases) {
    s += "<h3>" + escape(c.name) + ": constraints and cautions</h3>\n";
    std::vector<std::string> lines;
    for (const auto& k : c.checks) lines.push_back((k.satisfied ? "met: " : "VIOLATED: ") + k.detail);
    for (const auto& w : c.run->cautions) lines.push_back("caution: " + w);
    s += list(lines, "None.");
  }
  return s;
}

std::string sweep_report_body(const SweepPlan& plan, const std::vector<PointResult>& results,
                              const std::vector<bool>& pareto, int chosen, const std::string& objective,
                              const std::vector<std::string>& chosen_cautions) {
  size_t feasible_count = 0;
  for (const auto& r : results) feasible_count += r.ok && r.feasible ? 1 : 0;
  std::string headline, detail = fmt::format("{} of {} points meet the constraints.", feasible_count, results.size());
  if (chosen >= 0) {
    std::string at;
    for (size_t d = 0; d < plan.axes.size(); ++d) {
      at += fmt::format("{}{} = {} {}", d ? ", " : "", plan.axes[d].key, number(plan.points[chosen][d]), plan.axes[d].unit);
    }
    std::string what = objective;
    std::replace(what.begin(), what.end(), '_', ' ');
    headline = "Run at " + at + ": the least " + what + " that meets the constraints.";
    const auto& v = results[chosen].values;
    detail += fmt::format(" There: DO min {}, gassed power {}.", value_text(v, "do_min"), value_text(v, "power_gassed"));
    if (!chosen_cautions.empty()) {
      detail += fmt::format(" Read the {} caution{} below before running there.", chosen_cautions.size(),
                            chosen_cautions.size() == 1 ? "" : "s");
    }
  } else {
    headline = "No point of the sweep meets the constraints.";
    detail += " Widen the ranges, or see `oxystrat levers` for what else to move.";
  }
  std::string s = verdict_box_html(chosen >= 0, headline, detail);
  if (!chosen_cautions.empty()) {
    s += "<h3>Cautions at the chosen point</h3>\n<p>Defer to local codes, the vessel's certification and licensed "
         "practice.</p>\n" + list(chosen_cautions, "");
  }
  s += "<h2>Operating window</h2>\n";
  s += sweep_honesty_html(plan, results, chosen) + "<div class=\"row\">\n";
  const std::vector<std::string> groups{"failed / infeasible", "feasible", "chosen"};
  const std::vector<std::string> colors{"#cccccc", "#2ca02c", "#d62728"};
  const auto group_of = [&](size_t i) { return static_cast<int>(i) == chosen ? 2 : (results[i].ok && results[i].feasible ? 1 : 0); };
  if (plan.axes.size() >= 2) {
    std::vector<svg::ScatterPoint> pts;
    for (size_t i = 0; i < results.size(); ++i) pts.push_back({plan.points[i][0], plan.points[i][1], group_of(i)});
    s += svg::scatter_chart("Feasible region", plan.axes[0].key + " [" + plan.axes[0].unit + "]",
                            plan.axes[1].key + " [" + plan.axes[1].unit + "]", pts, groups, colors);
  }
  if (!plan.axes.empty()) {
    std::vector<svg::ScatterPoint> pts;
    for (size_t i = 0; i < results.size(); ++i) {
      if (results[i].ok) pts.push_back({plan.points[i][0], summary_display(results[i].values, "do_min"), group_of(i)});
    }
    s += svg::scatter_chart("DO min over the first axis", plan.axes[0].key + " [" + plan.axes[0].unit + "]",
                            "DO min [mmol/L]", pts, groups, colors);
  }
  std::vector<svg::ScatterPoint> front;
  for (size_t i = 0; i < results.size(); ++i) {
    if (!results[i].ok) continue;
    const int g = static_cast<int>(i) == chosen ? 2 : (pareto[i] ? 1 : 0);
    front.push_back({summary_display(results[i].values, "power_gassed"), summary_display(results[i].values, "do_min"), g});
  }
  s += svg::scatter_chart("Power against DO min", "gassed power [kW]", "DO min [mmol/L]", front,
                          {"dominated", "Pareto front", "chosen"}, {"#cccccc", "#1f77b4", "#d62728"});
  s += "</div>\n<h3>Points</h3>\n<table><tr><th>#</th>";
  for (const auto& a : plan.axes) s += "<th>" + escape(a.key) + " [" + escape(a.unit) + "]</th>";
  s += "<th>feasible</th><th>P gassed [kW]</th><th>DO min [mmol/L]</th><th>below critical [%]</th><th>max biomass [g/L]</th><th>violated</th></tr>\n";
  const size_t shown = std::min<size_t>(results.size(), 500);
  for (size_t i = 0; i < shown; ++i) {
    s += fmt::format("<tr{}><td>{}</td>", static_cast<int>(i) == chosen ? " class=\"chosen\"" : "", i);
    for (double v : plan.points[i]) s += "<td class=\"num\">" + number(v) + "</td>";
    if (!results[i].ok) {
      s += "<td colspan=\"6\">failed: " + escape(results[i].error) + "</td></tr>\n";
      continue;
    }
    s += fmt::format("<td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td></tr>\n",
                     results[i].feasible ? "yes" : "no", number(summary_display(results[i].values, "power_gassed")),
                     number(summary_display(results[i].values, "do_min")),
                     number(summary_display(results[i].values, "volume_fraction_below_critical")),
                     number(summary_display(results[i].values, "max_biomass")), escape(broken_constraints(results[i])));
  }
  s += "</table>\n";
  if (shown < results.size()) s += fmt::format("<p>First {} of {} points; all are in sweep.csv.</p>\n", shown, results.size());
  return s;
}

std::string report_page(const std::string& title, const std::string& body, bool zone_model_method) {
  std::string s = "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>" + escape(title) +
                  "</title>\n<style>body{font-family:sans-serif;margin:24px;max-width:1400px;color:#222}"
                  "table{border-collapse:collapse;margin:8px 0}td,th{border:1px solid #ccc;padding:3px 8px;font-size:13px}"
                  "td.num{text-align:right;font-variant-numeric:tabular-nums}tr.chosen{background:#fde0dd}"
                  ".row{display:flex;flex-wrap:wrap;gap:16px;align-items:flex-start}.row>div{flex:0 1 auto;min-width:280px}"
                  ".row>div:last-child:not(:first-child){flex:1 1 320px}svg{border:1px solid #eee}"
                  "h2{border-bottom:2px solid #1f77b4}</style></head>\n<body>\n<h1>" +
                  escape(title) + "</h1>\n";
  s += body;
  if (!zone_model_method) return s + "</body></html>\n";
  s += R"html(<h2>Method and references</h2>
<p>The vessel is split into axisymmetric annular zones aligned with every impeller and the sparger.
Liquid flows follow a stream function built from one loop per impeller discharge (exact zone
balance); turbulent exchange scales with local dissipation (calibrated once against the
Grenville/Nienow mixing-time correlation). Gas moves between zones by drift flux: bubbles rise at
their slip velocity on the liquid flow (bubble size from break-up in the local dissipation, Hinze),
so holdup, bubble size and gas composition are found per zone; non-flooded impellers spread it.
C* follows Henry's law at each zone's pressure and gas composition (Benson &amp; Krause 1984); kLa
per zone from van 't Riet (1979) or from the bubble size and surface renewal; uptake is Monod in
dissolved O2. Power numbers, gassed power (Cui et al. 1996 for Rushton turbines, by type otherwise), flooding
(Nienow et al. 1985, scaled by type); the heterogeneous (churn-turbulent) regime is flagged, not modelled; viscous
broths through Metzner-Otto, damped turbulence and Elson caverns. The single-zone column is the
textbook answer: one well-mixed zone with the vessel-average kLa. Correlations were fitted on
vessels up to a few m3 and scatter by 20-40 %; read the numbers as engineering estimates,
calibrate with your own data, and defer to local codes, the vessel's certification and licensed
practice. Full method and references: docs/method.md of oxystrat; measured data the model was
checked against: <code>oxystrat validate</code>.</p>
</body></html>
)html";
  return s;
}

}  // namespace oxystrat
