#include "postproc/report/lifeline_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>
#include <stdexcept>

#include "postproc/report/display_bins.hpp"
#include "postproc/report/svg_plot.hpp"
#include "solver/studies/uncertainty.hpp"
#include "input/errors.hpp"

namespace oxystrat {
namespace {

// A histogram of durations on a log time axis, with the floor of display_bins.
template <class Source>
std::string duration_histogram(const std::string& title, const std::string& x_label, const Source& source) {
  const auto b = report::display_bins(source);
  return svg::histogram_chart(title, x_label, b.edges, b.counts, true, b.below);
}

std::string side(const FieldStatistics& f) { return f.below ? "below" : "above"; }

// Lines on one field's excursions (all of them, then the long ones when a minimum is set).
std::string field_text(const FieldStatistics& f) {
  std::string s;
  const std::string what = side(f) + " " + f.label;
  if (!f.excursion_durations_s.empty()) {
    s += fmt::format("  excursions {}: {:.1f} per cell-hour (every one, however short); duration median {:.3g} s, P90 {:.3g} s, max {:.3g} s\n",
                     what, f.excursions_per_hour, quantile(f.excursion_durations_s, 0.5), quantile(f.excursion_durations_s, 0.9),
                     *std::max_element(f.excursion_durations_s.begin(), f.excursion_durations_s.end()));
  } else {
    s += fmt::format("  no complete excursion {}\n", what);
  }
  if (!f.between_excursions_s.empty()) {
    s += fmt::format("  time between excursions: median {:.3g} s, P90 {:.3g} s\n", quantile(f.between_excursions_s, 0.5),
                     quantile(f.between_excursions_s, 0.9));
  }
  if (f.min_excursion_s > 0.0) {
    s += fmt::format("  excursions of at least {:.3g} s: {:.1f} per cell-hour", f.min_excursion_s, f.long_excursions_per_hour);
    if (!f.long_excursion_durations_s.empty()) {
      s += fmt::format("; duration median {:.3g} s, P90 {:.3g} s", quantile(f.long_excursion_durations_s, 0.5),
                       quantile(f.long_excursion_durations_s, 0.9));
    }
    if (!f.between_long_excursions_s.empty()) {
      s += fmt::format("; time between them median {:.3g} s, P90 {:.3g} s", quantile(f.between_long_excursions_s, 0.5),
                       quantile(f.between_long_excursions_s, 0.9));
    }
    s += "\n";
  } else {
    s += "  (no --min-excursion: every crossing counts, so flickers at the edge of a region inflate the count)\n";
  }
  return s;
}

std::string regime_text(const RegimeStatistics& g) {
  if (g.names.empty()) return {};
  const size_t n = g.names.size();
  std::string s = "  regimes (share of time; mean stay; entries per cell-hour; mean time between entries):\n";
  for (size_t a = 0; a < n; ++a) {
    double entries = 0.0;
    for (size_t b = 0; b < n; ++b) entries += g.transitions_per_hour[b * n + a];
    s += fmt::format("    {:<10} {:5.1f} %  stay {:7.3g} s  {:8.1f} /h  return {:7.3g} s\n", g.names[a], 100 * g.occupancy[a],
                     g.stay_mean_s[a], entries, g.return_mean_s[a]);
  }
  std::string moves;
  for (size_t a = 0; a < n; ++a) {
    for (size_t b = 0; b < n; ++b) {
      if (a != b && g.transitions_per_hour[a * n + b] > 0.0) {
        moves += fmt::format("    {} -> {}: {:.1f} /h\n", g.names[a], g.names[b], g.transitions_per_hour[a * n + b]);
      }
    }
  }
  return s + "  passages between regimes per cell-hour:\n" + moves;
}

void write_field_h5(H5Writer& h5, const FieldStatistics& f, bool lists_elsewhere) {
  const std::string g = "/lifelines/fields/" + f.name;
  h5.write(g + "/threshold", f.threshold, f.unit.empty() ? "1" : f.unit);
  h5.write(g + "/outside_when", side(f));
  h5.write(g + "/time_outside", f.time_outside_fraction, "1");
  h5.attribute(g + "/time_outside", "meaning", "per cell: share of its time " + side(f) + " the threshold");
  h5.write(g + "/mean_time_outside", f.mean_time_outside_fraction, "1");
  h5.write(g + "/excursions_per_hour", f.excursions_per_hour, "1/h");
  if (lists_elsewhere) {
    h5.attribute(g + "/excursions_per_hour", "lists", "every excursion and interval: /lifelines/excursion_durations, /lifelines/between_excursions");
  } else {
    h5.write(g + "/excursion_durations", f.excursion_durations_s, "s");
    h5.write(g + "/between_excursions", f.between_excursions_s, "s");
  }
  h5.write(g + "/excursion_histogram_edges", f.excursion_histogram.edges, "s");
  h5.write(g + "/excursion_histogram_counts", f.excursion_histogram.counts, "1");
  h5.write(g + "/between_histogram_edges", f.between_histogram.edges, "s");
  h5.write(g + "/between_histogram_counts", f.between_histogram.counts, "1");
  h5.write(g + "/min_excursion", f.min_excursion_s, "s");
  h5.write(g + "/long_excursions_per_hour", f.long_excursions_per_hour, "1/h");
  h5.attribute(g + "/long_excursions_per_hour", "meaning", "completed excursions at least min_excursion long (0 when no minimum)");
  h5.write(g + "/long_excursion_durations", f.long_excursion_durations_s, "s");
  h5.write(g + "/between_long_excursions", f.between_long_excursions_s, "s");
  h5.attribute(g + "/between_long_excursions", "meaning", "from the end of one long excursion to the start of the next");
  h5.write(g + "/long_excursion_histogram_edges", f.long_excursion_histogram.edges, "s");
  h5.write(g + "/long_excursion_histogram_counts", f.long_excursion_histogram.counts, "1");
  h5.write(g + "/between_long_histogram_edges", f.between_long_histogram.edges, "s");
  h5.write(g + "/between_long_histogram_counts", f.between_long_histogram.counts, "1");
}

void write_regimes_h5(H5Writer& h5, const RegimeStatistics& g, const std::vector<int>& of_zone) {
  if (g.names.empty()) return;
  const size_t n = g.names.size();
  h5.write("/lifelines/regimes/names", g.names);
  h5.write("/lifelines/regimes/of_zone", of_zone, "1");
  h5.write("/lifelines/regimes/transitions_per_hour", g.transitions_per_hour, n, n, "1/h");
  h5.attribute("/lifelines/regimes/transitions_per_hour", "meaning", "row: regime left, column: regime entered; per cell-hour");
  h5.write("/lifelines/regimes/occupancy", g.occupancy, "1");
  h5.write("/lifelines/regimes/stay_mean", g.stay_mean_s, "s");
  std::vector<int> stays(g.stays.begin(), g.stays.end());
  h5.write("/lifelines/regimes/stays", stays, "1");
  h5.write("/lifelines/regimes/return_mean", g.return_mean_s, "s");
  h5.attribute("/lifelines/regimes/return_mean", "meaning", "mean time between two entries of a cell into the regime (circulation time)");
  for (size_t a = 0; a < n; ++a) {
    const std::string p = "/lifelines/regimes/" + g.names[a];
    h5.write(p + "/stay_histogram_edges", g.stay_histograms[a].edges, "s");
    h5.write(p + "/stay_histogram_counts", g.stay_histograms[a].counts, "1");
    h5.write(p + "/return_histogram_edges", g.return_histograms[a].edges, "s");
    h5.write(p + "/return_histogram_counts", g.return_histograms[a].counts, "1");
  }
}

}  // namespace

std::string lifeline_text(const LifelineResult& r, double critical) {
  std::string s = fmt::format("Lifelines: {} cells, {} moves between zones\n", r.cells, r.jumps);
  const FieldStatistics* d = r.field("do");
  const std::vector<double> none(r.cells, 0.0);
  const auto& below = d ? d->time_outside_fraction : none;
  s += fmt::format("  time below critical DO ({:.4f} mmol/L): mean {:.1f} %, P10 {:.1f} %, P90 {:.1f} % of a cell's time\n",
                   critical, 100 * (d ? d->mean_time_outside_fraction : 0.0), 100 * quantile(below, 0.1), 100 * quantile(below, 0.9));
  if (d) {
    s += field_text(*d);
  } else {
    s += "  no complete excursion below critical DO\n";
  }
  for (const auto& f : r.fields) {
    if (&f == d) continue;
    const auto& t = f.time_outside_fraction;
    s += fmt::format("  time {} {} ({:.4g} {}): mean {:.1f} %, P10 {:.1f} %, P90 {:.1f} % of a cell's time\n", side(f), f.label,
                     f.threshold * f.display_scale, f.display_unit, 100 * f.mean_time_outside_fraction, 100 * quantile(t, 0.1),
                     100 * quantile(t, 0.9));
    s += field_text(f);
  }
  return s + regime_text(r.regimes);
}

std::string lifeline_study_text(const Case& c, const LifelineStudy& s) {
  std::string out;
  if (s.frozen_at_s) {
    out += fmt::format("Frozen at t = {:.4g} h of the transient: speed {:.4g} rpm, gas {:.4g} Nm3/h, O2 {:.1f} %\n",
                       *s.frozen_at_s / 3600.0, 60 * s.at.operation.speed_rps, 3600 * s.at.operation.gas_flow_normal_m3_s,
                       100 * s.at.operation.oxygen_fraction);
    if (s.result.field("substrate") == nullptr) {
      out += "Note: the culture does not grow (no culture.growth_rate_max): no substrate field\n";
    }
  } else if (!s.run.field) {
    out += "Note: no gas, no DO field: residence statistics only\n";
  }
  out += fmt::format("{}\n{}", c.title, lifeline_text(s.result, c.culture.critical_do_mol_m3));
  if (!s.frozen_at_s && c.feed.enabled) {
    out += "  substrate along the paths: add --after T to follow the cells through a fed transient\n";
  }
  if (!s.cautions.empty()) {
    out += fmt::format("Cautions on the {} the cells see (defer to local codes and licensed practice)\n",
                       s.frozen_at_s ? "transient state" : "steady field");
    for (const auto& w : s.cautions) out += "  - " + w + "\n";
  }
  return out;
}

void write_lifelines_h5(H5Writer& h5, const LifelineResult& r, const LifelineOptions& o,
                        const LifelineRegimes& regimes) {
  h5.write("/lifelines/cells", std::vector<int>{o.cells}, "1");
  h5.write("/lifelines/duration", o.duration_s, "s");
  h5.write("/lifelines/seed", std::vector<int>{static_cast<int>(o.seed)}, "1");
  h5.write("/lifelines/occupancy", r.occupancy, "1");
  h5.attribute("/lifelines/occupancy", "meaning", "share of all cell time spent in each zone (long run: V_i / V)");
  h5.write("/lifelines/residence_time", r.residence_mean_s, "s");
  h5.attribute("/lifelines/residence_time", "meaning", "mean time per visit in each zone");
  // The DO statistics at their first paths (the field "do"; zeros and empty lists without it).
  const FieldStatistics* d = r.field("do");
  const FieldStatistics empty;
  const FieldStatistics& f = d ? *d : empty;
  h5.write("/lifelines/time_below_critical", d ? f.time_outside_fraction : std::vector<double>(r.cells, 0.0), "1");
  h5.write("/lifelines/mean_time_below_critical", f.mean_time_outside_fraction, "1");
  h5.write("/lifelines/excursions_per_hour", f.excursions_per_hour, "1/h");
  h5.write("/lifelines/excursion_durations", f.excursion_durations_s, "s");
  h5.write("/lifelines/between_excursions", f.between_excursions_s, "s");
  h5.write("/lifelines/excursion_histogram_edges", f.excursion_histogram.edges, "s");
  h5.write("/lifelines/excursion_histogram_counts", f.excursion_histogram.counts, "1");
  h5.write("/lifelines/between_histogram_edges", f.between_histogram.edges, "s");
  h5.write("/lifelines/between_histogram_counts", f.between_histogram.counts, "1");
  h5.write("/lifelines/min_excursion", o.min_excursion_s, "s");
  std::vector<std::string> names;
  for (const auto& x : r.fields) names.push_back(x.name);
  if (!names.empty()) h5.write("/lifelines/fields/names", names);
  for (const auto& x : r.fields) write_field_h5(h5, x, &x == d);
  write_regimes_h5(h5, r.regimes, regimes.of_zone);
}

void write_lifelines_csv(const std::string& cells_path, const std::string& paths_path, const LifelineResult& r,
                         const std::vector<double>& do_field) {
  std::ofstream cells(cells_path);
  const FieldStatistics* d = r.field("do");
  cells << "cell,time below critical DO [-]";
  for (const auto& f : r.fields) {
    if (&f != d) cells << ",time " << side(f) << " " << f.label << " [-]";
  }
  cells << "\n";
  for (int c = 0; c < r.cells; ++c) {
    cells << c << "," << fmt::format("{:.6g}", d ? d->time_outside_fraction[c] : 0.0);
    for (const auto& f : r.fields) {
      if (&f != d) cells << "," << fmt::format("{:.6g}", f.time_outside_fraction[c]);
    }
    cells << "\n";
  }
  finish_file(cells, cells_path);
  std::ofstream paths(paths_path);
  paths << "cell,time [s],zone,DO [mmol/L]\n";
  for (size_t c = 0; c < r.trajectories.size(); ++c) {
    const auto& t = r.trajectories[c];
    for (size_t i = 0; i < t.zone.size(); ++i) {
      paths << c << "," << fmt::format("{:.6g}", t.time_s[i]) << "," << t.zone[i] << ","
            << (do_field.empty() ? std::string() : fmt::format("{:.6g}", do_field[t.zone[i]])) << "\n";
    }
  }
  finish_file(paths, paths_path);
}

std::string lifeline_html(const LifelineResult& r, const ZoneNetwork& net, const std::vector<double>& do_field,
                          double critical, const std::vector<std::string>& cautions) {
  std::string s = "<h2>What cells experience</h2>\n<pre>" + svg::escape(lifeline_text(r, critical)) + "</pre>\n<div class=\"row\">\n";
  for (const auto& f : r.fields) {
    const std::string what = side(f) + " " + f.label;
    // From the lists themselves where the result keeps them, so that the bins are exact.
    const auto plot = [&](const std::string& title, const std::string& x_label, const std::vector<double>& raw,
                          const Histogram& h) {
      if (!raw.empty()) {
        s += duration_histogram(title, x_label, raw);
      } else if (!h.counts.empty()) {
        s += duration_histogram(title, x_label, h);
      }
    };
    plot("Excursions " + what, "duration [s]", f.excursion_durations_s, f.excursion_histogram);
    plot("Time between excursions " + what, "interval [s]", f.between_excursions_s, f.between_histogram);
    plot(fmt::format("Excursions {} of at least {:.3g} s", what, f.min_excursion_s), "duration [s]",
         f.long_excursion_durations_s, f.long_excursion_histogram);
    plot(fmt::format("Time between excursions of at least {:.3g} s", f.min_excursion_s), "interval [s]",
         f.between_long_excursions_s, f.between_long_histogram);
  }
  for (size_t a = 0; a < r.regimes.names.size(); ++a) {
    const auto& h = r.regimes.return_histograms[a];
    if (r.regimes.names[a].rfind("impeller", 0) == 0 && !h.counts.empty()) {
      s += duration_histogram("Time between entries into " + r.regimes.names[a], "interval [s]", h);
    }
  }
  if (!r.trajectories.empty() && !do_field.empty()) {
    const auto& t = r.trajectories.front();
    svg::Series series{"cell 0", {}, {}, "#1f77b4"};
    for (size_t i = 0; i < t.zone.size() && i < 4000; ++i) {
      series.x.push_back(t.time_s[i]);
      series.y.push_back(do_field[t.zone[i]]);
    }
    s += svg::line_chart("DO seen by one cell", "time [s]", "DO [mmol/L]", {series}, {{false, critical, "critical DO"}}, 620, 300);
  }
  std::vector<double> occ_ratio(net.size());
  const double v = net.total_volume();
  for (int k = 0; k < net.size(); ++k) occ_ratio[k] = r.occupancy[k] / (net.volume[k] / v);
  s += svg::zone_map(net, occ_ratio, "Occupancy / volume share", "-", {});
  s += "</div>\n";
  if (!cautions.empty()) {
    s += "<h3>Cautions</h3>\n<ul>\n";
    for (const auto& w : cautions) s += "<li>" + svg::escape(w) + "</li>\n";
    s += "</ul>\n";
  }
  return s;
}

}  // namespace oxystrat
