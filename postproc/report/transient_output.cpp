#include "postproc/report/transient_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <functional>

#include "solver/oxygen/cautions.hpp"
#include "solver/oxygen/heat_balance.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/network_output.hpp"
#include "physics/solubility.hpp"
#include "postproc/report/number_format.hpp"
#include "postproc/report/report.hpp"
#include "postproc/report/verdict_output.hpp"
#include "postproc/report/svg_plot.hpp"
#include "postproc/io/vtk_writer.hpp"
#include "input/errors.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

// One summary column: name in HDF5, CSV header, unit factor from SI and the value.
struct Column {
  std::string h5_name, csv_header, h5_units;
  double csv_factor;
  std::function<double(const TransientSample&)> get;
};

std::vector<Column> summary_columns() {
  using S = TransientSample;
  return {
      {"time", "time [s]", "s", 1.0, [](const S& s) { return s.time_s; }},
      {"step", "step [s]", "s", 1.0, [](const S& s) { return s.step_s; }},
      {"probe_do", "probe DO [mmol/L]", "mol/m3", 1.0, [](const S& s) { return s.probe_do; }},
      {"do_min", "DO min [mmol/L]", "mol/m3", 1.0, [](const S& s) { return s.do_min; }},
      {"do_mean", "DO mean [mmol/L]", "mol/m3", 1.0, [](const S& s) { return s.do_mean; }},
      {"do_max", "DO max [mmol/L]", "mol/m3", 1.0, [](const S& s) { return s.do_max; }},
      {"volume_fraction_below_critical", "volume below critical [-]", "1", 1.0, [](const S& s) { return s.volume_below_critical; }},
      {"speed_rps", "speed [rpm]", "1/s", 60.0, [](const S& s) { return s.speed_rps; }},
      {"gas_flow_normal", "gas [Nm3/h]", "m3/s", 3600.0, [](const S& s) { return s.gas_normal_m3_s; }},
      {"oxygen_fraction", "O2 in inlet gas [-]", "1", 1.0, [](const S& s) { return s.oxygen_fraction; }},
      {"controller_output", "controller output [0-3]", "1", 1.0, [](const S& s) { return s.controller_output; }},
      {"otr_total", "OTR [mol/s]", "mol/s", 1.0, [](const S& s) { return s.otr_mol_s; }},
      {"our_total", "OUR [mol/s]", "mol/s", 1.0, [](const S& s) { return s.our_mol_s; }},
      {"cer_total", "CER [mol/s]", "mol/s", 1.0, [](const S& s) { return s.cer_mol_s; }},
      {"pco2_max", "pCO2 max [mmHg]", "Pa", 1.0 / kMmHgPa, [](const S& s) { return s.pco2_max_pa; }},
      {"substrate_min", "substrate min [g/L]", "kg/m3", 1.0, [](const S& s) { return s.substrate_min; }},
      {"substrate_mean", "substrate mean [g/L]", "kg/m3", 1.0, [](const S& s) { return s.substrate_mean; }},
      {"substrate_max", "substrate max [g/L]", "kg/m3", 1.0, [](const S& s) { return s.substrate_max; }},
      {"biomass_mean", "biomass mean [g/L]", "kg/m3", 1.0, [](const S& s) { return s.biomass_mean; }},
      {"growth_rate_mean", "growth rate mean [1/h]", "1/s", 3600.0, [](const S& s) { return s.growth_rate_mean; }},
      {"feed_rate", "feed rate [L/h]", "m3/s", 3.6e6, [](const S& s) { return s.feed_rate_m3_s; }},
      {"fed_volume", "fed volume [L]", "m3", 1e3, [](const S& s) { return s.fed_volume_m3; }},
      {"heat_load", "heat load [kW]", "W", 1e-3, [](const S& s) { return s.heat_load_w; }},
  };
}

std::vector<double> series(const TransientResult& r, const std::function<double(const TransientSample&)>& get,
                           double factor = 1.0) {
  std::vector<double> v;
  v.reserve(r.trace.size());
  for (const auto& s : r.trace) v.push_back(factor * get(s));
  return v;
}

// Frame fields: HDF5 name, VTK name, units, SI -> VTK factor, accessor.
struct FieldDef {
  std::string h5_name, vtk_name, units;
  double vtk_factor;
  std::function<const std::vector<double>&(const TransientFrame&)> get;
};

