// The impeller types oxystrat knows and their standard data: one table, one place. Free functions
// of the type; sources in docs/method.md, section "Impellers and power".
#pragma once

#include <span>
#include <string>

namespace oxystrat {

enum class ImpellerType {
  rushton,
  pitched_blade_down,
  pitched_blade_up,
  hydrofoil_down,
  hydrofoil_up,
  hollow_blade,
};

//! What a type is, for a standard geometry in a baffled vessel.
struct ImpellerTypeData {
  ImpellerType type;
  const char* name;              //!< case-file spelling, e.g. "pitched-blade-down"
  int pumping_direction;         //!< -1 down through the disc, +1 up, 0 radial (two loops)
  double power_number;           //!< turbulent Np = P/(rho N^3 D^5) [-]
  double laminar_constant;       //!< Kp = Np Re in the laminar regime [-]
  double flow_number;            //!< pumping number Nq = Qp/(N D^3) [-]
  int blades;                    //!< standard blade count [-]
  double band_height_ratio;      //!< axial extent of the swept band / D [-]
  double gassed_ratio_at_flooding;  //!< Pg/P0 reached at the flooding point (types without a Pg/P0 correlation) [-]
  double flooding_capacity;      //!< Fl_G at flooding relative to a Rushton turbine's at equal Fr and D/T [-]
  bool floods;                   //!< false: no sharp flooding transition (up-pumping axial types)
  double metzner_otto_constant;  //!< k_s: effective shear rate k_s N of a non-Newtonian broth [-]
};

//! Every known type, in enum order.
std::span<const ImpellerTypeData> impeller_types();
const ImpellerTypeData& impeller_data(ImpellerType t);
//! The type spelled `name` in a case file; false when no type has that name.
bool impeller_type_from_name(const std::string& name, ImpellerType& t);
//! "rushton | pitched-blade-down | ...", for error messages.
std::string impeller_type_names();

std::string to_string(ImpellerType t);
//! Radial impellers discharge outwards (two loops); axial ones pump through their disc (one loop).
bool is_radial(ImpellerType t);
//! -1 for impellers that pump down through their disc, +1 up, 0 for radial ones.
int pumping_direction(ImpellerType t);

}  // namespace oxystrat
