// Hydrodynamics of a case on its zone network: impeller power (ungassed and gassed), gas regime,
// the liquid flow field (face flows from the stream function), local energy dissipation and
// turbulent exchange flows.
#pragma once

#include <vector>

#include "input/case.hpp"
#include "physics/impeller_power.hpp"
#include "solver/flow/loop_flow.hpp"
#include "mesh/zone_network.hpp"
#include "physics/constants.hpp"

namespace oxystrat {

//! Default exchange constant c_t in D_t = c_t eps^(1/3) T^(4/3), calibrated once against the
//! turbulent mixing-time correlation of a single Rushton at H = T (docs/method.md, section 6;
//! reproduced by tests/mesh/exchange_calibration_test.cpp).
inline constexpr double default_exchange_constant = 0.0124;

struct ImpellerState {
  double reynolds = 0.0;             //!< rho N D^2 / mu, mu at the Metzner-Otto shear rate k_s N [-]
  double power_number = 0.0;         //!< ungassed Np at this Re [-]
  double flow_number = 0.0;          //!< Nq [-]
  double power_ungassed_w = 0.0;     //!< [W]
  double power_gassed_w = 0.0;       //!< [W]
  double gassed_ratio = 1.0;         //!< Pg / P0 [-]
  double gas_flow_m3_s = 0.0;        //!< gas flow loading the impeller, at its pressure [m3/s]
  double aeration_number = 0.0;      //!< Fl_G = Qg / (N D^3) [-]
  double froude = 0.0;               //!< N^2 D / g [-]
  double flooding_aeration = 0.0;    //!< Fl_G at flooding [-]
  double dispersion_aeration = 0.0;  //!< Fl_G at complete dispersion [-]
  GasRegime regime = GasRegime::ungassed;
  double tip_speed_m_s = 0.0;        //!< pi N D [m/s]
  double pumping_m3_s = 0.0;         //!< Nq N D^3 [m3/s]
  double circulation_m3_s = 0.0;     //!< flow carried by the impeller's loops [m3/s]
  double cavern_diameter_m = 0.0;    //!< cavern in a yield-stress broth [m]; 0: no yield stress
  double cavern_height_m = 0.0;      //!< [m]
};

struct Hydrodynamics {
  std::vector<ImpellerState> impellers;
  std::vector<CirculationLoop> loops;
  double power_ungassed_w = 0.0;
  double power_gassed_w = 0.0;
  double gas_molar_flow_mol_s = 0.0;  //!< dry inlet gas [mol/s]
  double exchange_constant = 0.0;     //!< c_t used [-]
  std::vector<double> face_flow;      //!< convective flow zone_a -> zone_b, signed [m3/s]
  std::vector<double> face_exchange;  //!< turbulent exchange flow, both ways [m3/s]
  std::vector<double> epsilon;        //!< specific energy dissipation per zone [W/kg]
  std::vector<double> shear_rate;     //!< shear rate sustained by that dissipation per zone [1/s]
  std::vector<double> apparent_viscosity;  //!< broth viscosity at that shear rate per zone [Pa s]
  double stagnant_volume_fraction = 0.0;   //!< share of the volume outside every cavern [-]
  std::vector<bool> stagnant;               //!< per zone: outside every cavern (molecular exchange only)
  std::vector<double> velocity_r, velocity_z;  //!< zone-mean liquid velocity [m/s]
};

//! Ideal-gas molar volume at 0 degC and 1 atm [m3/mol] (CODATA 2018 R).
inline constexpr double normal_molar_volume = kR * 273.15 / 101325.0;

Hydrodynamics compute_hydrodynamics(const Case& c, const ZoneNetwork& net);

//! Largest relative imbalance over zones: |sum of in - out| / sum of |face flows| of the zone.
double max_zone_imbalance(const ZoneNetwork& net, const std::vector<double>& face_flow);

}  // namespace oxystrat
