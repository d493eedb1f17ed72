#include "postproc/report/trust_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <stdexcept>

#include "postproc/report/number_format.hpp"
#include "postproc/report/svg_plot.hpp"
#include "input/display_units.hpp"
#include "input/errors.hpp"

namespace oxystrat {
namespace {

std::string num(double v) { return report::format_number(v); }

// The samples are SI; tables for people show them in the output's display unit.
double shown(const UncertaintyOutput& o, double si) { return si * units::display_per_si(o.unit, o.display_unit); }

// How often the constants' scatter alone puts some broth below its critical DO: what a verdict
// with a thin margin rests on.
std::string below_critical_sentence(const UncertaintyResult& u) {
  if (u.samples_ran == 0 || u.samples_below_critical == 0) return "";
  return fmt::format("In {} of {} samples some broth falls below its critical DO (the constants varied within their "
                     "published scatter).",
                     u.samples_below_critical, u.samples_ran);
}

}  // namespace

std::string uncertainty_text(const UncertaintyResult& u) {
  const size_t n = u.draws.size();
  std::string s = fmt::format("Uncertainty ({} samples{}, model constants varied by their published scatter)\n", n,
                              u.failed ? fmt::format(", {} failed", u.failed) : "");
  s += fmt::format("  {:<26} {:>10} {:>10} {:>10}  {}\n", "", "P10", "P50", "P90", "unit");
  for (const auto& o : u.outputs) {
    s += fmt::format("  {:<26} {:>10} {:>10} {:>10}  {}\n", o.label, num(shown(o, o.q.p10)), num(shown(o, o.q.p50)),
                     num(shown(o, o.q.p90)), o.display_unit);
  }
  if (const auto line = below_critical_sentence(u); !line.empty()) s += "  " + line + "\n";
  s += "  What moves DO min most (Spearman rank correlation; measure these first):\n";
  bool noise_shown = false;
  for (size_t i = 0; i < u.sensitivity.size() && i < 5; ++i) {
    s += fmt::format("    {:<24} {:+.2f}{}\n", u.sensitivity[i].constant, u.sensitivity[i].spearman,
                     u.sensitivity[i].significant ? "" : "  (within sampling noise)");
    noise_shown = noise_shown || !u.sensitivity[i].significant;
  }
  if (noise_shown) {
    s += fmt::format("    (within sampling noise: |rank correlation| below 1.96/sqrt(n - 1) = {:.2f}; more samples "
                     "sharpen the ranking)\n",
                     u.noise_bar);
  }
  return s;
}

void write_uncertainty_h5(H5Writer& h5, const UncertaintyResult& u) {
  std::vector<std::string> names, sources;
  std::vector<double> widths, draws;
  for (const auto& k : u.constants) {
    names.push_back(k.name);
    sources.push_back(k.source);
    widths.push_back(k.width);
  }
  for (const auto& row : u.draws) draws.insert(draws.end(), row.begin(), row.end());
  h5.write("/uncertainty/constants", names);
  h5.write("/uncertainty/sources", sources);
  h5.write("/uncertainty/widths", widths, "1");
  h5.attribute("/uncertainty/widths", "meaning", "sigma of ln(factor) (log-normal constants) or of the added shift");
  h5.write("/uncertainty/draws", draws, u.draws.size(), u.constants.size(), "1");
  h5.attribute("/uncertainty/draws", "meaning", "standard-normal draw per sample (row) and constant (column)");
  for (const auto& o : u.outputs) {
    h5.write("/uncertainty/" + o.name, o.samples, o.unit);
    h5.write("/uncertainty/" + o.name + "_p10", o.q.p10, o.unit);
    h5.write("/uncertainty/" + o.name + "_p50", o.q.p50, o.unit);
    h5.write("/uncertainty/" + o.name + "_p90", o.q.p90, o.unit);
  }
  std::vector<std::string> sens_names;
  std::vector<double> sens;
  for (const auto& s : u.sensitivity) sens_names.push_back(s.constant), sens.push_back(s.spearman);
  h5.write("/uncertainty/sensitivity_constants", sens_names);
  h5.write("/uncertainty/sensitivity_do_min", sens, "1");
  std::vector<int> significant;
  for (const auto& k : u.sensitivity) significant.push_back(k.significant);
  h5.write("/uncertainty/sensitivity_significant", significant, "1");
  h5.attribute("/uncertainty/sensitivity_significant", "meaning",
               "1 where |rank correlation| >= 1.96 / sqrt(n - 1): beyond sampling noise (95 %)");
  std::vector<double> p10, p50, p90;
  for (const auto& q : u.profile_do) p10.push_back(q.p10), p50.push_back(q.p50), p90.push_back(q.p90);
  h5.write("/uncertainty/profile_z", u.profile_z, "m");
  h5.write("/uncertainty/profile_do_mean_p10", p10, "mol/m3");
  h5.write("/uncertainty/profile_do_mean_p50", p50, "mol/m3");
  h5.write("/uncertainty/profile_do_mean_p90", p90, "mol/m3");
}

void write_uncertainty_csv(const std::string& path, const UncertaintyResult& u) {
  std::ofstream out(path);
  out << "sample";
  for (const auto& k : u.constants) out << ",draw " << k.name << " [-]";
  for (const auto& o : u.outputs) out << "," << o.name << " [" << o.display_unit << "]";
  out << "\n";
  for (size_t i = 0; i < u.draws.size(); ++i) {
    out << i;
    for (double z : u.draws[i]) out << fmt::format(",{:.6g}", z);
    for (const auto& o : u.outputs) {
      out << "," << (std::isfinite(o.samples[i]) ? fmt::format("{:.6g}", shown(o, o.samples[i])) : "");
    }
    out << "\n";
  }
  finish_file(out, path);
}

std::string uncertainty_html(const UncertaintyResult& u, double critical) {
  std::string s = fmt::format("<h2>Uncertainty</h2>\n<p>{} seeded samples over the model constants (Latin hypercube); "
                              "widths and their sources below.</p>\n<div class=\"row\"><div>",
                              u.draws.size());
  s += "<table><tr><th>quantity</th><th>P10</th><th>P50</th><th>P90</th><th>unit</th></tr>\n";
  for (const auto& o : u.outputs) {
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td></tr>\n",
                     o.label, num(shown(o, o.q.p10)), num(shown(o, o.q.p50)), num(shown(o, o.q.p90)), o.display_unit);
  }
  s += "</table>\n";
  if (const auto line = below_critical_sentence(u); !line.empty()) s += "<p>" + line + "</p>\n";
  s += "<h3>What moves DO min most</h3>\n<table><tr><th>constant</th><th>rank correlation</th><th></th></tr>\n";
  for (const auto& k : u.sensitivity) {
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{:+.2f}</td><td>{}</td></tr>\n", k.constant, k.spearman,
                     k.significant ? "" : "within sampling noise");
  }
  s += "</table></div>\n";
  std::vector<double> p10, p50, p90;
  for (const auto& q : u.profile_do) p10.push_back(q.p10), p50.push_back(q.p50), p90.push_back(q.p90);
  s += svg::line_chart("Mean DO by height: uncertainty band", "DO [mmol/L]", "height [m]",
                       // Three styles a reader tells apart in the legend and in grey print.
                       {{"P10", p10, u.profile_z, "#6baed6", false, false, "6,3", 1.6},
                        {"P50 (median)", p50, u.profile_z, "#08306b", false, false, "", 2.6},
                        {"P90", p90, u.profile_z, "#6baed6", false, false, "1.5,2.5", 2.0}},
                       {{true, critical, "critical DO"}});
  s += "</div>\n<h3>Constants and widths</h3>\n<table><tr><th>constant</th><th>distribution</th><th>width</th><th>source of the width</th></tr>\n";
  for (const auto& k : u.constants) {
    s += fmt::format("<tr><td>{}</td><td>{}</td><td class=\"num\">{:.3g}</td><td>{}</td></tr>\n", k.name,
                     k.log_normal ? "log-normal factor" : "normal shift", k.width, svg::escape(k.source));
  }
  return s + "</table>\n";
}

