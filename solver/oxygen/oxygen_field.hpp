// The steady oxygen field of a case: gas holdup, pressure, kLa and C* per zone, dissolved O2 and
// CO2, uptake, off-gas; with the summary an engineer reads, and the largest biomass the
// configuration carries with every zone above critical DO.
#pragma once

#include <Eigen/Core>
#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/oxygen_problem.hpp"
#include "solver/linalg/steady_problem.hpp"
#include "solver/flow/transport.hpp"
#include "input/errors.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

//! Holdup beyond which bubbly flow gives way to churning plumes that the zone model does not
//! describe (typical stirred-tank holdups are 0.05-0.25, [mem]).
inline constexpr double bubbly_flow_holdup = 0.3;
//! Share of the volume above bubbly_flow_holdup beyond which it is the vessel's gas flow, not a
//! sparger plume, that churns (our choice: a plume fills a few per cent of a vessel).
inline constexpr double widespread_churning_share = 0.1;

//! Holdup below which a zone counts as gas-free (kLa 0): the drift-flux transport leaves
//! exponentially small amounts (1e-30 and less) in zones the gas does not reach, such as a
//! viscous broth's stagnant region, and their composition, a ratio of such amounts, would put
//! derivatives of 1e30 into the Newton matrix. A billionth of the volume transfers nothing
//! measurable at any kLa a correlation gives. The same bound applies to the holdup the sparged
//! gas would give with none of it dissolved (OxygenSetup::update): a zone below it has too little
//! inert gas to hold its composition.
inline constexpr double gas_free_holdup = 1e-9;

struct OxygenField {
  // Per zone
  std::vector<double> do_mol_m3;        //!< dissolved O2 [mol/m3]
  std::vector<double> co2_mol_m3;       //!< dissolved CO2 [mol/m3]
  std::vector<double> cstar_mol_m3;     //!< O2 saturation at the zone's gas [mol/m3]
  std::vector<double> kla_1_s;          //!< O2 kLa [1/s]
  std::vector<double> otr_mol_m3_s;     //!< O2 transfer rate [mol/(m3 s)]
  std::vector<double> our_mol_m3_s;     //!< O2 uptake rate [mol/(m3 s)]
  std::vector<double> holdup;           //!< gas holdup [-]
  std::vector<double> superficial_gas_m_s;
  std::vector<double> y_o2, y_co2;      //!< dry gas mole fractions [-]
  std::vector<double> pco2_pa;          //!< CO2 partial pressure in equilibrium with the liquid [Pa]
  std::vector<double> pressure_pa;      //!< absolute pressure with gas holdup [Pa]
  std::vector<double> do_saturation;    //!< DO over the DO that reads 100 % (case.do_percent) [-]
  // Summary
  double kla_mean_1_s = 0.0;            //!< volume-average kLa [1/s]
  double kla_vessel_1_s = 0.0;          //!< vessel-level correlation at Pg/V and mid-height vs [1/s]
  double do_min = 0.0, do_mean = 0.0;   //!< [mol/m3]
  int do_min_zone = 0;
  double volume_fraction_below_critical = 0.0;
  double offgas_y_o2 = 0.0, offgas_y_co2 = 0.0;
  double otr_total_mol_s = 0.0;
  double our_total_mol_s = 0.0;
  double o2_in_mol_s = 0.0, o2_out_mol_s = 0.0;
  double o2_balance_error = 0.0;        //!< (in - out - sum OTR V) / in [-]
  double pco2_max_pa = 0.0;
  double holdup_mean = 0.0;             //!< volume-mean gas holdup [-]
  double holdup_max = 0.0;              //!< [-]
  double volume_fraction_churning = 0.0;  //!< share of the volume with holdup above bubbly_flow_holdup [-]
  double gas_volume_m3 = 0.0;           //!< gas held in the broth [m3]
  double gassed_level_m = 0.0;          //!< height of the gassed liquid surface above the lowest point [m]
  double air_saturation_mol_m3 = 0.0;   //!< the DO that reads 100 % (case.do_percent) [mol/m3]
  int newton_iterations = 0;
  int outer_iterations = 0;
  int linear_iterations = 0;            //!< Krylov iterations of the structured Newton steps
  // The counts above are this network's own solve; a nested cold start (nested_start.hpp) adds
  // the solves on the coarser grids that seeded it, summed over all levels, and the Krylov
  // iterations of the corrections on the halved grid (coarse_correction.hpp):
  int coarse_levels = 0;                //!< coarser grids solved first (0: no nesting)
  int coarse_newton_iterations = 0;
  int coarse_outer_iterations = 0;
  int coarse_linear_iterations = 0;
  Eigen::VectorXd state;                //!< solver state, for warm starts
};

//! Per zone: holds gas (holdup at least gas_free_holdup); the zones where C* and kLa mean something.
std::vector<bool> gassed_zones(const OxygenField& f);

struct OxygenContext {
  const Case& c;
  const ZoneNetwork& net;
  const Hydrodynamics& hydro;
  const GasRouting& routing;
};

//! The fixed parts of the O2/CO2 balances of a context (inlet, Henry coefficients, uptake,
//! transport) and the parts that follow the gas flows (holdup, pressure, kLa, C*), which update()
//! recomputes from a state. Shared by the steady and the transient solves.
struct OxygenSetup {
  OxygenSetup(const OxygenContext& ctx, double biomass_kg_m3);
  //! Inlet gas carried through the routing with no transfer, DO at half saturation.
  Eigen::VectorXd initial_state() const;
  //! Holdup, pressure, kLa and C* per unit mole fraction at the gas flows of `state`.
  void update(const Eigen::VectorXd& state);

  const OxygenContext& ctx;
  double inlet_o2_mol_s = 0.0, inlet_co2_mol_s = 0.0;
  double henry_o2 = 0.0, henry_co2 = 0.0;  //!< with salting-out [mol/(m3 Pa)]
  double water_pressure_pa = 0.0;
  double kla_vessel_1_s = 0.0;
  Uptake uptake;
  SparseMatrix transport;
  TransferCoefficients coeff;
  std::vector<double> holdup, pressure_pa, superficial_m_s;
};

//! Steady field at biomass `biomass_kg_m3` (the case's own when negative). `warm` may hold a
//! previous field of the same network to start from; without it, a network of at least
//! newton.linear.nested_start_from_zones zones starts from the field on its halved grid (nested_start.hpp).
//! Throws SolveError on failure.
//! `workspace` (optional) carries the sparse factorisation from one solve to the next.
//! `newton.structured = false` forces the general sparse LU path (for tests and benchmarks);
//! the tolerance of `newton` is that of the final field.
OxygenField solve_oxygen_field(const OxygenContext& ctx, double biomass_kg_m3 = -1.0, const OxygenField* warm = nullptr,
                               NewtonWorkspace* workspace = nullptr, const NewtonOptions& newton = {});

//! The solve of a field that is only compared with limits (critical DO, pCO2, ...): a scaled
//! residual of 1e-10 with the vessel's balances left open. Its DO differs from the full solve's
//! by less than 1e-6 of air saturation (5e-9 at 8000 zones, 4e-7 at a million), far below any
//! margin it decides.
NewtonOptions margin_solve_options();

//! Largest biomass [kg/m3] with every zone at or above culture.critical_do, to 1e-4 relative (0
//! when even no culture fails, capped at 1000 kg/m3 when nothing limits). `field_at_case` seeds
//! the search, whose solves are margin solves (margin_solve_options()).
double max_supportable_biomass(const OxygenContext& ctx, const OxygenField& field_at_case, double rel_tol = 1e-4);

}  // namespace oxystrat
