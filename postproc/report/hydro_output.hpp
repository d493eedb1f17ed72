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

//! theta_x as /mixing/theta and /mixing/theta_probe with x as /mixing/homogeneity; at the default
//! x = 0.95 also under the names /mixing/theta95 and /mixing/theta95_probe.
void write_mixing_h5(H5Writer& h5, const MixingResult& m, double homogeneity);
//! time_s, c/c_final at the probe, max deviation over zones.
void write_mixing_csv(const std::string& path, const MixingResult& m);

}  // namespace oxystrat
