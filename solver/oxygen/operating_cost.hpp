// What running the vessel draws and costs: the agitator drive, the compressor that delivers the
// air at the sparger's pressure, purchased oxygen when the gas is enriched, priced from the
// optional [prices] table (docs/method.md, section 18).
#pragma once

#include <optional>

#include "input/case.hpp"

namespace oxystrat {

struct OperatingCost {
  double supply_pressure_pa = 0.0;        //!< compressor outlet: sparger pressure + supply pressure drop [Pa]
  double air_mol_s = 0.0;                 //!< compressed air [mol/s]
  double oxygen_purchased_mol_s = 0.0;    //!< pure O2 blended in [mol/s]
  double compressor_isothermal_w = 0.0;   //!< p1 Q1 ln(p2/p1), the least work [W]
  double compressor_adiabatic_w = 0.0;    //!< isentropic, single stage [W]
  double compressor_w = 0.0;              //!< drawn: adiabatic / compressor_efficiency [W]
  double agitator_w = 0.0;                //!< drawn: gassed shaft power / drive_efficiency [W]
  double total_power_w = 0.0;             //!< agitator + compressor, drawn [W]
  // With [prices], in its currency
  std::optional<double> electricity_per_h;  //!< [currency/h]
  std::optional<double> oxygen_per_h;       //!< [currency/h] (0 without enrichment)
  std::optional<double> total_per_h;        //!< [currency/h]
  std::optional<double> per_kg_o2;          //!< per kg O2 transferred to the broth [currency/kg]
};

//! The supply: air compressed from 1 atm at the ambient temperature; enriched gas is air blended
//! with pure O2 delivered at pressure (its price covers its supply); a gas poorer in O2 than air
//! is counted as compressed air throughout.
OperatingCost operating_cost(const Case& c, double power_gassed_w, double inlet_gas_mol_s, double otr_mol_s);

}  // namespace oxystrat
