// What the plant around the vessel supplies, and what it costs: the cooling surfaces and coolant,
// the compressed gas and the drives, and the prices of electricity and oxygen. Plain data in SI,
// filled by input/limits_reader.cpp; docs/case-reference.md lists the keys.
#pragma once

#include <optional>
#include <string>

namespace oxystrat {

//! An inlet O2 fraction within this of air's is air (cases write "21 %" or "20.95 %" for air);
//! above it the gas is enriched: O2 is bought, and the oxygen-safety caution applies [-].
inline constexpr double air_fraction_tolerance = 0.005;

//! What grows in the broth; decides which shear cautions apply (docs/method.md, section 17).
enum class CultureKind { microbial, cell };

//! Cooling from the optional [cooling] table: jacket and/or coil with one coolant fed to both in
//! parallel (the flow split in proportion to U A), or a duty given outright.
struct Cooling {
  bool given = false;                     //!< the case has a [cooling] table
  double jacket_area_m2 = 0.0;            //!< wetted jacket surface [m2]
  double jacket_u_w_m2_k = 0.0;           //!< overall heat-transfer coefficient of the jacket [W/(m2 K)]
  double coil_area_m2 = 0.0;              //!< coil surface [m2]
  double coil_u_w_m2_k = 0.0;             //!< overall heat-transfer coefficient of the coil [W/(m2 K)]
  double coolant_inlet_k = 0.0;           //!< coolant supply temperature [K]
  double coolant_mass_flow_kg_s = 0.0;    //!< total coolant flow [kg/s]
  double coolant_heat_capacity_j_kg_k = 4186.0;  //!< [J/(kg K)]; water
  std::optional<double> duty_w;           //!< a given available duty [W], instead of the surfaces
  double ua_w_k() const { return jacket_area_m2 * jacket_u_w_m2_k + coil_area_m2 * coil_u_w_m2_k; }
};

//! The supplies from the optional [utilities] table (every key has a default).
struct Utilities {
  double ambient_temperature_k = 293.15;      //!< air at the compressor inlet, at 1 atm [K]
  double gas_temperature_k = 293.15;          //!< dry gas entering the broth [K]; default: ambient
  double supply_pressure_drop_pa = 0.3e5;     //!< filters, piping and sparger [Pa]
  double compressor_efficiency = 0.70;        //!< shaft-to-adiabatic, with the motor [-]
  double drive_efficiency = 0.90;             //!< agitator motor and gearbox [-]
};

//! Prices from the optional [prices] table, in one currency.
struct Prices {
  bool given = false;
  std::string currency;                       //!< e.g. "EUR"; every price must be written in it
  double electricity_per_j = 0.0;             //!< [currency/J] (read per kWh)
  std::optional<double> oxygen_per_kg;        //!< purchased O2 [currency/kg]
};

}  // namespace oxystrat
