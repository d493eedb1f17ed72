#include "input/case_reader.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <numbers>
#include <sstream>

#include "input/limits_reader.hpp"
#include "input/toml_source.hpp"
#include "physics/solubility.hpp"
#include "physics/vessel_shape.hpp"

namespace oxystrat {
namespace {

using detail::Range;
using detail::TomlSource;
using units::Dimension;

constexpr double kInf = 1e300;

// Gas flow: the unit decides the basis. vvm and N-prefixed units are normal volumes (0 degC,
// 1 atm); plain volume units are actual volumes at head-space pressure and broth temperature.
double read_gas_flow(TomlSource& src, const std::string& path, const Vessel& v) {
  const auto text = src.string(path);
  if (!text) return 0.0;
  units::Split q;
  try {
    q = units::split(*text);
  } catch (const UnitError& e) {
    src.fail(path, e.what());
  }
  struct GasUnit {
    const char* name;
    double m3_s;
    bool normal;
  };
  static const GasUnit table[] = {{"Nm3/h", 1.0 / 3600, true},   {"Nm3/min", 1.0 / 60, true},
                                  {"Nm3/s", 1.0, true},          {"NL/min", 1e-3 / 60, true},
                                  {"m3/h", 1.0 / 3600, false},   {"m3/min", 1.0 / 60, false},
                                  {"m3/s", 1.0, false},          {"L/min", 1e-3 / 60, false}};
  double normal_m3_s = 0.0;
  if (q.unit == "vvm") normal_m3_s = q.value * v.working_volume_m3 / 60.0;
  for (const auto& u : table) {
    if (q.unit != u.name) continue;
    const double flow = q.value * u.m3_s;
    normal_m3_s = u.normal ? flow
                           : flow * (v.head_pressure_pa / units::standard_atmosphere_pa) *
                                 (units::zero_celsius_k / v.temperature_k);
  }
  const bool known = q.unit == "vvm" || std::any_of(std::begin(table), std::end(table), [&](const GasUnit& u) { return q.unit == u.name; });
  if (!known) {
    src.fail(path, fmt::format("{} unit '{}'; expected vvm, Nm3/h, Nm3/min, Nm3/s, NL/min (normal: 0 degC, "
                               "1 atm), or m3/h, m3/min, m3/s, L/min (actual, at head pressure and broth "
                               "temperature)",
                               q.unit.empty() ? "missing" : "unknown", q.unit));
  }
  const double vvm = normal_m3_s * 60.0 / v.working_volume_m3;
  if (q.value < 0.0 || vvm > 5.0) {
    src.fail(path, fmt::format("out of range: {:.4g} vvm (normal); allowed 0 to 5 vvm", vvm));
  }
  return normal_m3_s;
}

// A dissolved-O2 concentration: molar or mass units, or "% air saturation" (at 1 atm, vessel
// temperature, with the broth's salting-out).
double read_o2_concentration(TomlSource& src, const std::string& path, const Case& c, Range range,
                             const std::string& example) {
  const auto text = src.string(path);
  if (!text) src.missing(path, fmt::format("e.g. {} = \"{}\"", path.substr(path.rfind('.') + 1), example));
  units::Split q;
  try {
    q = units::split(*text);
  } catch (const UnitError& e) {
    src.fail(path, e.what());
  }
  double si = 0.0;
  if (q.unit == "% air saturation" || q.unit == "% sat" || q.unit == "%") {
    si = q.value * 0.01 * c.do_percent.reference_mol_m3;
  } else {
    try {
      si = units::to_si(Dimension::concentration, q, physics::molar_mass_o2);
    } catch (const UnitError& e) {
      src.fail(path, std::string(e.what()) + ", or % air saturation");
    }
  }
  if (si < range.lo || si > range.hi) {
    src.fail(path, fmt::format("out of range: {:.4g} mmol/L; allowed {:g} to {:g} mmol/L", si, range.lo, range.hi));
  }
  return si;
}

void read_vessel(TomlSource& src, Case& c) {
  src.allow_table("vessel");
  if (!src.has("vessel")) src.missing("vessel", "the [vessel] table");
  auto& v = c.vessel;
  v.diameter_m = src.require_quantity("vessel.diameter", Dimension::length, {0.05, 20.0}, "3.2 m");
  const auto bottom = src.choice("vessel.bottom", {"flat", "ellipsoidal", "hemispherical"}).value_or("ellipsoidal");
  v.bottom = bottom == "flat" ? BottomShape::flat
             : bottom == "hemispherical" ? BottomShape::hemispherical
                                         : BottomShape::ellipsoidal;
  const VesselShape shape(v.diameter_m, v.bottom);
  const auto height = src.quantity("vessel.liquid_height", Dimension::length, {0.0, 120.0, true});
  const auto volume = src.quantity("vessel.working_volume", Dimension::volume, {0.0, 5000.0, true});
  if (height && volume) {
    src.fail("vessel.working_volume", "give either liquid_height or working_volume, not both");
  }
  if (!height && !volume) {
    src.missing("vessel.liquid_height", "or vessel.working_volume; e.g. liquid_height = \"8 m\"");
  }
  v.liquid_height_m = height ? *height : shape.height_for_volume(*volume);
  v.working_volume_m3 = shape.volume_below(v.liquid_height_m);
  const double ht = v.liquid_height_m / v.diameter_m;
  if (ht < 0.5 || ht > 6.0) {
    src.fail(height ? "vessel.liquid_height" : "vessel.working_volume",
             fmt::format("liquid height / diameter H/T = {:.3g} (H = {:.4g} m, T = {:.4g} m) is outside the "
                         "supported 0.5 to 6",
                         ht, v.liquid_height_m, v.diameter_m));
  }
  v.baffles = src.integer("vessel.baffles", 0, 8).value_or(4);
  v.baffle_width_m = src.quantity("vessel.baffle_width", Dimension::length, {0.0, 0.2 * v.diameter_m})
                         .value_or(v.baffles > 0 ? 0.1 * v.diameter_m : 0.0);
  if (v.baffles > 0 && v.baffle_width_m <= 0.0) {
    src.fail("vessel.baffle_width", "must be more than 0 m when baffles > 0");
  }
  v.head_pressure_pa = src.quantity_or("vessel.head_pressure", Dimension::pressure, {0.2e5, 20e5},
                                       units::standard_atmosphere_pa);
  v.pressure_rating_pa = src.quantity_or("vessel.pressure_rating", Dimension::pressure, {1e5, 200e5}, 0.0);
  v.temperature_k = src.quantity_or("vessel.temperature", Dimension::temperature, {273.15, 353.15}, 310.15);
  if (const auto side = src.quantity("vessel.straight_side", Dimension::length, {0.0, 150.0, true})) {
    v.shell_top_m = shape.head_depth() + *side;
    if (v.shell_top_m <= v.liquid_height_m) {
      src.fail("vessel.straight_side", fmt::format("the shell ends at {:.4g} m, at or below the liquid surface at "
                                                   "{:.4g} m; give the length of the cylindrical shell",
                                                   v.shell_top_m, v.liquid_height_m));
    }
  }
}

void read_impellers(TomlSource& src, Case& c) {
  src.allow_table("impeller");
  const size_t n = src.array_size("impeller");
  if (n == 0) src.missing("impeller", "at least one [[impeller]] table, listed bottom to top");
  if (n > 12) src.fail("impeller", fmt::format("{} impellers; at most 12 are supported", n));
  const double t = c.vessel.diameter_m;
  for (size_t i = 0; i < n; ++i) {
    const std::string p = fmt::format("impeller.{}.", i);
    Impeller imp;
    std::vector<std::string> names;
    for (const auto& d : impeller_types()) names.emplace_back(d.name);
    const auto type = src.choice(p + "type", names);
    if (!type) src.missing(p + "type", impeller_type_names());
    impeller_type_from_name(*type, imp.type);
    const auto& def = impeller_data(imp.type);
    imp.diameter_m = src.require_quantity(p + "diameter", Dimension::length, {0.0, t, true}, "1.1 m");
    imp.elevation_m = src.require_quantity(p + "elevation", Dimension::length, {0.0, c.vessel.liquid_height_m, true},
                                           "1.2 m");
    imp.blades = src.integer(p + "blades", 2, 12).value_or(def.blades);
    imp.blade_height_m = src.quantity(p + "blade_height", Dimension::length, {0.0, imp.diameter_m, true})
                             .value_or(def.band_height_ratio * imp.diameter_m);
    imp.power_number = src.number(p + "power_number", {0.05, 20.0});
    imp.flow_number = src.number(p + "flow_number", {0.05, 3.0});
    imp.gassed_power_factor = src.number(p + "gassed_power_factor", {0.05, 1.0});
    imp.circulation_factor = src.number(p + "circulation_factor", {1.0, 6.0});
    c.impellers.push_back(imp);
  }
}

void read_sparger(TomlSource& src, Case& c) {
  src.allow_table("sparger");
  c.has_sparger = src.has("sparger");
  if (!c.has_sparger) return;
  const auto type = src.choice("sparger.type", {"ring", "pipe", "porous"});
  if (!type) src.missing("sparger.type", "ring | pipe | porous");
  auto& s = c.sparger;
  s.type = *type == "ring" ? SpargerType::ring : *type == "pipe" ? SpargerType::pipe : SpargerType::porous;
  s.elevation_m = src.require_quantity("sparger.elevation", Dimension::length, {0.0, c.vessel.liquid_height_m, true},
                                       "0.6 m");
  s.diameter_m = src.require_quantity("sparger.diameter", Dimension::length, {0.0, c.vessel.diameter_m, true}, "0.9 m");
  if (s.type == SpargerType::porous) {
    s.pore_diameter_m = src.require_quantity("sparger.pore_diameter", Dimension::length, {1e-7, 1e-3, false},
                                             "20 um");
  } else {
    s.hole_diameter_m = src.quantity("sparger.hole_diameter", Dimension::length, {1e-4, 0.1, false}).value_or(0.0);
    // Without a count: holes about ten hole diameters apart round a ring, one open pipe end.
    const int spaced = s.hole_diameter_m > 0.0 && s.type == SpargerType::ring
                           ? static_cast<int>(std::numbers::pi * s.diameter_m / (10.0 * s.hole_diameter_m))
                           : 1;
    s.holes = src.integer("sparger.holes", 1, 100000).value_or(std::max(1, spaced));
  }
}

void read_operation(TomlSource& src, Case& c) {
  src.allow_table("operation");
  if (!src.has("operation")) src.missing("operation", "the [operation] table with at least speed");
  auto& o = c.operation;
  o.speed_rps = src.require_quantity("operation.speed", Dimension::speed, {0.0, 50.0, true}, "120 rpm");
  o.gas_flow_normal_m3_s = read_gas_flow(src, "operation.gas_flow", c.vessel);
  o.oxygen_fraction = src.number("operation.oxygen_fraction", {0.0, 1.0}).value_or(physics::air_o2_fraction);
  o.co2_fraction = src.number("operation.co2_fraction", {0.0, 0.2}).value_or(0.00042);
  if (o.oxygen_fraction + o.co2_fraction > 1.0) {
    src.fail("operation.co2_fraction", "oxygen_fraction + co2_fraction must not exceed 1");
  }
  if (o.gas_flow_normal_m3_s > 0.0 && !c.has_sparger) {
    src.fail("operation.gas_flow", "gas is sparged but the case has no [sparger] table");
  }
}

// What 100 % DO means ([do_calibration]): air at 1 atm, or the probe's in-vessel calibration.
void read_do_calibration(TomlSource& src, Case& c) {
  src.allow_table("do_calibration");
  auto& b = c.do_percent;
  const double t = c.vessel.temperature_k;
  const double salt = physics::salting_out_factor(physics::Gas::o2, t, c.broth.ions_mol_m3);
  b.in_vessel = src.choice("do_calibration.basis", {"air-1atm", "in-vessel"}).value_or("air-1atm") == "in-vessel";
  if (!b.in_vessel) {
    b.reference_mol_m3 = physics::o2_saturation_air_1atm(t) * salt;
    b.label = "% of air saturation at 1 atm";
    return;
  }
  const double h = c.vessel.liquid_height_m;
  b.probe_height_m = src.quantity("do_calibration.probe_height", Dimension::length, {0.0, h, true}).value_or(0.25 * h);
  b.gas_o2_fraction = src.choice("do_calibration.gas", {"air", "inlet"}).value_or("air") == "inlet"
                          ? c.operation.oxygen_fraction
                          : physics::air_o2_fraction;
  const double p = c.vessel.head_pressure_pa + c.broth.density_kg_m3 * 9.80665 * (h - b.probe_height_m);
  b.reference_mol_m3 = physics::henry_o2(t) * salt * b.gas_o2_fraction * (p - physics::water_vapour_pressure(t));
  b.label = fmt::format("% of in-vessel saturation ({:.3g} % O2 at {:.4g} bar(a), probe at {:.3g} m)",
                        100.0 * b.gas_o2_fraction, p / 1e5, b.probe_height_m);
}

// The flow curve: newtonian (broth.viscosity), power-law (consistency, flow_index),
// herschel-bulkley (yield_stress, consistency, flow_index) or casson (yield_stress, viscosity).
void read_rheology(TomlSource& src, Broth& b) {
  auto& r = b.rheology;
  const auto kind = src.choice("broth.rheology", {"newtonian", "power-law", "herschel-bulkley", "casson"}).value_or("newtonian");
  r.kind = kind == "power-law"          ? RheologyKind::power_law
           : kind == "herschel-bulkley" ? RheologyKind::herschel_bulkley
           : kind == "casson"           ? RheologyKind::casson
                                        : RheologyKind::newtonian;
  r.viscosity_pa_s = b.viscosity_pa_s;
  const bool power = r.kind == RheologyKind::power_law || r.kind == RheologyKind::herschel_bulkley;
  const bool yield = r.kind == RheologyKind::herschel_bulkley || r.kind == RheologyKind::casson;
  // Every key is read and checked; those of another flow curve are then ignored with a note.
  const auto k = src.quantity("broth.consistency", Dimension::consistency, {1e-4, 1000.0});
  const auto n = src.number("broth.flow_index", {0.05, 1.5});
  const auto tau = src.quantity("broth.yield_stress", Dimension::stress, {0.0, 1000.0});
  if (power) {
    if (!k) src.missing("broth.consistency", "the consistency K, e.g. consistency = \"2 Pa s^n\"");
    if (!n) src.missing("broth.flow_index", "the power-law index n, e.g. flow_index = 0.4");
    r.consistency = *k;
    r.flow_index = *n;
  }
  if (yield) {
    if (!tau) src.missing("broth.yield_stress", "the yield stress, e.g. yield_stress = \"5 Pa\"");
    r.yield_stress_pa = *tau;
  }
}

// Keys of another flow curve (left over when --set switches broth.rheology) are ignored, with a note.
void note_unused_rheology_keys(const TomlSource& src, const Case& c, std::vector<std::string>& notes) {
  const auto kind = c.broth.rheology.kind;
  const bool power = kind == RheologyKind::power_law || kind == RheologyKind::herschel_bulkley;
  const bool yield = kind == RheologyKind::herschel_bulkley || kind == RheologyKind::casson;
  for (const auto& [key, used] : {std::pair{"broth.consistency", power}, std::pair{"broth.flow_index", power},
                                  std::pair{"broth.yield_stress", yield}}) {
    if (!used && src.has(key)) notes.push_back(fmt::format("{} is ignored: it does not apply to a {} broth", key, to_string(kind)));
  }
}

void read_broth(TomlSource& src, Case& c) {
  src.allow_table("broth");
  auto& b = c.broth;
  b.density_kg_m3 = src.quantity_or("broth.density", Dimension::density, {500.0, 2000.0}, 1000.0);
  b.viscosity_pa_s = src.quantity_or("broth.viscosity", Dimension::viscosity, {2e-4, 10.0}, 1e-3);
  read_rheology(src, b);
  const auto coal = src.choice("broth.coalescence", {"coalescing", "non-coalescing"}).value_or("coalescing");
  b.coalescence = coal == "coalescing" ? Coalescence::coalescing : Coalescence::non_coalescing;
  src.allow_table("broth.ions");
  for (const auto& ion : src.keys("broth.ions")) {
    const std::string p = "broth.ions." + ion;
    if (!physics::known_ion(ion)) {
      src.fail(p, fmt::format("unknown ion; known ions are {} (quote the key: \"Na+\" = \"0.15 mol/L\")",
                              physics::known_ions()));
    }
    b.ions_mol_m3[ion] = *src.quantity(p, Dimension::concentration, {0.0, 5000.0});
  }
}

void read_culture(TomlSource& src, Case& c) {
  src.allow_table("culture");
  if (!src.has("culture")) return;
  auto& k = c.culture;
  k.biomass_kg_m3 = src.require_quantity("culture.biomass", Dimension::biomass, {0.0, 300.0}, "40 g/L");
  k.q_o2_max_mol_kg_s = src.require_quantity("culture.q_o2_max", Dimension::specific_rate,
                                             {0.0, 100.0 / 3600.0}, "8 mmol/g/h");
  k.k_o2_mol_m3 = read_o2_concentration(src, "culture.k_o2", c, {0.0, 1.0}, "0.003 mmol/L");
  k.critical_do_mol_m3 = read_o2_concentration(src, "culture.critical_do", c, {0.0, 2.0}, "0.01 mmol/L");
  k.rq = src.number("culture.rq", {0.0, 3.0}).value_or(1.0);
  k.growth_rate_max_s = src.quantity_or("culture.growth_rate_max", Dimension::rate, {0.0, 5.0 / 3600.0}, 0.0);
  k.k_substrate_kg_m3 = src.quantity_or("culture.k_substrate", Dimension::biomass, {0.0, 100.0}, 0.0);
  k.yield_substrate = src.quantity_or("culture.yield_substrate", Dimension::mass_yield, {0.0, 5.0, true}, 0.5);
  k.yield_oxygen = src.quantity_or("culture.yield_oxygen", Dimension::mass_yield, {0.0, 20.0}, 0.0);
  k.maintenance_substrate_s =
      src.quantity_or("culture.maintenance_substrate", Dimension::mass_specific_rate, {0.0, 1.0 / 3600.0}, 0.0);
  k.maintenance_o2_mol_kg_s =
      src.quantity_or("culture.maintenance_o2", Dimension::specific_rate, {0.0, 20.0 / 3600.0}, 0.0);
  k.substrate_kg_m3 = src.quantity_or("culture.substrate", Dimension::biomass, {0.0, 1000.0}, 0.0);
  if (k.grows() && k.yield_oxygen == 0.0 && k.q_o2_max_mol_kg_s <= k.maintenance_o2_mol_kg_s) {
    src.fail("culture.maintenance_o2", "must be below culture.q_o2_max when culture.yield_oxygen is derived from them");
  }
}

void read_feed(TomlSource& src, Case& c) {
  src.allow_table("feed");
  if (!src.has("feed")) return;
  auto& f = c.feed;
  f.enabled = true;
  const double h = c.vessel.liquid_height_m, r = 0.5 * c.vessel.diameter_m;
  f.r_m = src.quantity_or("feed.radius", Dimension::length, {0.0, r}, 0.0);
  f.z_m = src.quantity_or("feed.height", Dimension::length, {0.0, h}, h);
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

// A partial pressure needs no (a)/(g): it is absolute by nature.
std::optional<double> read_partial_pressure(TomlSource& src, const std::string& path) {
  const auto text = src.string(path);
  if (!text) return std::nullopt;
  std::string t = *text;
  if (t.find("(a)") == std::string::npos && t.find("(g)") == std::string::npos) t += "(a)";
  try {
    const double p = units::parse(Dimension::pressure, t);
    if (p <= 0.0 || p > 1e6) src.fail(path, "out of range: allowed more than 0 and at most 10 bar");
    return p;
  } catch (const UnitError& e) {
    src.fail(path, e.what());
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
  k.probe_z_m = src.quantity_or("control.probe_height", Dimension::length, {0.0, h}, 0.25 * h);
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

void read_numerics(TomlSource& src, Case& c) {
  src.allow_table("grid");
  c.grid.radial = src.integer("grid.radial", 1, 2000).value_or(c.grid.radial);
  c.grid.axial = src.integer("grid.axial", 1, 20000).value_or(c.grid.axial);
  if (static_cast<long>(c.grid.radial) * c.grid.axial > 4'000'000) {
    src.fail("grid.axial", fmt::format("grid.radial x grid.axial = {} zones; at most 4,000,000 are supported",
                                       static_cast<long>(c.grid.radial) * c.grid.axial));
  }
  src.allow_table("output");
  c.output.sectors = src.integer("output.sectors", 3, 360).value_or(c.output.sectors);
  src.allow_table("model");
  auto& m = c.model;
  m.exchange_constant = src.number("model.exchange_constant", {0.0, 100.0}).value_or(0.0);
  m.mixing_length_ratio = src.number("model.mixing_length_ratio", {0.0, 1.0}).value_or(0.0);
  m.discharge_power_share = src.number("model.discharge_power_share", {0.0, 0.9}).value_or(m.discharge_power_share);
  m.upper_gas_share = src.number("model.upper_gas_share", {0.0, 1.0}).value_or(m.upper_gas_share);
  m.slip_velocity_m_s = src.quantity_or("model.slip_velocity", Dimension::velocity, {0.05, 1.0}, m.slip_velocity_m_s);
  const auto km = src.choice("model.kla_model", {"local-correlation", "mechanistic"}).value_or("local-correlation");
  m.kla_model = km == "mechanistic" ? KlaModel::mechanistic : KlaModel::local_correlation;
  m.kla_prefactor = src.number("model.kla_prefactor", {0.0, 10.0}).value_or(0.0);
  m.kla_power_exponent = src.number("model.kla_power_exponent", {0.0, 1.5}).value_or(0.0);
  m.kla_gas_exponent = src.number("model.kla_gas_exponent", {0.0, 1.5}).value_or(0.0);
  m.bubble_diameter_m = src.quantity_or("model.bubble_diameter", Dimension::length, {1e-4, 0.02}, 0.0);
  m.kla_factor = src.number("model.kla_factor", {0.01, 10.0}).value_or(1.0);
  m.kla_normalise = src.boolean("model.kla_normalise").value_or(true);
  m.multiple_impeller_factor = src.number("model.multiple_impeller_factor", {0.3, 1.0}).value_or(1.0);
}

// include = ["calibration.toml"]: [model] keys kept in other files (e.g. the fragment `oxystrat
// calibrate` writes), paths relative to the case file's folder. Included keys are defaults: the
// case's own keys and --set override them. An included file may hold only a [model] table, so
// includes do not nest and cannot form cycles. Each file is checked on its own first, so a bad
// value is reported at its own file and line.
void merge_includes(toml::table& root, const std::string& file_name) {
  const toml::node* inc = root.get("include");
  if (inc == nullptr) return;
  const auto line = inc->source().begin.line;
  const auto bad = [&] {
    throw CaseError(fmt::format("{}:{}: include: expected a list of file names, e.g. include = [\"calibration.toml\"]",
                                file_name, line));
  };
  std::vector<std::string> names;
  if (const auto* s = inc->as_string()) {
    names.push_back(s->get());
  } else if (const auto* a = inc->as_array()) {
    for (const auto& e : *a) {
      if (!e.is_string()) bad();
      names.push_back(e.as_string()->get());
    }
  } else {
    bad();
  }
  std::vector<std::string> seen;
  for (const auto& name : names) {
    std::filesystem::path path(name);
    if (path.is_relative()) path = std::filesystem::path(file_name).parent_path() / path;
    const std::string shown = path.lexically_normal().string();
    if (std::find(seen.begin(), seen.end(), shown) != seen.end()) {
      throw CaseError(fmt::format("{}:{}: include: {} is listed twice", file_name, line, shown));
    }
    seen.push_back(shown);
    std::ifstream in(path, std::ios::binary);
    std::error_code ec;  // the non-throwing tests: a name the system refuses (too long) is just "cannot open"
    if (!in || !std::filesystem::is_regular_file(path, ec)) {
      throw CaseError(fmt::format("{}:{}: include = \"{}\": cannot open {}{} (a relative path is taken from the case "
                                  "file's folder)",
                                  file_name, line, name, shown,
                                  std::filesystem::is_directory(path, ec) ? ": it is a folder; name the file in it, e.g. "
                                                                        "calibration.toml"
                                                                      : ""));
    }
    std::ostringstream ss;
    ss << in.rdbuf();
    const std::string text = ss.str();
    toml::table fragment;
    try {
      fragment = toml::parse(text, shown);
    } catch (const toml::parse_error& e) {
      throw CaseError(fmt::format("{}:{}: not valid TOML: {} (included by {}:{})", shown, e.source().begin.line,
                                  e.description(), file_name, line));
    }
    for (const auto& [key, node] : fragment) {
      if (key.str() == "model" && node.is_table()) continue;
      throw CaseError(fmt::format("{}:{}: {}: an included file may hold only a [model] table{} (included by {}:{})",
                                  shown, node.source().begin.line, key.str(),
                                  key.str() == "include" ? "; includes do not nest" : "", file_name, line));
    }
    {
      TomlSource check(toml::parse(text, shown), shown);  // parsed again: a copy would lose the lines
      Case scratch;
      read_numerics(check, scratch);
      check.check_no_unknown_keys();
    }
    if (!root.contains("model")) root.insert("model", toml::table{});
    auto* target = root.get("model")->as_table();
    if (target == nullptr) {
      throw CaseError(fmt::format("{}:{}: model must be a table, written [model]", file_name,
                                  root.get("model")->source().begin.line));
    }
    for (const auto& [key, value] : *fragment.get("model")->as_table()) {
      const std::string name(key.str());  // a structured binding in a lambda: not before clang 16
      if (!target->contains(name)) value.visit([&](auto&& v) { target->insert(name, v); });
    }
  }
  root.erase("include");
}

// Geometry that the single keys cannot check alone.
void check_geometry(const TomlSource& src, const Case& c, std::vector<std::string>& notes) {
  const VesselShape shape(c.vessel.diameter_m, c.vessel.bottom);
  const double t = c.vessel.diameter_m;
  const double h = c.vessel.liquid_height_m;
  const double free_width = t - 2.0 * (c.vessel.baffles > 0 ? c.vessel.baffle_width_m : 0.0);
  for (size_t i = 0; i < c.impellers.size(); ++i) {
    const auto& imp = c.impellers[i];
    const std::string p = fmt::format("impeller.{}.", i);
    if (imp.diameter_m >= free_width) {
      src.fail(p + "diameter", fmt::format("impeller diameter {:.4g} m does not fit inside the baffles: it must be "
                                           "less than T - 2 x baffle width = {:.4g} m",
                                           imp.diameter_m, free_width));
    }
    const double dt = imp.diameter_m / t;
    if (dt < 0.15 || dt > 0.7) {
      notes.push_back(fmt::format("{}: D/T = {:.3g} is outside 0.15-0.7, where the power and flow numbers were "
                                  "measured",
                                  src.where(p + "diameter"), dt));
    }
    const double band_lo = imp.elevation_m - 0.5 * imp.blade_height_m;
    const double band_hi = imp.elevation_m + 0.5 * imp.blade_height_m;
    if (band_hi >= h) {
      src.fail(p + "elevation", fmt::format("the impeller blades reach {:.4g} m, above the liquid surface at {:.4g} m",
                                            band_hi, h));
    }
    const double floor = shape.bottom_height(0.5 * imp.diameter_m);
    if (band_lo <= floor) {
      src.fail(p + "elevation", fmt::format("the impeller blades reach down to {:.4g} m, into the vessel bottom "
                                            "(the head surface is {:.4g} m high at the blade-tip radius); raise it",
                                            band_lo, floor));
    }
    if (i > 0) {
      const auto& below = c.impellers[i - 1];
      if (imp.elevation_m <= below.elevation_m) {
        src.fail(p + "elevation", fmt::format("impellers must be listed bottom to top: {:.4g} m is not above the "
                                              "previous impeller at {:.4g} m",
                                              imp.elevation_m, below.elevation_m));
      }
      if (band_lo < below.elevation_m + 0.5 * below.blade_height_m) {
        src.fail(p + "elevation", fmt::format("overlaps impeller {}: its blades span {:.4g}-{:.4g} m and the one "
                                              "below reaches {:.4g} m",
                                              i - 1, band_lo, band_hi, below.elevation_m + 0.5 * below.blade_height_m));
      }
      const double spacing = imp.elevation_m - below.elevation_m;
      if (spacing < below.diameter_m && c.model.multiple_impeller_factor == 1.0) {
        notes.push_back(fmt::format("{}: spacing {:.3g} m is less than the lower impeller's diameter; powers add "
                                    "less than fully (set model.multiple_impeller_factor)",
                                    src.where(p + "elevation"), spacing));
      }
    }
  }
  if (c.has_sparger) {
    const double rs = 0.5 * c.sparger.diameter_m;
    if (c.sparger.elevation_m >= c.vessel.liquid_height_m) {
      src.fail("sparger.elevation", fmt::format("the sparger at {:.4g} m is not below the liquid surface at {:.4g} m",
                                                c.sparger.elevation_m, c.vessel.liquid_height_m));
    }
    if (c.sparger.elevation_m <= shape.bottom_height(rs)) {
      src.fail("sparger.elevation", fmt::format("the sparger at {:.4g} m lies in the vessel bottom (the head surface "
                                                "is at {:.4g} m at its radius {:.4g} m)",
                                                c.sparger.elevation_m, shape.bottom_height(rs), rs));
    }
    if (c.sparger.diameter_m >= free_width) {
      src.fail("sparger.diameter", fmt::format("sparger diameter must be less than {:.4g} m (inside the baffles)", free_width));
    }
    if (c.sparger.elevation_m > c.impellers.front().elevation_m) {
      notes.push_back(fmt::format("{}: the sparger is above the lowest impeller; gas will bypass it",
                                  src.where("sparger.elevation")));
    }
  }
  if (c.vessel.baffles == 0) {
    notes.push_back("unbaffled vessel: the power and flow numbers assume a baffled vessel; give power_number "
                    "and flow_number from your own data");
  }
}

}  // namespace

Override parse_override(std::string_view argument) {
  const auto eq = argument.find('=');
  if (eq == std::string_view::npos || eq == 0) {
    throw CaseError(fmt::format("--set '{}': expected KEY=VALUE, e.g. --set operation.speed=\"110 rpm\"", argument));
  }
  auto trim = [](std::string_view s) {
    while (!s.empty() && s.front() == ' ') s.remove_prefix(1);
    while (!s.empty() && s.back() == ' ') s.remove_suffix(1);
    return std::string(s);
  };
  return Override{trim(argument.substr(0, eq)), trim(argument.substr(eq + 1)), std::string(argument)};
}

LoadedCase read_case_text(const std::string& text, const std::string& file_name,
                          const std::vector<Override>& overrides) {
  toml::table root;
  try {
    root = toml::parse(text, file_name);
  } catch (const toml::parse_error& e) {
    throw CaseError(fmt::format("{}:{}: not valid TOML: {}", file_name, e.source().begin.line, e.description()));
  }
  merge_includes(root, file_name);
  TomlSource src(std::move(root), file_name);
  LoadedCase out;
  for (const auto& o : overrides) {
    src.apply(o);
    out.overrides.push_back(o.raw);
  }
  Case& c = out.data;
  c.title = src.string("title").value_or("untitled case");
  read_vessel(src, c);
  read_broth(src, c);
  read_impellers(src, c);
  read_sparger(src, c);
  read_operation(src, c);
  read_do_calibration(src, c);
  read_culture(src, c);
  read_feed(src, c);
  read_numerics(src, c);
  read_constraints(src, c);
  read_control(src, c);
  detail::read_design_limits(src, c);  // heat, shear, cost (input/limits_reader.cpp)
  src.check_no_unknown_keys();
  check_geometry(src, c, out.notes);
  note_unused_rheology_keys(src, c, out.notes);
  out.file_name = file_name;
  out.source_text = text;
  std::ostringstream os;
  os << src.root();
  out.effective_text = os.str();
  return out;
}

std::optional<std::string> raw_value(const LoadedCase& loaded, const std::string& key) {
  TomlSource src(toml::parse(loaded.effective_text, loaded.file_name), loaded.file_name);
  if (!src.has(key)) return std::nullopt;
  if (const auto s = src.string_if_string(key)) return s;
  return src.text_of(key);
}

LoadedCase read_case_file(const std::string& path, const std::vector<Override>& overrides) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw CaseError(fmt::format("{}: cannot open the case file", path));
  std::ostringstream ss;
  ss << in.rdbuf();
  return read_case_text(ss.str(), path, overrides);
}

}  // namespace oxystrat
