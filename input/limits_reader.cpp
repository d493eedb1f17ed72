#include "input/limits_reader.hpp"

#include <fmt/format.h>

#include <cmath>

#include "physics/solubility.hpp"
#include "physics/constants.hpp"

namespace oxystrat::detail {
namespace {

using units::Dimension;

// Coolant flow: a mass flow, or a volume flow turned into mass with the coolant's density.
double read_coolant_flow(TomlSource& src, const std::string& path, double density_kg_m3) {
  const auto text = src.string(path);
  if (!text) {
    src.missing(path, "the coolant flow to the surfaces, e.g. coolant_flow = \"60 m3/h\" or \"15 kg/s\"");
  }
  double si = 0.0;
  try {
    si = units::parse(Dimension::mass_flow, *text);
  } catch (const UnitError&) {
    try {
      si = units::parse(Dimension::volume_flow, *text) * density_kg_m3;
    } catch (const UnitError& e) {
      src.fail(path, fmt::format("{}; expected a mass flow ({}) or a volume flow ({})", e.what(),
                                 units::accepted(Dimension::mass_flow), units::accepted(Dimension::volume_flow)));
    }
  }
  if (!(si > 0.0) || si > 1e5) src.fail(path, fmt::format("out of range: {:.4g} kg/s; allowed more than 0 to 1e5 kg/s", si));
  return si;
}

void read_cooling(TomlSource& src, Case& c) {
  src.allow_table("cooling");
  auto& k = c.cooling;
  k.given = src.has("cooling");
  if (!k.given) return;
  const double big = 1e9;
  k.duty_w = src.quantity("cooling.duty", Dimension::power, {0.0, big, true});
  const auto jacket = src.quantity("cooling.jacket_area", Dimension::area, {0.0, 1e5, true});
  const auto coil = src.quantity("cooling.coil_area", Dimension::area, {0.0, 1e5, true});
  const double ua_range_hi = 1e5;
  if (jacket) {
    k.jacket_area_m2 = *jacket;
    k.jacket_u_w_m2_k = src.require_quantity("cooling.jacket_u", Dimension::heat_transfer_coefficient,
                                             {0.0, ua_range_hi, true}, "400 W/(m2 K)");
  } else if (src.has("cooling.jacket_u")) {
    src.fail("cooling.jacket_u", "a jacket coefficient without cooling.jacket_area; give the jacket's wetted area");
  }
  if (coil) {
    k.coil_area_m2 = *coil;
    k.coil_u_w_m2_k = src.require_quantity("cooling.coil_u", Dimension::heat_transfer_coefficient,
                                           {0.0, ua_range_hi, true}, "600 W/(m2 K)");
  } else if (src.has("cooling.coil_u")) {
    src.fail("cooling.coil_u", "a coil coefficient without cooling.coil_area; give the coil's surface");
  }
  const bool surfaces = jacket || coil;
  if (k.duty_w && surfaces) {
    src.fail("cooling.duty", "give either the available duty or the surfaces (jacket_area, coil_area), not both");
  }
  if (!k.duty_w && !surfaces) {
    src.missing("cooling.jacket_area",
                "the cooling surfaces (jacket_area and/or coil_area, each with its U, plus coolant_temperature and "
                "coolant_flow), or the available duty, e.g. duty = \"800 kW\"");
  }
  if (!surfaces) {
    for (const char* key : {"coolant_temperature", "coolant_flow", "coolant_density", "coolant_heat_capacity"}) {
      const std::string p = std::string("cooling.") + key;
      if (src.has(p)) src.fail(p, "a coolant key with a given duty; the duty already says what the cooling removes");
    }
    return;
  }
  k.coolant_inlet_k = src.require_quantity("cooling.coolant_temperature", Dimension::temperature, {253.15, 353.15},
                                           "12 degC");
  if (k.coolant_inlet_k >= c.vessel.temperature_k) {
    src.fail("cooling.coolant_temperature",
             fmt::format("the coolant at {} is not colder than the broth at {}: it removes no heat",
                         units::format(Dimension::temperature, k.coolant_inlet_k),
                         units::format(Dimension::temperature, c.vessel.temperature_k)));
  }
  const double density = src.quantity_or("cooling.coolant_density", Dimension::density, {500.0, 2000.0}, 1000.0);
  k.coolant_heat_capacity_j_kg_k =
      src.quantity_or("cooling.coolant_heat_capacity", Dimension::specific_heat, {500.0, 10000.0}, 4186.0);
  k.coolant_mass_flow_kg_s = read_coolant_flow(src, "cooling.coolant_flow", density);
}

void read_utilities(TomlSource& src, Case& c) {
  src.allow_table("utilities");
  auto& u = c.utilities;
  u.ambient_temperature_k =
      src.quantity_or("utilities.ambient_temperature", Dimension::temperature, {243.15, 323.15}, 293.15);
  u.gas_temperature_k =
      src.quantity_or("utilities.gas_temperature", Dimension::temperature, {243.15, 393.15}, u.ambient_temperature_k);
  u.supply_pressure_drop_pa =
      src.quantity_or("utilities.supply_pressure_drop", Dimension::pressure_difference, {0.0, 5e5}, 0.3e5);
  u.compressor_efficiency = src.number("utilities.compressor_efficiency", {0.2, 1.0}).value_or(0.70);
  u.drive_efficiency = src.number("utilities.drive_efficiency", {0.3, 1.0}).value_or(0.90);
}

// "0.12 EUR/kWh": the value in currency per SI unit, with the currency checked against prices.currency.
double read_price(TomlSource& src, const std::string& path, const std::string& currency,
                  const std::vector<std::pair<std::string, double>>& per_unit, const std::string& example) {
  if (src.has(path) && !src.string_if_string(path)) {
    src.fail(path, "write the price as a string with its currency and unit, e.g. " + example);
  }
  const auto text = src.string(path);
  if (!text) src.missing(path, "e.g. " + example);
  units::Split q;
  try {
    q = units::split(*text);
  } catch (const UnitError& e) {
    src.fail(path, std::string(e.what()) + "; e.g. " + example);
  }
  const auto slash = q.unit.find('/');
  std::string denominators;
  for (const auto& [name, factor] : per_unit) denominators += (denominators.empty() ? "" : ", ") + name;
  if (slash == std::string::npos) {
    src.fail(path, fmt::format("write the price with its currency and unit, e.g. {} ({}/{})", example, currency,
                               denominators));
  }
  const std::string cur = q.unit.substr(0, slash), den = q.unit.substr(slash + 1);
  if (cur != currency) {
    src.fail(path, fmt::format("the price is in '{}' but prices.currency is '{}'; write every price in {}", cur,
                               currency, currency));
  }
  for (const auto& [name, factor] : per_unit) {
    if (den != name) continue;
    if (q.value < 0.0 || q.value > 1e6) src.fail(path, "out of range: allowed 0 to 1e6 per unit");
    return q.value / factor;
  }
  src.fail(path, fmt::format("unknown unit '/{}'; expected {}/ one of {}", den, currency, denominators));
}

void read_prices(TomlSource& src, Case& c) {
  src.allow_table("prices");
  auto& p = c.prices;
  p.given = src.has("prices");
  if (!p.given) return;
  const auto cur = src.string("prices.currency");
  if (!cur) src.missing("prices.currency", "the currency every price is written in, e.g. currency = \"EUR\"");
  if (cur->empty() || cur->find_first_of(" /\t") != std::string::npos || cur->size() > 16) {
    src.fail("prices.currency", "a currency name of 1 to 16 characters without spaces or '/', e.g. \"EUR\"");
  }
  p.currency = *cur;
  p.electricity_per_j = read_price(src, "prices.electricity", p.currency, {{"kWh", 3.6e6}, {"MWh", 3.6e9}, {"GJ", 1e9}},
                                   fmt::format("electricity = \"0.12 {}/kWh\"", p.currency));
  // One normal m3 of O2 (0 degC, 1 atm, ideal gas) is 44.615 mol, 1.4276 kg.
  const double nm3_kg = 101325.0 / (kR * 273.15) * physics::molar_mass_o2;
  if (src.has("prices.oxygen")) {
    p.oxygen_per_kg = read_price(src, "prices.oxygen", p.currency, {{"kg", 1.0}, {"t", 1e3}, {"Nm3", nm3_kg}},
                                 fmt::format("oxygen = \"0.15 {}/kg\"", p.currency));
  }
  const double air = physics::air_o2_fraction + air_fraction_tolerance;
  const bool enriched = c.operation.oxygen_fraction > air || (c.control.enabled && c.control.oxygen_max > air);
  if (enriched && !p.oxygen_per_kg) {
    src.missing("prices.oxygen",
                fmt::format("the inlet gas is enriched with O2 (up to {:.3g} %): give the price of the purchased "
                            "oxygen, e.g. oxygen = \"0.15 {}/kg\"",
                            100.0 * std::max(c.operation.oxygen_fraction, c.control.oxygen_max), p.currency));
  }
}

void read_culture_limits(TomlSource& src, Case& c) {
  const auto kind = src.choice("culture.kind", {"microbial", "cell"}).value_or("microbial");
  c.culture.kind = kind == "cell" ? CultureKind::cell : CultureKind::microbial;
  c.culture.heat_yield_j_mol = src.quantity_or("culture.heat_yield", Dimension::molar_energy, {100e3, 1000e3}, 440e3);
  for (size_t i = 0; i < c.impellers.size(); ++i) {
    c.impellers[i].dissipation_ratio = src.number(fmt::format("impeller.{}.dissipation_ratio", i), {1.0, 500.0});
  }
}

// max_dissipation: specific (W/kg) or per volume (W/m3, divided by the broth density).
std::optional<double> read_dissipation_limit(TomlSource& src, const std::string& path, double density_kg_m3) {
  const auto text = src.string(path);
  if (!text) return std::nullopt;
  double si = 0.0;
  try {
    si = units::parse(Dimension::specific_power, *text);
  } catch (const UnitError&) {
    try {
      si = units::parse(Dimension::power_density, *text) / density_kg_m3;
    } catch (const UnitError& e) {
      src.fail(path, fmt::format("{}; expected {} or, per volume, {}", e.what(), units::accepted(Dimension::specific_power),
                                 units::accepted(Dimension::power_density)));
    }
  }
  if (!(si > 0.0) || si > 1e6) src.fail(path, fmt::format("out of range: {:.4g} W/kg; allowed more than 0 to 1e6 W/kg", si));
  return si;
}

void read_limit_constraints(TomlSource& src, Case& c) {
  auto& k = c.constraints;
  k.max_heat_w = src.quantity("constraints.max_heat", Dimension::power, {0.0, 1e9, true});
  const auto margin = src.number("constraints.min_cooling_margin", {0.0, 10.0});
  const auto must = src.boolean("constraints.cooling_must_cover");
  if ((margin || must.value_or(false)) && !c.cooling.given) {
    src.fail(margin ? "constraints.min_cooling_margin" : "constraints.cooling_must_cover",
             "needs a [cooling] table that says what the cooling can remove");
  }
  if (margin && !must.value_or(true)) {
    src.fail("constraints.min_cooling_margin", "contradicts constraints.cooling_must_cover = false");
  }
  if (c.cooling.given && must.value_or(true)) k.min_cooling_margin = margin.value_or(0.0);
  k.min_kolmogorov_length_m = src.quantity("constraints.min_kolmogorov_length", Dimension::length, {0.0, 0.01, true});
  k.max_dissipation_w_kg = read_dissipation_limit(src, "constraints.max_dissipation", c.broth.density_kg_m3);
}

}  // namespace

void read_design_limits(TomlSource& src, Case& c) {
  read_culture_limits(src, c);
  read_cooling(src, c);
  read_utilities(src, c);
  read_prices(src, c);
  read_limit_constraints(src, c);
}

}  // namespace oxystrat::detail
