#include "solver/oxygen/transient_events.hpp"

#include <fmt/format.h>

#include <string>

#include "input/errors.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {
namespace {

bool same_network(const ZoneNetwork& a, const ZoneNetwork& b) {
  return a.r_lines == b.r_lines && a.z_lines == b.z_lines && a.volume == b.volume;
}

// What the event changed that the run cannot take mid-way; empty when it may apply. The
// controller's actuators go by the key the event sets: a gas flow given in actual m3/h changes
// its normal value with a head-pressure event, which the controller's flow does not follow.
std::string what_cannot_change(const Case& before, const Case& after, const std::string& key,
                               const ZoneNetwork& net_before) {
  if (!same_network(net_before, build_zone_geometry(after))) {
    return "it changes the zone network (the vessel, an impeller's size, type or height, the sparger or the grid): "
           "a transient runs on one network; give the change in the case and start a new run";
  }
  if (after.control.enabled != before.control.enabled || after.feed.enabled != before.feed.enabled ||
      after.culture.grows() != before.culture.grows()) {
    return "it switches DO control, the feed or the culture's growth on or off, which the run fixes at its start";
  }
  if (after.control.probe_r_m != before.control.probe_r_m || after.control.probe_z_m != before.control.probe_z_m ||
      after.feed.r_m != before.feed.r_m || after.feed.z_m != before.feed.z_m) {
    return "it moves the DO probe or the feed point, which stay where they are for the whole run";
  }
  if (before.culture.grows() && (after.culture.biomass_kg_m3 != before.culture.biomass_kg_m3 ||
                                 after.culture.substrate_kg_m3 != before.culture.substrate_kg_m3)) {
    return "the biomass and substrate of a growing culture are the run's own state (they start from the case's values "
           "and then grow and are consumed zone by zone); change the uptake or the kinetics instead";
  }
  if (before.control.enabled &&
      (key == "operation.speed" || key == "operation.gas_flow" || key == "operation.oxygen_fraction")) {
    return "under DO control the speed, gas flow and O2 fraction are the controller's; change its limits "
           "(control.speed_min, control.gas_max, control.oxygen_max, ...) or its set-point instead";
  }
  return "";
}

}  // namespace

void check_transient_events(const LoadedCase& base, const std::vector<Override>& base_overrides) {
  const Case& c0 = base.data;
  if (c0.events.empty()) return;
  const ZoneNetwork net0 = build_zone_geometry(c0);
  std::vector<Override> applied = base_overrides;
  Case before = c0;
  for (size_t i = 0; i < c0.events.size(); ++i) {
    for (const auto& set : c0.events[i].sets) {
      applied.push_back(parse_override(set));
      const Case after = read_case_text(base.source_text, base.file_name, applied).data;
      const std::string why = what_cannot_change(before, after, applied.back().key, net0);
      if (!why.empty()) {
        throw CaseError(fmt::format("{}: event {} (at {:.6g} h) sets '{}': {}", base.file_name, i,
                                    c0.events[i].time_s / 3600.0, set, why));
      }
      before = after;
    }
  }
}

}  // namespace oxystrat
