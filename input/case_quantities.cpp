#include "input/case_sections.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <iterator>

#include "input/units.hpp"
#include "physics/solubility.hpp"

namespace oxystrat::detail {

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

}  // namespace oxystrat::detail
