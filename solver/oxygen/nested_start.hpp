// Nested iteration: the cold start of a large network from the field solved on its grid halved.
#pragma once

#include <Eigen/Core>
#include <array>
#include <optional>
#include <vector>

#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

// Cold starts of networks with at least SolverOptions::nested_start_from_zones zones are seeded
// from the same case solved on the grid with half the radial and half the axial count (nested
// iteration or mesh sequencing: Brandt 1977, Math. Comp. 31, full multigrid; Knoll & Keyes 2004,
// J. Comput. Phys. 193, section on mesh sequencing; both cited from memory).

//! For each zone of `fine`: the zone of `coarse` whose cell holds its centroid (where the coarse
//! bottom head leaves that cell dry, the lowest wetted cell above it in the same column).
std::vector<int> coarse_owners(const ZoneNetwork& coarse, const ZoneNetwork& fine);

//! Weights of the coarse zones that give the value at one fine zone.
struct ZoneStencil {
  std::array<int, 4> zone{};      //!< coarse zones (unused entries have weight 0)
  std::array<double, 4> weight{};  //!< sums to 1
  bool bilinear = false;          //!< the four coarse centroids around the fine one were all there
};

//! For each zone of `fine`: bilinear in (r, z) over the four coarse centroids around the fine
//! centroid where they exist and form a rectangle (uncut cells), else the coarse zone containing
//! the fine centroid (cut cells at the bottom head, the first and last half cell of the grid).
std::vector<ZoneStencil> interpolation_stencils(const ZoneNetwork& coarse, const ZoneNetwork& fine);

//! Per-zone values of the coarse network at the fine zones.
std::vector<double> interpolate(const std::vector<ZoneStencil>& stencils, const std::vector<double>& coarse_values);

//! Solver state of `fine` (C_O2, C_CO2, n_O2, n_CO2 per zone) from a coarse field: DO, CO2 and
//! the gas mole fractions are interpolated (intensive), the gas flows are rebuilt from each fine
//! zone's inert gas. Zones without inert gas (pure O2 or CO2 sparged) keep the gas of
//! `cold`, the no-transfer start.
Eigen::VectorXd nested_state(const ZoneNetwork& coarse, const OxygenField& coarse_field, const ZoneNetwork& fine,
                             const std::vector<double>& fine_inert_mol_m3, const Eigen::VectorXd& cold);

//! The case solved on the halved grid: its case, network, hydrodynamics, gas routing and field
//! (the field's coarse_* counters count the levels below it).
struct HalvedGridField {
  Case c;
  ZoneNetwork net;
  Hydrodynamics hydro;
  GasRouting routing;
  OxygenField field;
};

//! Solves case `c`, whose network is `fine`, on the grid with half its radial and axial
//! counts (to a seed's tolerance, itself nested while still large). Empty when `fine` is below
//! newton.linear.nested_start_from_zones, the grid cannot be halved, or anything on the coarse
//! grid fails: the caller then starts cold, as it would without nesting.
//! `fine_inventory`, when given, is the gas routing's unit_inventory on `fine`: restricted, it
//! starts the coarse routing's iterative solve.
std::optional<HalvedGridField> solve_on_halved_grid(const Case& c, const ZoneNetwork& fine,
                                                    const std::vector<double>* fine_inventory, double biomass_kg_m3,
                                                    const NewtonOptions& newton);

//! solve_oxygen_field() from a cold start whose halved-grid field is already solved: `halved`
//! seeds it (moved from, and freed before the fine solve) or, when empty, no seed.
OxygenField solve_oxygen_field_seeded(const OxygenContext& ctx, double biomass_kg_m3, std::optional<HalvedGridField>& halved,
                                      const NewtonOptions& newton);

}  // namespace oxystrat