std::vector<FieldDef> field_defs(bool grows) {
  using F = TransientFrame;
  std::vector<FieldDef> d{
      {"do", "do", "mol/m3", 1.0, [](const F& f) -> const std::vector<double>& { return f.do_mol_m3; }},
      {"co2", "co2", "mol/m3", 1.0, [](const F& f) -> const std::vector<double>& { return f.co2_mol_m3; }},
      {"cstar", "cstar", "mol/m3", 1.0, [](const F& f) -> const std::vector<double>& { return f.cstar_mol_m3; }},
      {"kla", "kla_1_h", "1/s", 3600.0, [](const F& f) -> const std::vector<double>& { return f.kla_1_s; }},
      {"our", "our_mmol_L_h", "mol/(m3 s)", 3600.0, [](const F& f) -> const std::vector<double>& { return f.our_mol_m3_s; }},
  };
  if (grows) {
    d.push_back({"substrate", "substrate_g_L", "kg/m3", 1.0,
                 [](const F& f) -> const std::vector<double>& { return f.substrate_kg_m3; }});
    d.push_back({"biomass", "biomass_g_L", "kg/m3", 1.0,
                 [](const F& f) -> const std::vector<double>& { return f.biomass_kg_m3; }});
    d.push_back({"growth_rate", "growth_rate_1_h", "1/s", 3600.0,
                 [](const F& f) -> const std::vector<double>& { return f.growth_rate_1_s; }});
  }
  return d;
}

void write_csv(const std::string& path, const std::vector<std::string>& headers,
               const std::vector<std::vector<double>>& columns) {
  std::ofstream out(path);
  for (size_t i = 0; i < headers.size(); ++i) out << (i ? "," : "") << headers[i];
  out << "\n";
  const size_t rows = columns.empty() ? 0 : columns.front().size();
  for (size_t r = 0; r < rows; ++r) {
    for (size_t i = 0; i < columns.size(); ++i) out << (i ? "," : "") << fmt::format("{:.8g}", columns[i][r]);
    out << "\n";
  }
  finish_file(out, path);
}

// The first lines of the report: did the broth starve, for how long, and where the run ended.
std::string transient_verdict_html(const Case& c, const TransientResult& r) {
  if (r.trace.empty()) return {};
  const double air = c.do_percent.reference_mol_m3, crit = c.culture.critical_do_mol_m3;
  double worst = 0.0, starving_s = 0.0;
  for (size_t i = 0; i < r.trace.size(); ++i) {
    worst = std::max(worst, r.trace[i].volume_below_critical);
    if (i > 0 && r.trace[i].do_min < crit) starving_s += r.trace[i].time_s - r.trace[i - 1].time_s;
  }
  const double duration = r.trace.back().time_s - r.trace.front().time_s;
  const auto minutes = [](double t) { return report::format_number(t / 60.0, 3, 1) + " min"; };
  std::string headline;
  if (worst <= 0.0) {
    headline = fmt::format("DO stayed above the critical DO everywhere for the whole {}.", minutes(duration));
  } else {
    const std::string when = starving_s >= 0.999 * duration ? "throughout the " + minutes(duration)
                                                             : "during " + minutes(starving_s) + " of the " + minutes(duration);
    headline = fmt::format("Part of the broth starves: up to {} % of the volume was below the critical DO, {}.",
                           report::format_number(100.0 * worst, 3, 1), when);
  }
  const auto& last = r.trace.back();
  std::string detail = fmt::format("At the end: probe DO {} % of air saturation", report::format_number(100.0 * last.probe_do / air, 3, 1));
  if (c.control.enabled) detail += fmt::format(" (set-point {} %)", report::format_number(100.0 * c.control.setpoint_mol_m3 / air, 3, 1));
  detail += fmt::format("; speed {} rpm, gas {} Nm3/h, O2 in the inlet gas {} %.", report::format_number(60.0 * last.speed_rps),
                        report::format_number(3600.0 * last.gas_normal_m3_s), report::format_number(100.0 * last.oxygen_fraction, 3, 1));
  return verdict_box_html(worst <= 0.0, headline, detail);
}

}  // namespace

