// Output of the hydrodynamics: HDF5 /impellers, /faces/flow, /faces/exchange, /fields/epsilon,
// /fields/velocity_*, /summary/power_*; VTK arrays; the terminal power table.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "postproc/io/h5_writer.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/mixing_time.hpp"
#include "postproc/io/vtk_writer.hpp"

namespace oxystrat {

void write_hydrodynamics_h5(H5Writer& h5, const Case& c, const Hydrodynamics& h);
//! "laminar", "transitional" or "turbulent" by the impeller's effective Reynolds number.
std::string impeller_flow_regime(const ImpellerState& s);

std::vector<CellArray> hydrodynamics_cell_arrays(const Hydrodynamics& h);
//! Per impeller: type, D/T, Np, P ungassed/gassed, regime, tip speed; then totals and P/V.
std::string power_table(const Case& c, const Hydrodynamics& h);

void write_mixing_h5(H5Writer& h5, const MixingResult& m);
//! time_s, c/c_final at the probe, max deviation over zones.
void write_mixing_csv(const std::string& path, const MixingResult& m);

}  // namespace oxystrat
