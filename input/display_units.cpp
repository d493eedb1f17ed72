#include "input/display_units.hpp"
#include "physics/constants.hpp"

#include <array>
#include <stdexcept>

namespace oxystrat::units {
namespace {

struct Entry {
  std::string_view display, si;
  double per_si;
};

// Every non-SI unit a table prints (costs per hour stay in their currency and are not listed).
constexpr std::array<Entry, 14> kTable{{
    {"kW", "W", 1e-3},
    {"kW/m3", "W/m3", 1e-3},
    {"1/h", "1/s", 3600.0},
    {"mmol/L", "mol/m3", 1.0},           // the same number: 1 mmol/L = 1 mol/m3
    {"g/L", "kg/m3", 1.0},               // likewise
    {"%", "1", 100.0},
    {"mmHg", "Pa", 1.0 / kMmHgPa},
    {"mmol/(L h)", "mol/(m3 s)", 3600.0},
    {"um", "m", 1e6},
    {"mm/s", "m/s", 1e3},
    {"kg/h", "kg/s", 3600.0},
    {"rpm", "1/s", 60.0},
    {"bar(a)", "Pa", 1e-5},
    {"min", "s", 1.0 / 60.0},
}};

// Units that are SI already (and the dimensionless "1"): listed so that a typo is not taken as SI.
constexpr std::array<std::string_view, 17> kSi{"1", "W", "W/m3", "1/s", "mol/m3", "kg/m3", "Pa", "mol/(m3 s)", "m",
                                               "m/s", "kg/s", "s", "W/kg", "J/mol", "mol/s", "m3/s", "m3"};

}  // namespace

DisplayScale display_scale(std::string_view display_unit) {
  for (const auto& e : kTable) {
    if (e.display == display_unit) return {std::string(e.si), e.per_si};
  }
  for (const auto& s : kSi) {
    if (s == display_unit) return {std::string(s), 1.0};
  }
  throw std::invalid_argument("no SI unit known for the table unit '" + std::string(display_unit) + "'");
}

double display_per_si(std::string_view si_unit, std::string_view display_unit) {
  const auto d = display_scale(display_unit);
  if (d.si_unit != si_unit) {
    throw std::invalid_argument("table unit '" + std::string(display_unit) + "' is not a unit of '" +
                                std::string(si_unit) + "'");
  }
  return d.per_si;
}

}  // namespace oxystrat::units