void write_transient_outputs(RunFolder& folder, const LoadedCase& loaded, const ZoneNetwork& net,
                             const TransientResult& r, const std::vector<std::string>& cautions) {
  const auto cols = summary_columns();
  {
    std::vector<std::string> headers;
    std::vector<std::vector<double>> values;
    for (const auto& c : cols) {
      headers.push_back(c.csv_header);
      values.push_back(series(r, c.get, c.csv_factor));
    }
    write_csv(folder.file("trace.csv").string(), headers, values);
    write_csv(folder.file("probe.csv").string(), {"time [s]", "probe DO [mmol/L]", "set-point [mmol/L]"},
              {series(r, cols[0].get), series(r, cols[2].get),
               std::vector<double>(r.trace.size(), loaded.data.control.setpoint_mol_m3)});
    write_csv(folder.file("controller.csv").string(),
              {"time [s]", "controller output [0-3]", "speed [rpm]", "gas [Nm3/h]", "O2 in inlet gas [-]"},
              {series(r, cols[0].get), series(r, cols[10].get), series(r, cols[7].get, 60.0),
               series(r, cols[8].get, 3600.0), series(r, cols[9].get)});
  }
  const auto defs = field_defs(r.grows);
  {
    H5Writer h5(folder.file("result.h5").string());
    write_case_h5(h5, loaded);
    write_network_h5(h5, net);
    for (const auto& c : cols) h5.write("/transient/" + c.h5_name, series(r, c.get), c.h5_units);
    h5.write("/transient/speed", series(r, cols[7].get, 60.0), "rpm");  // kept from the first release
    h5.write("/transient/probe_zone", std::vector<int>{r.probe_zone}, "1");
    if (r.feed_zone >= 0) h5.write("/transient/feed_zone", std::vector<int>{r.feed_zone}, "1");
    std::vector<double> ft;
    for (const auto& f : r.frames) ft.push_back(f.time_s);
    h5.write("/transient/field_time", ft, "s");
    const auto n = static_cast<size_t>(net.size());
    for (const auto& d : defs) {
      std::vector<double> all;
      for (const auto& f : r.frames) all.insert(all.end(), d.get(f).begin(), d.get(f).end());
      h5.write("/transient/fields/" + d.h5_name, all, r.frames.size(), n, d.units);
      if (d.h5_name == "do") h5.write("/transient/do_field", all, r.frames.size(), n, d.units);
    }
    h5.write("/transient/o2_fed", r.o2_fed, "mol");
    h5.write("/transient/o2_offgas", r.o2_out, "mol");
    h5.write("/transient/o2_taken_up", r.o2_taken_up, "mol");
    h5.write("/transient/o2_stored_change", r.o2_stored_change, "mol");
    if (r.grows) {
      h5.write("/transient/substrate_fed", r.substrate_fed, "kg");
      h5.write("/transient/substrate_consumed", r.substrate_consumed, "kg");
      h5.write("/transient/substrate_stored_change", r.substrate_stored_change, "kg");
      h5.write("/transient/biomass_grown", r.biomass_grown, "kg");
      h5.write("/transient/biomass_stored_change", r.biomass_stored_change, "kg");
    }
    h5.write("/transient/rejected_steps", std::vector<int>{r.rejected_steps}, "1");
    h5.write("/cautions", cautions);
    h5.close();
  }
  std::filesystem::create_directory(folder.file("fields"));
  std::vector<std::string> files;
  std::vector<double> times;
  for (size_t i = 0; i < r.frames.size(); ++i) {
    const auto name = fmt::format("fields/section_{:04d}.vtu", i);
    auto arrays = network_cell_arrays(net);
    for (const auto& d : defs) {
      std::vector<double> v = d.get(r.frames[i]);
      for (auto& x : v) x *= d.vtk_factor;
      arrays.push_back({d.vtk_name, v, {}});
    }
    write_section_vtu(folder.file(name).string(), net, arrays);
    files.push_back(name);
    times.push_back(r.frames[i].time_s);
  }
  write_pvd(folder.file("transient.pvd").string(), times, files);

  // Report.
  const Case& c = loaded.data;
  const double air = c.do_percent.reference_mol_m3;
  // Time in the unit that suits the run's length: a 10-minute run on an hour axis is mostly blank.
  const double duration_s = r.trace.empty() ? 0.0 : r.trace.back().time_s - r.trace.front().time_s;
  const auto [t_unit, t_per_s] = duration_s <= 180.0    ? std::pair<std::string, double>{"s", 1.0}
                                 : duration_s <= 7200.0 ? std::pair<std::string, double>{"min", 1.0 / 60.0}
                                                        : std::pair<std::string, double>{"h", 1.0 / 3600.0};
  const std::string t_label = "time [" + t_unit + "]";
  std::vector<double> t_h = series(r, cols[0].get, t_per_s);
  const auto pct = [&](int col) { return series(r, cols[col].get, 100.0 / air); };
  std::string body = transient_verdict_html(c, r) + "<h2>Transient</h2>\n";
  if (!cautions.empty()) {
    body += "<h3>Cautions</h3>\n<ul>\n";
    for (const auto& w : cautions) body += "<li>" + svg::escape(w) + "</li>\n";
    body += "</ul>\n";
  }
  body += "<div class=\"row\">\n";
  std::vector<svg::Marker> crit{{false, 100.0 * c.culture.critical_do_mol_m3 / air, "critical DO"}};
  if (c.control.enabled) crit.push_back({false, 100.0 * c.control.setpoint_mol_m3 / air, "set-point"});
  body += svg::line_chart("DO at the probe and over the vessel", t_label, "DO [% air saturation]",
                          {{"probe", t_h, pct(2), "#1f77b4"},
                           {"minimum over zones", t_h, pct(3), "#d62728"},
                           {"volume mean", t_h, pct(4), "#7f7f7f", true}},
                          crit, 600, 320);
  body += svg::line_chart("Volume below critical DO", t_label, "share of the volume [%]",
                          {{"below critical", t_h, series(r, cols[6].get, 100.0), "#d62728"}}, {}, 600, 320);
  // Each actuator as a share of its control range, so the three stages read on one axis.
  const auto& k = c.control;
  const double gas_lo = k.gas_min_m3_s >= 0.0 ? k.gas_min_m3_s : c.operation.gas_flow_normal_m3_s;
  const double gas_hi = k.gas_max_m3_s >= 0.0 ? k.gas_max_m3_s : gas_lo;
  const double o2_hi = k.oxygen_max >= 0.0 ? k.oxygen_max : c.operation.oxygen_fraction;
  const auto share = [&](int col, double lo, double hi) {
    auto v = series(r, cols[col].get);
    for (auto& x : v) x = hi > lo ? 100.0 * (x - lo) / (hi - lo) : 0.0;
    return v;
  };
  if (k.enabled) {
    body += svg::line_chart("DO controller: each stage in % of its range", t_label, "share of the range [%]",
                            // Distinct dashes: stages at rest lie on top of each other at 0 %.
                            {{fmt::format("speed {:.0f}-{:.0f} rpm", 60 * k.speed_min_rps, 60 * k.speed_max_rps), t_h,
                              share(7, k.speed_min_rps, k.speed_max_rps), "#2ca02c", false, false, "", 3.0},
                             {fmt::format("gas {:.0f}-{:.0f} Nm3/h", 3600 * gas_lo, 3600 * gas_hi), t_h,
                              share(8, gas_lo, gas_hi), "#ff7f0e", false, false, "7,4", 2.0},
                             {fmt::format("O2 {:.1f}-{:.1f} %", 100 * c.operation.oxygen_fraction, 100 * o2_hi), t_h,
                              share(9, c.operation.oxygen_fraction, o2_hi), "#9467bd", false, false, "2,3", 2.0}},
                            {}, 600, 320, 0.0, 100.0);
  }
  body += svg::line_chart("Agitator speed", t_label, "speed [rpm]",
                          {{"speed", t_h, series(r, cols[7].get, 60.0), "#2ca02c"}}, {}, 600, 320);
  body += svg::line_chart("O2 transfer and uptake", t_label, "rate [mol/s]",
                          {{"OTR", t_h, series(r, cols[11].get), "#1f77b4"},
                           {"OUR", t_h, series(r, cols[12].get), "#d62728", true}},
                          {}, 600, 320);
  {
    std::vector<svg::Marker> available;
    if (const auto cooling = cooling_available_w(c)) available.push_back({false, *cooling / 1e3, "cooling available"});
    body += svg::line_chart("Heat load (cooling duty required)", t_label, "heat load [kW]",
                            {{"heat load", t_h, series(r, cols[22].get, 1e-3), "#8c564b"}}, available, 600, 320);
  }
  if (r.grows) {
    body += svg::line_chart("Substrate over the zones", t_label, "substrate [g/L]",
                            {{"maximum (near the feed)", t_h, series(r, cols[17].get), "#d62728"},
                             {"volume mean", t_h, series(r, cols[16].get), "#7f7f7f", true},
                             {"minimum", t_h, series(r, cols[15].get), "#1f77b4"}},
                            {}, 600, 320);
    body += svg::line_chart("Biomass (volume mean)", t_label, "biomass [g/L]",
                            {{"biomass", t_h, series(r, cols[18].get), "#2ca02c"}}, {}, 600, 320);
    body += svg::line_chart("Growth rate (volume mean)", t_label, "growth rate [1/h]",
                            {{"mu", t_h, series(r, cols[19].get, 3600.0), "#8c564b"}}, {}, 600, 320);
    body += svg::line_chart("Feed", t_label, "pump rate [L/h]",
                            {{"feed", t_h, series(r, cols[20].get, 3.6e6), "#ff7f0e"}}, {}, 600, 320);
  }
  body += "</div>\n";
  if (!r.frames.empty()) {
    const auto& last = r.frames.back();
    body += fmt::format("<h3>Fields at the end (t = {})</h3>\n<div class=\"row\">\n", report::format_duration(last.time_s));
    std::vector<double> sat = last.do_mol_m3;
    for (auto& v : sat) v *= 100.0 / air;
    body += svg::zone_map(net, sat, "DO", "% air sat.", {}, 100.0 * c.culture.critical_do_mol_m3 / air);
    if (r.grows) body += svg::zone_map(net, last.substrate_kg_m3, "Substrate", "g/L", {});
    body += "</div>\n";
  }
  body += fmt::format(
      "<h3>Balances over the run</h3>\n<p>O<sub>2</sub>: fed {:.6g} mol = off-gas {:.6g} + taken up {:.6g} + stored "
      "{:.6g} mol.",
      r.o2_fed, r.o2_out, r.o2_taken_up, r.o2_stored_change);
  if (r.grows) {
    body += fmt::format(" Substrate: fed {:.6g} kg = consumed {:.6g} + stored {:.6g} kg. Biomass: grown {:.6g} kg = "
                        "stored {:.6g} kg.",
                        r.substrate_fed, r.substrate_consumed, r.substrate_stored_change, r.biomass_grown,
                        r.biomass_stored_change);
  }
  body += fmt::format(" {} steps ({} rejected by the error control).</p>\n", r.trace.size(), r.rejected_steps);
  write_text_file(folder.file("report.html").string(), report_page("oxystrat transient: " + c.title, body));
}

