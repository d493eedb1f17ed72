#include "lifeline_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>
#include <stdexcept>

#include "svg_plot.hpp"
#include "uncertainty.hpp"

namespace oxystrat {
namespace {

std::vector<std::string> bin_labels(const Histogram& h) {
  std::vector<std::string> labels;
  for (size_t i = 0; i + 1 < h.edges.size(); ++i) labels.push_back(i % 4 == 0 ? fmt::format("{:.3g}", h.edges[i]) : "");
  return labels;
}

}  // namespace

std::string lifeline_text(const LifelineResult& r, double critical) {
  std::string s = fmt::format("Lifelines: {} cells, {} moves between zones\n", r.time_below_fraction.size(), r.jumps);
  s += fmt::format("  time below critical DO ({:.4f} mmol/L): mean {:.1f} %, P10 {:.1f} %, P90 {:.1f} % of a cell's time\n",
                   critical, 100 * r.mean_time_below_fraction, 100 * quantile(r.time_below_fraction, 0.1),
                   100 * quantile(r.time_below_fraction, 0.9));
  if (!r.excursion_durations_s.empty()) {
    s += fmt::format("  excursions below critical: {:.1f} per cell-hour; duration median {:.3g} s, P90 {:.3g} s, max {:.3g} s\n",
                     r.excursions_per_hour, quantile(r.excursion_durations_s, 0.5), quantile(r.excursion_durations_s, 0.9),
                     *std::max_element(r.excursion_durations_s.begin(), r.excursion_durations_s.end()));
  } else {
    s += "  no complete excursion below critical DO\n";
  }
  if (!r.between_excursions_s.empty()) {
    s += fmt::format("  time between excursions: median {:.3g} s, P90 {:.3g} s\n", quantile(r.between_excursions_s, 0.5),
                     quantile(r.between_excursions_s, 0.9));
  }
  return s;
}

void write_lifelines_h5(H5Writer& h5, const LifelineResult& r, const LifelineOptions& o) {
  h5.write("/lifelines/cells", std::vector<int>{o.cells}, "1");
  h5.write("/lifelines/duration", o.duration_s, "s");
  h5.write("/lifelines/seed", std::vector<int>{static_cast<int>(o.seed)}, "1");
  h5.write("/lifelines/occupancy", r.occupancy, "1");
  h5.attribute("/lifelines/occupancy", "meaning", "share of all cell time spent in each zone (long run: V_i / V)");
  h5.write("/lifelines/residence_time", r.residence_mean_s, "s");
  h5.attribute("/lifelines/residence_time", "meaning", "mean time per visit in each zone");
  h5.write("/lifelines/time_below_critical", r.time_below_fraction, "1");
  h5.write("/lifelines/mean_time_below_critical", r.mean_time_below_fraction, "1");
  h5.write("/lifelines/excursions_per_hour", r.excursions_per_hour, "1/h");
  h5.write("/lifelines/excursion_durations", r.excursion_durations_s, "s");
  h5.write("/lifelines/between_excursions", r.between_excursions_s, "s");
  h5.write("/lifelines/excursion_histogram_edges", r.excursion_histogram.edges, "s");
  h5.write("/lifelines/excursion_histogram_counts", r.excursion_histogram.counts, "1");
  h5.write("/lifelines/between_histogram_edges", r.between_histogram.edges, "s");
  h5.write("/lifelines/between_histogram_counts", r.between_histogram.counts, "1");
}

void write_lifelines_csv(const std::string& cells_path, const std::string& paths_path, const LifelineResult& r,
                         const std::vector<double>& do_field) {
  std::ofstream cells(cells_path);
  cells << "cell,time below critical DO [-]\n";
  for (size_t c = 0; c < r.time_below_fraction.size(); ++c) cells << c << "," << fmt::format("{:.6g}", r.time_below_fraction[c]) << "\n";
  if (!cells) throw std::runtime_error("cannot write " + cells_path);
  std::ofstream paths(paths_path);
  paths << "cell,time [s],zone,DO [mmol/L]\n";
  for (size_t c = 0; c < r.trajectories.size(); ++c) {
    const auto& t = r.trajectories[c];
    for (size_t i = 0; i < t.zone.size(); ++i) {
      paths << c << "," << fmt::format("{:.6g}", t.time_s[i]) << "," << t.zone[i] << ","
            << (do_field.empty() ? std::string() : fmt::format("{:.6g}", do_field[t.zone[i]])) << "\n";
    }
  }
  if (!paths) throw std::runtime_error("cannot write " + paths_path);
}

std::string lifeline_html(const LifelineResult& r, const ZoneNetwork& net, const std::vector<double>& do_field,
                          double critical) {
  std::string s = "<h2>What cells experience</h2>\n<pre>" + svg::escape(lifeline_text(r, critical)) + "</pre>\n<div class=\"row\">\n";
  if (!r.excursion_histogram.counts.empty()) {
    s += svg::bar_chart("Excursions below critical DO", "number", bin_labels(r.excursion_histogram), {"duration [s], log bins"},
                        {r.excursion_histogram.counts});
  }
  if (!r.between_histogram.counts.empty()) {
    s += svg::bar_chart("Time between excursions", "number", bin_labels(r.between_histogram), {"interval [s], log bins"},
                        {r.between_histogram.counts});
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
  return s + "</div>\n";
}

}  // namespace oxystrat
