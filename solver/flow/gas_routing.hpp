// Where the gas goes: bubbles are carried by the liquid and rise through it at their slip
// velocity (drift flux), and turbulence spreads them like the liquid's own eddies do. On every face
// the gas flux is upwind: (liquid flow + slip velocity x area for a horizontal face) times the
// gas held upstream, plus the turbulent exchange times the difference. Gas therefore recirculates
// in the impeller loops, is carried down where the liquid descends faster than the bubbles rise,
// and leaves through the liquid surface at the slip velocity. The operator is an M-matrix with
// zero column sums but at the surface, so the gas inventory of every zone follows from one sparse
// solve per species, with no order of zones assumed.
//
// Bubble size per zone: the sparger forms bubbles (orifice or pore size and gas flow); turbulence
// breaks them down to the Hinze limit of the zone's dissipation; in a coalescing broth they merge
// back up to that limit (at most 6 mm), in a non-coalescing broth they stay at the smaller of the
// two. The slip velocity is the rise velocity of that size.
#pragma once

#include <vector>

#include "input/case.hpp"
#include "mesh/zone_network.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/transport.hpp"
#include "solver/linalg/solver_options.hpp"

namespace oxystrat {

//! Largest bubble a coalescing broth holds away from the impellers [m] ("3-5 mm in coalescing
//! water", [mem]; a bubble larger than ~6 mm wobbles and breaks).
inline constexpr double coalesced_bubble_cap_m = 6e-3;

struct GasRouting {
  //! Gas transport G [m3/s]: d(gas moles in zone i)/dt = sum_j G_ij g_j + sparged_i - transferred_i,
  //! g = gas moles per zone volume [mol/m3]. Rows and columns are zones.
  SparseMatrix transport;
  std::vector<double> surface_outflow;  //!< slip x surface area of zones at the liquid surface [m3/s]
  std::vector<double> sauter_m;         //!< Sauter bubble diameter per zone [m]
  std::vector<double> slip_m_s;         //!< bubble slip (rise) velocity per zone [m/s]
  std::vector<double> area;             //!< horizontal area of the zone [m2]
  double sparger_bubble_m = 0.0;        //!< size the sparger forms bubbles at [m]; 0: not limiting
  //! Gas held per zone volume per mol/s sparged, with nothing dissolving: -G^-1 s [s/m3].
  std::vector<double> unit_inventory;
};

//! `guess`, when given, is an approximate unit_inventory (say, another grid's, restricted) that
//! the large networks' iterative solve starts from; the answer is the same to its tolerance.
GasRouting route_gas(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h, const SolverOptions& options = {},
                     const std::vector<double>* guess = nullptr);

//! Off-gas of one gas species: what leaves through the surface [mol/s] for inventories g [mol/m3].
double surface_flow(const GasRouting& routing, const std::vector<double>& g);

//! Bubble diameter the case's sparger forms [m]; 0 when the case gives no hole or pore size.
double sparger_bubble_diameter(const Case& c, double gas_molar_flow_mol_s);

}  // namespace oxystrat
