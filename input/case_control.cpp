#include "input/case_sections.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "physics/vessel_shape.hpp"

namespace oxystrat::detail {
namespace {

// A point given by radius and height must lie in the broth, not in the steel of the bottom head,
// where no zone would hold it.
void require_above_the_head(const TomlSource& src, const Case& c, const std::string& height_key, double r, double z) {
  const double floor = VesselShape(c.vessel.diameter_m, c.vessel.bottom).bottom_height(r);
  if (z < floor) {
    src.fail(height_key, fmt::format("the point at r = {:.4g} m, z = {:.4g} m lies in the vessel bottom: the head "
                                     "surface is {:.4g} m high at that radius; raise it or move it inwards",
                                     r, z, floor));
  }
}

}  // namespace

void read_feed(TomlSource& src, Case& c) {
  src.allow_table("feed");
  if (!src.has("feed")) return;
  auto& f = c.feed;
  f.enabled = true;
  const double h = c.vessel.liquid_height_m, r = 0.5 * c.vessel.diameter_m;
  f.r_m = src.quantity_or("feed.radius", Dimension::length, {0.0, r}, 0.0);
  f.z_m = src.quantity_or("feed.height", Dimension::length, {0.0, h}, h);
  require_above_the_head(src, c, "feed.height", f.r_m, f.z_m);
  f.concentration_kg_m3 = src.require_quantity("feed.concentration", Dimension::biomass, {0.0, 2000.0, true}, "500 g/L");
  const size_t n = src.list_size("feed.times");
  if (n == 0) src.missing("feed.times", "the profile times, e.g. times = [\"0 h\", \"8 h\"]");
  if (src.list_size("feed.rates") != n) {
    src.fail("feed.rates", fmt::format("must have as many entries as feed.times ({})", n));
  }
  for (size_t i = 0; i < n; ++i) {
    const auto ti = fmt::format("feed.times.{}", i), ri = fmt::format("feed.rates.{}", i);
    f.time_s.push_back(src.require_quantity(ti, Dimension::time, {0.0, 1e8}, "2 h"));
    f.rate_m3_s.push_back(src.require_quantity(ri, Dimension::volume_flow, {0.0, 10.0}, "300 L/h"));
    if (i > 0 && f.time_s[i] <= f.time_s[i - 1]) src.fail(ti, "the profile times must increase");
  }
  if (!c.culture.grows()) {
    src.fail("feed", "a substrate feed needs a growing culture: set culture.growth_rate_max (e.g. \"0.3 1/h\")");
  }
}

void read_constraints(TomlSource& src, Case& c) {
  src.allow_table("constraints");
  auto& k = c.constraints;
  if (const auto t = src.string("constraints.min_do"); t && *t != "critical") {
    k.min_do_mol_m3 = read_o2_concentration(src, "constraints.min_do", c, {0.0, 2.0}, "critical");
  }
  k.max_volume_below_critical = src.number("constraints.max_volume_below_critical", {0.0, 1.0}).value_or(0.0);
  k.max_tip_speed_m_s = src.quantity("constraints.max_tip_speed", Dimension::velocity, {0.0, 50.0, true});
  k.max_power_per_volume_w_m3 = src.quantity("constraints.max_power_per_volume", Dimension::power_density, {0.0, 1e5, true});
  k.max_pco2_pa = read_partial_pressure(src, "constraints.max_pco2");
  k.allow_flooding = src.boolean("constraints.allow_flooding").value_or(false);
}

void read_control(TomlSource& src, Case& c) {
  src.allow_table("control");
  auto& k = c.control;
  k.enabled = src.boolean("control.enabled").value_or(src.has("control"));
  if (src.has("control.setpoint")) k.setpoint_mol_m3 = read_o2_concentration(src, "control.setpoint", c, {0.0, 2.0}, "30 %");
  if (k.enabled && !src.has("control.setpoint")) src.missing("control.setpoint", "the DO set-point, e.g. setpoint = \"30 %\"");
  const double h = c.vessel.liquid_height_m, r = 0.5 * c.vessel.diameter_m;
  k.probe_r_m = src.quantity_or("control.probe_radius", Dimension::length, {0.0, r}, 0.9 * r);
  // By default a quarter of the way up, and in any case clear of a dished bottom at the probe's radius.
  const double floor = VesselShape(c.vessel.diameter_m, c.vessel.bottom).bottom_height(k.probe_r_m);
  k.probe_z_m = src.quantity_or("control.probe_height", Dimension::length, {0.0, h},
                                std::min(h, std::max(0.25 * h, floor + 0.1 * h)));
  require_above_the_head(src, c, "control.probe_height", k.probe_r_m, k.probe_z_m);
  k.gain = src.number("control.gain", {0.0, 1000.0}).value_or(k.gain);
  k.integral_time_s = src.quantity_or("control.integral_time", Dimension::time, {1.0, 1e6}, k.integral_time_s);
  k.derivative_time_s = src.quantity_or("control.derivative_time", Dimension::time, {0.0, 3600.0}, 0.0);
  k.interval_s = src.quantity_or("control.interval", Dimension::time, {0.1, 3600.0}, k.interval_s);
  k.speed_min_rps = src.quantity_or("control.speed_min", Dimension::speed, {0.0, 50.0}, c.operation.speed_rps);
  k.speed_max_rps = src.quantity_or("control.speed_max", Dimension::speed, {0.0, 50.0}, k.speed_min_rps);
  if (const auto g = src.string("control.gas_min")) k.gas_min_m3_s = read_gas_flow(src, "control.gas_min", c.vessel);
  if (const auto g = src.string("control.gas_max")) k.gas_max_m3_s = read_gas_flow(src, "control.gas_max", c.vessel);
  k.oxygen_max = src.number("control.oxygen_max", {0.0, 1.0}).value_or(-1.0);
  src.allow_table("event");
  for (size_t i = 0; i < src.array_size("event"); ++i) {
    const std::string p = fmt::format("event.{}.", i);
    EventSpec e;
    e.time_s = src.require_quantity(p + "time", Dimension::time, {0.0, 1e8}, "2 h");
    const auto set = src.string(p + "set");
    if (!set) src.missing(p + "set", "the key it changes, e.g. set = \"culture.biomass=30 g/L\"");
    e.sets.push_back(*set);
    c.events.push_back(e);
  }
}

}  // namespace oxystrat::detail