std::string transient_text(const Case& c, const TransientResult& r, const std::vector<std::string>& cautions) {
  const auto& last = r.trace.back();
  std::string s = fmt::format(
      "{}\nTransient over {:.4g} s in {} steps ({} rejected): at the end probe DO {:.4f} mmol/L, DO min {:.4f} mmol/L, "
      "{:.1f} % of the volume below critical; speed {:.4g} rpm, gas {:.4g} Nm3/h, O2 {:.1f} %\n",
      c.title, last.time_s, r.trace.size(), r.rejected_steps, last.probe_do, last.do_min,
      100 * last.volume_below_critical, 60 * last.speed_rps, 3600 * last.gas_normal_m3_s, 100 * last.oxygen_fraction);
  if (r.grows) {
    s += fmt::format("Culture at the end: biomass {:.4g} g/L, growth rate {:.3g} 1/h (volume means); substrate "
                     "{:.4g} to {:.4g} g/L over the zones; fed {:.4g} L\n",
                     last.biomass_mean, 3600 * last.growth_rate_mean, last.substrate_min, last.substrate_max,
                     1e3 * last.fed_volume_m3);
  }
  s += fmt::format("O2 balance over the run: fed {:.6g} mol = off-gas {:.6g} + taken up {:.6g} + stored {:.6g} "
                   "(residual {:.2e})\n",
                   r.o2_fed, r.o2_out, r.o2_taken_up, r.o2_stored_change,
                   (r.o2_fed - r.o2_out - r.o2_taken_up - r.o2_stored_change) / r.o2_fed);
  if (r.grows && r.substrate_fed + r.substrate_consumed > 0.0) {
    s += fmt::format("Substrate balance: fed {:.6g} kg = consumed {:.6g} + stored {:.6g} (residual {:.2e})\n",
                     r.substrate_fed, r.substrate_consumed, r.substrate_stored_change,
                     (r.substrate_fed - r.substrate_consumed - r.substrate_stored_change) /
                         std::max(r.substrate_fed + r.substrate_consumed, 1e-300));
  }
  for (const auto& w : cautions) s += "caution: " + w + "\n";
  return s;
}

}  // namespace oxystrat
