#include "postproc/report/mixing_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "postproc/report/number_format.hpp"
#include "postproc/report/svg_plot.hpp"
#include "postproc/report/verdict_output.hpp"

namespace oxystrat {
namespace {

using report::format_number;

// Time for the culture at its largest uptake to use the dissolved O2 of air saturation [s]; 0
// without uptake. A mixing time longer than this means the broth cannot stay uniform in O2
// (the usual regime comparison of mixing and reaction times; common practice).
double oxygen_use_time(const Case& c) {
  const double our = c.culture.biomass_kg_m3 * c.culture.q_o2_max_mol_kg_s;
  return our > 0.0 ? c.do_percent.reference_mol_m3 / our : 0.0;
}

std::string seconds(double t) { return format_number(t, 3, 1) + " s"; }

}  // namespace

std::string homogeneity_percent(double homogeneity) { return fmt::format("{:g}", std::round(1000.0 * homogeneity) / 10.0); }

std::string mixing_headline(const Case& c, const MixingResult& mix, double homogeneity) {
  const std::string pct = homogeneity_percent(homogeneity);
  const std::string what = mix.judged_volume_fraction < 1.0 ? "The broth inside the caverns" : "The whole vessel";
  std::string s = mix.reached ? fmt::format("{} mixes to {} % in {} ({} impeller turns).", what, pct, seconds(mix.theta_s),
                                            format_number(c.operation.speed_rps * mix.theta_s, 3, 0))
                              : fmt::format("The tracer did not mix to {} % within {}: the mixing time is longer.", pct,
                                            seconds(mix.theta_s));
  const double use = oxygen_use_time(c);
  if (use > 0.0) {
    s += mix.theta_s > use ? fmt::format(" The culture uses up air-saturated DO in {}, faster than that: expect O2 gradients.", seconds(use))
                           : fmt::format(" The culture needs {} to use up air-saturated DO: mixing keeps up.", seconds(use));
  }
  return s;
}

std::string mixing_report_body(const Case& c, const ZoneNetwork& net, const Hydrodynamics& hydro, const MixingResult& mix,
                               double homogeneity) {
  const double band = 1.0 - homogeneity;
  const double use = oxygen_use_time(c);
  const bool ok = mix.reached && (use <= 0.0 || mix.theta_s <= use);
  std::string detail = fmt::format("Tracer injected in zone {} (r {} m, z {} m); the probe in zone {} (r {} m, z {} m) reads it within "
                                   "+-{} % after {}.",
                                   mix.inject_zone, format_number(net.r[mix.inject_zone], 3, 2), format_number(net.z[mix.inject_zone], 3, 2),
                                   mix.probe_zone, format_number(net.r[mix.probe_zone], 3, 2), format_number(net.z[mix.probe_zone], 3, 2),
                                   format_number(100 * band, 2, 1), seconds(mix.theta_probe_s));
  if (hydro.stagnant_volume_fraction > 0.0) {
    detail += fmt::format(" {} % of the volume lies outside the impellers' caverns: stagnant, it exchanges by molecular "
                          "diffusion only (weeks) and the mixing time leaves it out.",
                          format_number(100 * hydro.stagnant_volume_fraction, 2, 1));
  }
  std::string s = verdict_box_html(ok, mixing_headline(c, mix, homogeneity), detail);
  s += "<div class=\"row\">\n";
  // The tracer at the probe, as c / c_final: it settles inside the band.
  svg::Series probe{"probe", mix.time_s, mix.probe, "#1f77b4"};
  s += svg::line_chart("Tracer at the probe", "time [s]", "c / c final [-]", {probe},
                       {{false, 1.0 + band, fmt::format("+{} %", format_number(100 * band, 2, 1))},
                        {false, 1.0 - band, fmt::format("-{} %", format_number(100 * band, 2, 1))},
                        {true, mix.theta_probe_s, "probe"}},
                       560, 340, 0.0);
  // The worst zone's deviation, capped at 100 %: a pulse starts hundreds of times the final value.
  std::vector<double> dev;
  for (double d : mix.max_deviation) dev.push_back(100.0 * std::min(d, 1.0));
  s += svg::line_chart("Farthest zone from uniform (capped at 100 %)", "time [s]", "largest deviation [%]",
                       {{mix.judged_volume_fraction < 1.0 ? "largest over the zones the flow reaches" : "largest over the zones", mix.time_s,
                         dev, "#d62728"}},
                       {{false, 100.0 * band, fmt::format("{} % band", format_number(100 * band, 2, 1))},
                        {true, mix.theta_s, theta_label(homogeneity)}},
                       560, 340, 0.0, 100.0);
  // The tracer in the section at the stored time nearest half the mixing time.
  if (!mix.snapshots.empty()) {
    size_t best = 0;
    for (size_t i = 0; i < mix.snapshot_time_s.size(); ++i) {
      if (std::abs(mix.snapshot_time_s[i] - 0.5 * mix.theta_s) < std::abs(mix.snapshot_time_s[best] - 0.5 * mix.theta_s)) best = i;
    }
    const auto& v = mix.snapshots[best];
    s += svg::zone_map(net, std::vector<double>(v.data(), v.data() + v.size()),
                       fmt::format("Tracer at t = {}", seconds(mix.snapshot_time_s[best])), "c / c final", {});
  }
  return s + "</div>\n";
}

}  // namespace oxystrat
