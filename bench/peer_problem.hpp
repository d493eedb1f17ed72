// The inputs of the steady O2/CO2 balances (oxygen_problem.hpp) of one case, rebuilt from a solved
// field: kLa V and C* per unit mole fraction follow from the zone pressures and kLa the solver ended
// with, the inert gas from the gas transport. The bench-only export program writes these for the
// SciPy peer, and the linear-solver benchmark uses them to time one Jacobian.
#pragma once

#include <Eigen/Core>
#include <vector>

#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "physics/mass_transfer.hpp"
#include "solver/oxygen/oxygen_problem.hpp"
#include "physics/solubility.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat::bench {

struct PeerInputs {
  TransferCoefficients coeff;
  Uptake uptake;
  double inlet_o2_mol_s = 0.0, inlet_co2_mol_s = 0.0, inlet_inert_mol_s = 0.0;
};

//! Gas of a species each zone holds when it is carried by the gas transport untouched [mol/m3].
inline std::vector<double> carried(const GasRouting& routing, double inlet_mol_s) {
  std::vector<double> g(routing.unit_inventory.size());
  for (size_t k = 0; k < g.size(); ++k) g[k] = routing.unit_inventory[k] * inlet_mol_s;
  return g;
}

inline PeerInputs peer_inputs(const Case& c, const ZoneNetwork& net, const Hydrodynamics& hydro, const GasRouting& routing,
                              const std::vector<double>& pressure_pa, const std::vector<double>& kla_1_s) {
  PeerInputs in;
  const double t = c.vessel.temperature_k;
  const double pw = physics::water_vapour_pressure(t);
  const double h_o2 = physics::henry_o2(t) * physics::salting_out_factor(physics::Gas::o2, t, c.broth.ions_mol_m3);
  const double h_co2 = physics::henry_co2(t) * physics::salting_out_factor(physics::Gas::co2, t, c.broth.ions_mol_m3);
  const double molar = hydro.gas_molar_flow_mol_s;
  in.inlet_o2_mol_s = molar * c.operation.oxygen_fraction;
  in.inlet_co2_mol_s = molar * c.operation.co2_fraction;
  in.inlet_inert_mol_s = molar - in.inlet_o2_mol_s - in.inlet_co2_mol_s;
  const auto n = static_cast<size_t>(net.size());
  auto& k = in.coeff;
  k.transfer_o2.resize(n);
  k.transfer_co2.resize(n);
  k.cstar_per_y_o2.resize(n);
  k.cstar_per_y_co2.resize(n);
  for (size_t z = 0; z < n; ++z) {
    k.transfer_o2[z] = kla_1_s[z] * net.volume[z];
    k.transfer_co2[z] = co2_kla_ratio * k.transfer_o2[z];
    k.cstar_per_y_o2[z] = h_o2 * (pressure_pa[z] - pw);
    k.cstar_per_y_co2[z] = h_co2 * (pressure_pa[z] - pw);
  }
  k.inert_mol_m3 = carried(routing, in.inlet_inert_mol_s);
  in.uptake.rate_mol_m3_s = c.culture.q_o2_max_mol_kg_s * c.culture.biomass_kg_m3;
  in.uptake.k_o2_mol_m3 = c.culture.k_o2_mol_m3;
  in.uptake.rq = c.culture.rq;
  return in;
}

//! The cold start both the peer and oxystrat's inner solve use here: liquid at half the inlet
//! gas's C* (CO2 at its), gas carried by the gas transport without transfer.
inline Eigen::VectorXd cold_start(const Case& c, const ZoneNetwork& net, const GasRouting& routing, const PeerInputs& in) {
  const int n = net.size();
  const auto o = carried(routing, in.inlet_o2_mol_s), q = carried(routing, in.inlet_co2_mol_s);
  Eigen::VectorXd x(4 * n);
  for (int z = 0; z < n; ++z) {
    x[4 * z] = 0.5 * in.coeff.cstar_per_y_o2[z] * c.operation.oxygen_fraction;
    x[4 * z + 1] = in.coeff.cstar_per_y_co2[z] * c.operation.co2_fraction;
    x[4 * z + 2] = o[z];
    x[4 * z + 3] = q[z];
  }
  return x;
}

}  // namespace oxystrat::bench
