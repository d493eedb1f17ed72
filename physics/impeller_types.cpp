#include "physics/impeller_types.hpp"

#include <array>
#include <numbers>

namespace oxystrat {
namespace {

// Np, Kp, Nq: Rushton 5.0, 70, 0.72; 45 degree pitched blade (4) 1.27, 45 [mem, 40-50], 0.79;
// narrow-blade hydrofoil 0.30 (Pinho et al. 1997 measured 0.31), 40 [our assumption], 0.50
// [sec/mem, 0.4-0.56]; hollow-blade disc turbine 3.0 [mem, 2.9-3.2], 70 [our assumption], 0.6
// [mem, 0.5-0.7]. Blade counts are the standard forms; band heights are blade widths projected on
// the axis (Rushton w = D/5; 45 degree pitched blade D/5 sin 45; hydrofoil ~0.12 D): common
// practice. Gas handling of the non-Rushton types [mem, qualitative literature summarised in
// docs/method.md]: down-pumping pitched blades and hydrofoils lose power to Pg/P0 ~0.6 / ~0.55
// and flood at markedly lower Fl_G than a Rushton (taken as half); a hollow-blade disc turbine
// keeps Pg/P0 ~0.75 and handles 2-3 times the gas (taken as 2.5); up-pumping axial types keep
// Pg/P0 ~0.85 and show no sharp flooding. Metzner-Otto constants k_s [mem]: Rushton 11.5
// (Metzner, Feehs, Ramos, Otto & Tuthill 1961), pitched blade ~13, narrow hydrofoils ~10.5,
// hollow blade taken as a Rushton.
constexpr double kPitchedBand = 0.2 * std::numbers::sqrt2 / 2.0;
constexpr std::array<ImpellerTypeData, 6> kTypes{{
    {ImpellerType::rushton, "rushton", 0, 5.0, 70.0, 0.72, 6, 0.2, 0.45, 1.0, true, 11.5},
    {ImpellerType::pitched_blade_down, "pitched-blade-down", -1, 1.27, 45.0, 0.79, 4, kPitchedBand, 0.6, 0.5, true, 13.0},
    {ImpellerType::pitched_blade_up, "pitched-blade-up", +1, 1.27, 45.0, 0.79, 4, kPitchedBand, 0.85, 3.0, false, 13.0},
    {ImpellerType::hydrofoil_down, "hydrofoil-down", -1, 0.30, 40.0, 0.50, 3, 0.12, 0.55, 0.5, true, 10.5},
    {ImpellerType::hydrofoil_up, "hydrofoil-up", +1, 0.30, 40.0, 0.50, 3, 0.12, 0.85, 3.0, false, 10.5},
    {ImpellerType::hollow_blade, "hollow-blade", 0, 3.0, 70.0, 0.6, 6, 0.2, 0.75, 2.5, true, 11.5},
}};
static_assert([] {
  for (std::size_t i = 0; i < kTypes.size(); ++i)
    if (static_cast<std::size_t>(kTypes[i].type) != i) return false;
  return true;
}(), "the table is in enum order");

}  // namespace

std::span<const ImpellerTypeData> impeller_types() { return kTypes; }

const ImpellerTypeData& impeller_data(ImpellerType t) { return kTypes[static_cast<std::size_t>(t)]; }

bool impeller_type_from_name(const std::string& name, ImpellerType& t) {
  for (const auto& d : kTypes) {
    if (name == d.name) {
      t = d.type;
      return true;
    }
  }
  return false;
}

std::string impeller_type_names() {
  std::string s;
  for (const auto& d : kTypes) s += (s.empty() ? "" : " | ") + std::string(d.name);
  return s;
}

std::string to_string(ImpellerType t) { return impeller_data(t).name; }
bool is_radial(ImpellerType t) { return impeller_data(t).pumping_direction == 0; }
int pumping_direction(ImpellerType t) { return impeller_data(t).pumping_direction; }

}  // namespace oxystrat
