// The case: everything a run needs, as plain data in SI units. It knows nothing about files;
// case_reader.hpp fills it from TOML and checks it.
#pragma once

#include <algorithm>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "physics/impeller_types.hpp"
#include "physics/mass_transfer.hpp"
#include "physics/rheology.hpp"
#include "physics/vessel_shape.hpp"
#include "input/utilities.hpp"

namespace oxystrat {

enum class SpargerType { ring, pipe, porous };

enum class KlaModel { local_correlation, mechanistic };

struct Vessel {
  double diameter_m = 0.0;          //!< Inner diameter T [m]
  double liquid_height_m = 0.0;     //!< Liquid height H above the lowest point, ungassed [m]
  double working_volume_m3 = 0.0;   //!< Liquid volume V, ungassed [m3] (derived from H or given)
  BottomShape bottom = BottomShape::ellipsoidal;
  int baffles = 4;                  //!< Number of wall baffles [-]
  double baffle_width_m = 0.0;      //!< Radial baffle width [m]
  double head_pressure_pa = 101325; //!< Absolute pressure in the head space [Pa]
  double pressure_rating_pa = 0.0;  //!< Absolute design pressure of the vessel [Pa]; 0 = not given
  double temperature_k = 310.15;    //!< Broth temperature [K]
  //! Height of the top of the cylindrical shell (bottom head plus straight side) above the lowest
  //! point [m]; 0 = not given.
  double shell_top_m = 0.0;
};

//! What "% DO" means: 100 % is the O2 saturation with air at 1 atm (the common default), or the
//! reading a probe was calibrated to in the vessel itself: with the calibration gas at the
//! hydrostatic pressure of its height, under the head pressure.
struct DoPercentBasis {
  bool in_vessel = false;
  double probe_height_m = 0.0;        //!< probe height above the lowest point (in vessel) [m]
  double gas_o2_fraction = 0.20946;   //!< O2 fraction of the calibration gas [-]
  double reference_mol_m3 = 0.0;      //!< the DO that reads 100 % [mol/m3]
  //! "% of air saturation at 1 atm" or "% of in-vessel saturation (...)", for every printed %.
  std::string label;
};

struct Impeller {
  ImpellerType type = ImpellerType::rushton;
  double diameter_m = 0.0;        //!< Impeller diameter D [m]
  double elevation_m = 0.0;       //!< Height of the impeller plane above the lowest point [m]
  int blades = 6;                 //!< Number of blades [-]
  double blade_height_m = 0.0;    //!< Axial extent of the swept band [m]
  std::optional<double> power_number;       //!< User's turbulent Np [-]
  std::optional<double> flow_number;        //!< User's pumping number Nq [-]
  std::optional<double> gassed_power_factor;  //!< User's Pg/P0 [-], replaces the correlation
  std::optional<double> circulation_factor;   //!< User's Qc/Qp entrainment ratio [-]
  std::optional<double> dissipation_ratio;    //!< User's eps_max / eps_mean of its discharge [-]
  double blades_from_m() const { return elevation_m - 0.5 * blade_height_m; }  //!< bottom of the swept band [m]
  double blades_to_m() const { return elevation_m + 0.5 * blade_height_m; }    //!< top of the swept band [m]
};

struct Sparger {
  SpargerType type = SpargerType::ring;
  double elevation_m = 0.0;  //!< Height above the lowest point [m]
  double diameter_m = 0.0;   //!< Ring diameter, outlet diameter of a pipe, or diameter of a porous element [m]
  double hole_diameter_m = 0.0;  //!< Orifice diameter of a ring or pipe [m]; 0: not given
  int holes = 1;                 //!< Number of orifices [-]
  double pore_diameter_m = 0.0;  //!< Pore size of a porous (sintered) element [m]
};

//! Highest agitator speed a case may give [1/s] (3000 rpm: beyond any vessel this tool is for).
inline constexpr double max_speed_rps = 50.0;

struct Operation {
  double speed_rps = 0.0;          //!< Agitator speed N [1/s]
  //! Dry inlet gas flow as normal volume (0 degC, 101325 Pa) [m3/s]; vvm refers to this basis.
  double gas_flow_normal_m3_s = 0.0;
  double oxygen_fraction = 0.20946;  //!< O2 mole fraction of the dry inlet gas [-]
  double co2_fraction = 0.00042;     //!< CO2 mole fraction of the dry inlet gas [-]
};

struct Broth {
  double density_kg_m3 = 1000.0;
  double viscosity_pa_s = 1e-3;       //!< Newtonian viscosity (Casson: plastic viscosity) [Pa s]
  Rheology rheology;                  //!< the flow curve; newtonian: viscosity_pa_s
  Coalescence coalescence = Coalescence::coalescing;
  std::map<std::string, double> ions_mol_m3;  //!< Ion concentrations for salting-out [mol/m3]
};

struct Culture {
  double biomass_kg_m3 = 0.0;          //!< Dry biomass X [kg/m3]
  //! Dry mass of one cell [kg]; 0 when not given. With it, a cell culture's biomass is shown back
  //! in cells/mL (the reader converts culture.cell_density with it).
  double cell_dry_mass_kg = 0.0;
  double q_o2_max_mol_kg_s = 0.0;      //!< Maximum specific O2 uptake [mol/(kg s)]
  double k_o2_mol_m3 = 0.0;            //!< Monod constant for O2 [mol/m3]
  double critical_do_mol_m3 = 0.0;     //!< Critical dissolved O2 [mol/m3]
  double rq = 1.0;                     //!< Respiratory quotient CER/OUR [-]
  // Growth on a substrate, used by transient runs only (growth_rate_max 0: no growth, and the
  // uptake is q_o2_max X C/(K_O2 + C) as in steady runs).
  double growth_rate_max_s = 0.0;            //!< mu_max [1/s]
  double k_substrate_kg_m3 = 0.0;            //!< Monod constant of the substrate K_S [kg/m3]
  double yield_substrate = 0.5;              //!< Y_X/S biomass per substrate [kg/kg]
  double yield_oxygen = 0.0;                 //!< Y_X/O biomass per O2 [kg/kg]; 0: mu_max / (q_o2_max - m_O)
  double maintenance_substrate_s = 0.0;      //!< m_S [kg substrate/(kg biomass s)]
  double maintenance_o2_mol_kg_s = 0.0;      //!< m_O [mol O2/(kg biomass s)]
  double substrate_kg_m3 = 0.0;              //!< Substrate at the start [kg/m3]
  CultureKind kind = CultureKind::microbial;  //!< microbial or animal/insect/plant cells
  //! Metabolic heat per mol O2 taken up [J/mol] (Cordier et al. 1987; docs/method.md, section 16)
  double heat_yield_j_mol = 440e3;
  bool grows() const { return growth_rate_max_s > 0.0; }
};

//! Substrate feed of a fed-batch, at one position, with a pump-rate profile (piecewise linear in
//! time, held after its last point).
struct Feed {
  bool enabled = false;
  double r_m = 0.0, z_m = 0.0;          //!< feed point [m]
  double concentration_kg_m3 = 0.0;     //!< substrate in the feed [kg/m3]
  std::vector<double> time_s;           //!< profile times, increasing [s]
  std::vector<double> rate_m3_s;        //!< pump rate at those times [m3/s]
  //! Pump rate at time t [m3/s].
  double rate_at(double t) const;
  //! Volume pumped from 0 to t [m3] (exact integral of the profile).
  double volume_until(double t) const;
};

struct Grid {
  int radial = 12;  //!< Requested radial zone count (alignment may add a few)
  int axial = 40;   //!< Requested axial zone count
  //! Half the counts in both directions, at least one each (nested starts, coarse theta95).
  Grid halved() const { return {std::max(1, radial / 2), std::max(1, axial / 2)}; }
};

struct Output {
  int sectors = 24;  //!< Angular sectors when the network is revolved for VTK
};

//! Model constants a user may calibrate; defaults and sources in docs/method.md.
struct ModelConstants {
  double exchange_constant = 0.0;       //!< c_t in D_t = c_t eps^(1/3) l^(4/3) [-]; 0 = default
  double mixing_length_ratio = 0.0;     //!< l / T [-]; 0 = default
  double discharge_power_share = 0.4;   //!< Share of an impeller's power dissipated in its swept volume [-]
  double upper_gas_share = 0.5;         //!< Share of the local gas flow an upper impeller is loaded with [-]
  double slip_velocity_m_s = 0.0;       //!< Bubble slip velocity [m/s]; 0: from the bubble size per zone
  double slip_multiplier = 1.0;         //!< Multiplies every slip velocity (uncertainty studies) [-]
  KlaModel kla_model = KlaModel::local_correlation;
  double kla_prefactor = 0.0;           //!< van 't Riet prefactor (SI); 0 = default for coalescence
  double kla_power_exponent = 0.0;      //!< exponent on P/V; 0 = default
  double kla_gas_exponent = 0.0;        //!< exponent on vs; 0 = default
  double bubble_diameter_m = 0.0;       //!< Sauter mean diameter for the mechanistic model; 0 = default
  double kla_factor = 1.0;              //!< User multiplier (antifoam, viscosity, particles) [-]
  //! Scale the local correlation so its volume mean equals the vessel-level correlation.
  bool kla_normalise = true;
  double multiple_impeller_factor = 1.0;  //!< Power-sum factor for close spacing [-]
  double gassed_power_multiplier = 1.0;   //!< Multiplies every Pg/P0 (uncertainty studies) [-]
};

//! Limits an operating point must keep to count as feasible (sweeps, comparisons).
struct Constraints {
  std::optional<double> min_do_mol_m3;          //!< DO floor in every zone [mol/m3]; empty = culture.critical_do
  double max_volume_below_critical = 0.0;       //!< allowed share of the volume below the floor [-]
  std::optional<double> max_tip_speed_m_s;      //!< [m/s]
  std::optional<double> max_power_per_volume_w_m3;  //!< gassed P/V [W/m3]
  std::optional<double> max_pco2_pa;            //!< [Pa]
  bool allow_flooding = false;
  std::optional<double> max_heat_w;             //!< cooling duty required [W]
  //! (available - required) / required at least this [-]; set when [cooling] is given
  std::optional<double> min_cooling_margin;
  std::optional<double> min_kolmogorov_length_m;  //!< smallest eddies anywhere, impeller maxima included [m]
  std::optional<double> max_dissipation_w_kg;     //!< largest local dissipation, impeller maxima included [W/kg]
};

//! DO control for transient runs: a PID loop on the DO at a probe, acting in cascade on speed,
//! gas flow and O2 fraction within the limits.
struct ControlSettings {
  bool enabled = false;
  double setpoint_mol_m3 = 0.0;
  double probe_r_m = 0.0, probe_z_m = 0.0;
  double gain = 5.0;              //!< proportional gain on the error in units of air saturation [-]
  double integral_time_s = 120.0;
  double derivative_time_s = 0.0;  //!< on the measurement; 0 = PI [s]
  double interval_s = 10.0;       //!< update period [s]
  double speed_min_rps = 0.0, speed_max_rps = 0.0;       //!< 0: the case's speed
  double gas_min_m3_s = -1.0, gas_max_m3_s = -1.0;       //!< normal m3/s; < 0: the case's gas flow
  double oxygen_max = -1.0;                              //!< < 0: the case's O2 fraction
};

//! A step change in a transient run: case keys set from `time_s` on (as --set arguments).
struct EventSpec {
  double time_s = 0.0;
  std::vector<std::string> sets;
};

struct Case {
  std::string title;
  Vessel vessel;
  std::vector<Impeller> impellers;  //!< Bottom to top
  //! Impellers wholly above the ungassed liquid, left out of the model (input/case_checks.cpp);
  //! kept so that a caution can say when the gassed broth reaches them.
  std::vector<Impeller> impellers_above_liquid;
  Sparger sparger;
  bool has_sparger = false;
  Operation operation;
  Broth broth;
  Culture culture;
  Grid grid;
  Output output;
  ModelConstants model;
  DoPercentBasis do_percent;
  Constraints constraints;
  ControlSettings control;
  std::vector<EventSpec> events;
  Feed feed;
  Cooling cooling;
  Utilities utilities;
  Prices prices;
};

//! The van 't Riet constants of the broth (physics/mass_transfer.hpp) with the case's
//! model.kla_* keys in place of any of them.
VantRietConstants vant_riet_constants(Coalescence c, const ModelConstants& m);

std::string to_string(SpargerType t);
std::string to_string(KlaModel m);
std::string to_string(CultureKind k);


}  // namespace oxystrat
