// Prints our property functions and unit conversions as CSV, for tests/scripts/reference_libraries.py
// to compare with independent libraries (TEOS-10 gsw, IAPWS-IF97 iapws, pint).
#include <fmt/format.h>

#include "input/units.hpp"
#include "physics/heat.hpp"
#include "physics/solubility.hpp"

int main() {
  using namespace oxystrat;
  fmt::print("# properties: temperature [K], O2 saturation with air at 1 atm [mol/m3], water vapour pressure [Pa]\n");
  for (double t_c = 0.0; t_c <= 40.0; t_c += 5.0) {
    const double t = t_c + 273.15;
    fmt::print("property,{:.2f},{:.10g},{:.10g}\n", t, physics::o2_saturation_air_1atm(t), physics::water_vapour_pressure(t));
  }
  fmt::print("# latent heat: temperature [K], latent heat of vaporisation of water [J/kg]\n");
  for (double t_c = 0.0; t_c <= 80.0; t_c += 10.0) {
    fmt::print("latent,{:.2f},{:.10g}\n", t_c + 273.15, physics::water_latent_heat(t_c + 273.15));
  }
  fmt::print("# units: text, SI value, SI unit\n");
  const std::pair<const char*, units::Dimension> quantities[] = {
      {"14.7 psi(a)", units::Dimension::pressure}, {"760 mmHg(a)", units::Dimension::pressure},
      {"0.5 bar(g)", units::Dimension::pressure},  {"3 ft", units::Dimension::length},
      {"40 in", units::Dimension::length},         {"120 rpm", units::Dimension::speed},
      {"2.5 cP", units::Dimension::viscosity},     {"300 L", units::Dimension::volume},
      {"8 mmol/g/h", units::Dimension::specific_rate}, {"37 degC", units::Dimension::temperature},
      {"1.2 g/cm3", units::Dimension::density},    {"0.45 1/h", units::Dimension::rate},
      {"350 L/h", units::Dimension::volume_flow},  {"2.5 m3/h", units::Dimension::volume_flow},
      {"0.02 g/g/h", units::Dimension::mass_specific_rate}, {"60 m2", units::Dimension::area},
      {"7.2 t/h", units::Dimension::mass_flow},    {"0.12 kcal/mol", units::Dimension::molar_energy},
      {"3 kW/kg", units::Dimension::specific_power}, {"7 psig", units::Dimension::pressure},
      {"1.8 bara", units::Dimension::pressure},    {"150 kPag", units::Dimension::pressure},
      {"30 \u00b0C", units::Dimension::temperature}};
  for (const auto& [text, dim] : quantities) fmt::print("unit,{},{:.12g}\n", text, units::parse(dim, text));
}
