#include "solver/oxygen/transient_cautions.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "solver/oxygen/cautions.hpp"
#include "solver/oxygen/heat_balance.hpp"

namespace oxystrat {

std::vector<std::string> transient_cautions(const Case& c, const TransientResult& r) {
  std::vector<std::string> out;
  double o2_max = 0.0, pco2_max = 0.0, worst_below = 0.0, probe_ok_below = 0.0;
  for (const auto& s : r.trace) {
    o2_max = std::max(o2_max, s.oxygen_fraction);
    pco2_max = std::max(pco2_max, s.pco2_max_pa);
    worst_below = std::max(worst_below, s.volume_below_critical);
    if (s.probe_do >= c.culture.critical_do_mol_m3) probe_ok_below = std::max(probe_ok_below, s.volume_below_critical);
  }
  if (o2_max > 0.2095 + 0.01) {
    out.push_back(fmt::format("the inlet gas reached {:.0f} % O2: oxygen-enriched gas raises fire and explosion risk "
                              "(materials, lubricants, exhaust); follow local codes and the plant's O2 safety rules",
                              100 * o2_max));
  }
  if (auto w = pco2_caution(c.culture.kind, pco2_max); !w.empty()) out.push_back(std::move(w));
  if (probe_ok_below > 0.0) {
    out.push_back(fmt::format("the probe read at or above critical DO while up to {:.1f} % of the volume was below it: "
                              "the control loop sees its own zone only",
                              100 * probe_ok_below));
  }
  if (!r.trace.empty()) {
    const double fed = r.trace.back().fed_volume_m3;
    if (fed > 0.05 * r.working_volume_m3) {
      out.push_back(fmt::format("the feed added {:.3g} m3 ({:.0f} % of the working volume): the grid stays at the "
                                "initial fill, so the level rise and dilution are not modelled",
                                fed, 100 * fed / r.working_volume_m3));
    }
    const auto& last = r.trace.back();
    // The controller's own limits at the end: an event may have retuned them.
    if (c.control.enabled && last.controller_at_top) {
      out.push_back("the DO controller ended at the top of its cascade: the vessel cannot hold the set-point at this "
                    "uptake");
    }
  }
  double heat_peak = -1e300, heat_peak_t = 0.0;
  for (const auto& s : r.trace) {
    if (s.heat_load_w > heat_peak) heat_peak = s.heat_load_w, heat_peak_t = s.time_s;
  }
  if (const auto cooling = cooling_available_w(c); cooling && !r.trace.empty() && heat_peak > *cooling) {
    out.push_back(fmt::format("COOLING: the heat load reached {:.4g} kW at {:.0f} s, more than the {:.4g} kW the cooling "
                              "removes: the broth would warm (the run holds its temperature fixed)",
                              heat_peak / 1e3, heat_peak_t, *cooling / 1e3));
  }
  if (r.grows && worst_below > 0.0) {
    out.push_back(fmt::format("up to {:.1f} % of the volume was below critical DO; growth there is O2-limited",
                              100 * worst_below));
  }
  return out;
}

}  // namespace oxystrat
