// The heat balance of the broth at one operating point: what the cells, the agitator and the
// expanding gas put in, what the gas carries out (warming from its inlet temperature, and the
// water it evaporates), the cooling duty that leaves, what the [cooling] can remove, and the
// largest uptake and biomass that cooling supports (docs/method.md, section 16).
#pragma once

#include <optional>

#include "input/case.hpp"

namespace oxystrat {

//! The flows of one operating point the heat balance needs.
struct HeatInputs {
  double power_gassed_w = 0.0;    //!< agitator shaft power, gassed [W]
  double inlet_gas_mol_s = 0.0;   //!< dry inlet gas [mol/s]
  double our_mol_s = 0.0;         //!< O2 taken up by the cells, vessel total [mol/s]
  double otr_mol_s = 0.0;         //!< O2 leaving the gas [mol/s]
  double cer_mol_s = 0.0;         //!< CO2 entering the gas [mol/s]
};

struct HeatBalance {
  // Heat into the broth [W]
  double metabolic_w = 0.0;       //!< heat yield x OUR
  double agitation_w = 0.0;       //!< gassed shaft power, all dissipated
  double gas_expansion_w = 0.0;   //!< isothermal expansion of the gas from sparger to surface
  // Heat the gas carries out [W] (negative: the gas brings heat in)
  double gas_sensible_w = 0.0;    //!< dry gas warmed (or cooled) from its inlet to broth temperature
  double gas_latent_w = 0.0;      //!< water evaporated into the gas, saturated at the surface
  double water_evaporation_kg_s = 0.0;  //!< water leaving with the off-gas [kg/s]
  double required_w = 0.0;        //!< the duty the cooling must remove [W]; negative: heating needed
  // With a [cooling] table
  std::optional<double> available_w;       //!< what the cooling removes at broth temperature [W]
  std::optional<double> margin;            //!< (available - required) / required [-], when required > 0
  std::optional<double> max_our_mol_m3_s;  //!< largest vessel-mean uptake the cooling holds [mol/(m3 s)]
  std::optional<double> max_biomass_kg_m3; //!< that uptake at q_O2,max [kg/m3] (culture with q_o2_max)
  double heat_gas_w() const { return gas_sensible_w + gas_latent_w; }
};

//! The balance at one operating point. Heat is linear in the uptake (the off-gas dry flow changes
//! by (RQ - 1) OUR), so the uptake that loads the cooling fully is solved for exactly.
HeatBalance heat_balance(const Case& c, const HeatInputs& in);

//! The duty the [cooling] removes with the broth at its temperature [W]; empty without the table.
std::optional<double> cooling_available_w(const Case& c);

//! Absolute pressure at the sparger, hydrostatic through ungassed broth [Pa] (the head pressure
//! without a sparger).
double sparger_pressure_pa(const Case& c);

}  // namespace oxystrat