std::string grid_check_text(const GridCheck& g) {
  std::string s = fmt::format("Grid check: {} / {} / {} zones (fine / medium / coarse), refinement ratio {:.2f} and {:.2f}\n",
                              g.zones[0], g.zones[1], g.zones[2], g.cell_size[1] / g.cell_size[0],
                              g.cell_size[2] / g.cell_size[1]);
  for (const auto& q : g.quantities) {
    s += fmt::format("  {:<26} {:>10} {:>10} {:>10} {:<7} order {:>5}  GCI {:>6}  {}\n", q.name, num(q.fine), num(q.medium),
                     num(q.coarse), q.unit, num(q.convergence.observed_order),
                     q.convergence.converged_already ? "0 %" : fmt::format("{:.1f} %", 100 * q.convergence.gci_fine), q.verdict);
  }
  for (const auto& w : g.warnings) s += "  warning: " + w + "\n";
  return s;
}

void write_grid_check_h5(H5Writer& h5, const GridCheck& g) {
  h5.write("/grid_check/zones", std::vector<int>{g.zones[0], g.zones[1], g.zones[2]}, "1");
  h5.write("/grid_check/cell_size", std::vector<double>{g.cell_size[0], g.cell_size[1], g.cell_size[2]}, "m");
  std::vector<std::string> names, units, verdicts;
  std::vector<double> values, order, gci, band, extrapolated;
  for (const auto& q : g.quantities) {
    // The check is read in table units (mmol/L, %); the file holds SI.
    const auto si = units::display_scale(q.unit);
    names.push_back(q.name);
    units.push_back(si.si_unit);
    verdicts.push_back(q.verdict);
    values.insert(values.end(), {q.fine / si.per_si, q.medium / si.per_si, q.coarse / si.per_si});
    order.push_back(q.convergence.observed_order);
    gci.push_back(q.convergence.gci_fine);
    band.push_back(q.convergence.gci_fine_absolute / si.per_si);
    extrapolated.push_back(q.convergence.extrapolated / si.per_si);
  }
  h5.write("/grid_check/quantities", names);
  h5.write("/grid_check/units", units);
  h5.write("/grid_check/values", values, g.quantities.size(), 3, "see /grid_check/units");
  h5.write("/grid_check/observed_order", order, "1");
  h5.write("/grid_check/gci", gci, "1");
  h5.attribute("/grid_check/gci", "meaning", "Grid Convergence Index of the fine solution, relative (Roache; Celik et al. 2008)");
  h5.write("/grid_check/gci_absolute", band, "see /grid_check/units");
  h5.write("/grid_check/extrapolated", extrapolated, "see /grid_check/units");
  h5.write("/grid_check/verdicts", verdicts);
}

std::string grid_check_html(const GridCheck& g) {
  std::string s = fmt::format("<h2>Discretisation error</h2>\n<p>The case on {} / {} / {} zones; observed order and Grid "
                              "Convergence Index (Roache 1994, 1998; procedure of Celik et al. 2008, as in ASME V&amp;V "
                              "20-2009).</p>\n<table><tr><th>quantity</th><th>fine</th><th>medium</th><th>coarse</th><th>unit</th>"
                              "<th>order</th><th>GCI</th><th>verdict</th></tr>\n",
                              g.zones[0], g.zones[1], g.zones[2]);
  for (const auto& q : g.quantities) {
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td>"
                     "<td class=\"num\">{}</td><td class=\"num\">{:.1f} %</td><td>{}</td></tr>\n",
                     q.name, num(q.fine), num(q.medium), num(q.coarse), q.unit, num(q.convergence.observed_order),
                     100 * q.convergence.gci_fine, svg::escape(q.verdict));
  }
  return s + "</table>\n";
}

}  // namespace oxystrat
