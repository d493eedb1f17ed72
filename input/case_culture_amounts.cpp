// The culture's amount and specific uptake in the units each trade writes: dry biomass in g/L and
// uptake per dry mass (microbes), or viable cells per mL and uptake per cell (cell culture). A cell
// count becomes a dry biomass only through the dry mass of one cell: that key is required with it.
#include <fmt/format.h>

#include <string>

#include "input/case_sections.hpp"

namespace oxystrat::detail {
namespace {

using units::Dimension;

constexpr Range kBiomass{0.0, 300.0};                       // kg/m3
constexpr Range kQo2{0.0, 100.0 / 3600.0};                  // mol/(kg s): 0 to 100 mmol/g/h
constexpr Range kCellDensity{0.0, 1e9 * 1e6};               // 1/m3: 0 to 1e9 cells/mL
constexpr Range kCellDryMass{1e-16, 1e-11};                 // kg: 0.1 pg to 10 ng
constexpr Range kQo2PerCell{0.0, 100e-12 / 3600.0};         // mol/s per cell: 0 to 100 pmol/cell/h

const char* kDryMassExample = "cell_dry_mass = \"350 pg\"";

// True when the text's unit is a rate per cell ("0.2 pmol/cell/h").
bool per_cell(const std::optional<std::string>& text) {
  if (!text) return false;
  try {
    const auto unit = units::split(*text).unit;
    return unit.find("/cell") != std::string::npos || unit.find("(cell") != std::string::npos;
  } catch (const UnitError&) {
    return false;  // not a number first: the ordinary reader says so
  }
}

double read_biomass(TomlSource& src, const std::optional<double>& dry_mass) {
  const auto biomass = src.quantity("culture.biomass", Dimension::biomass, kBiomass);
  const auto cells = src.quantity("culture.cell_density", Dimension::cell_density, kCellDensity);
  if (biomass && cells) {
    src.fail("culture.cell_density", "give the culture's amount once: culture.biomass (dry mass per volume) or "
                                     "culture.cell_density with culture.cell_dry_mass, not both");
  }
  if (biomass) return *biomass;
  if (!cells) {
    src.missing("culture.biomass", fmt::format("e.g. biomass = \"40 g/L\", or for cells cell_density = \"5e6 cells/mL\" "
                                               "with {}; allowed {} to {} g/L",
                                               kDryMassExample, kBiomass.lo, kBiomass.hi));
  }
  if (!dry_mass) {
    src.fail("culture.cell_density", fmt::format("a cell count needs the dry mass of one cell to become a biomass: add "
                                                 "culture.{} (allowed {:g} {} to {:g} {})",
                                                 kDryMassExample, units::to_display(Dimension::cell_mass, kCellDryMass.lo),
                                                 units::display_unit(Dimension::cell_mass),
                                                 units::to_display(Dimension::cell_mass, kCellDryMass.hi),
                                                 units::display_unit(Dimension::cell_mass)));
  }
  const double x = *cells * *dry_mass;  // [1/m3] x [kg] = kg/m3
  if (x > kBiomass.hi) {
    src.fail("culture.cell_density", fmt::format("out of range: with culture.cell_dry_mass {} this is {:.6g} g/L of dry "
                                                 "biomass, above the allowed {} g/L",
                                                 units::format(Dimension::cell_mass, *dry_mass, 6), x, kBiomass.hi));
  }
  return x;
}

double read_q_o2_max(TomlSource& src, const std::optional<double>& dry_mass) {
  const std::string path = "culture.q_o2_max";
  if (!per_cell(src.string_if_string(path))) {
    return src.require_quantity(path, Dimension::specific_rate, kQo2, "8 mmol/g/h, or for cells \"0.2 pmol/cell/h\"");
  }
  const double per_cell_mol_s = *src.quantity(path, Dimension::cell_specific_rate, kQo2PerCell);
  if (!dry_mass) {
    src.fail(path, fmt::format("an uptake per cell needs the dry mass of one cell to become an uptake per dry mass: add "
                               "culture.{}, or write q_o2_max per dry mass (e.g. \"8 mmol/g/h\")",
                               kDryMassExample));
  }
  const double q = per_cell_mol_s / *dry_mass;  // [mol/s per cell] / [kg per cell] = mol/(kg s)
  if (q > kQo2.hi) {
    src.fail(path, fmt::format("out of range: with culture.cell_dry_mass {} this is {:.6g} mmol/g/h, above the allowed "
                               "{:g} mmol/g/h",
                               units::format(Dimension::cell_mass, *dry_mass, 6), 3600.0 * q, 3600.0 * kQo2.hi));
  }
  return q;
}

}  // namespace

void read_culture_amounts(TomlSource& src, Culture& k) {
  const auto dry_mass = src.quantity("culture.cell_dry_mass", Dimension::cell_mass, kCellDryMass);
  k.cell_dry_mass_kg = dry_mass.value_or(0.0);
  k.biomass_kg_m3 = read_biomass(src, dry_mass);
  k.q_o2_max_mol_kg_s = read_q_o2_max(src, dry_mass);
}

}  // namespace oxystrat::detail
