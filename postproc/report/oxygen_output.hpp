// Output of the oxygen field: HDF5 /fields, /summary, /profile and /cautions; profile.csv; VTK
// arrays (DO also in mg/L and % saturation); the compact terminal summary.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/case_run.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/vtk_writer.hpp"

namespace oxystrat {

void write_oxygen_h5(H5Writer& h5, const Case& c, const CaseRun& run);
void write_profile_csv(const std::string& path, const CaseRun& run);
std::vector<CellArray> oxygen_cell_arrays(const CaseRun& run);
//! The zone model beside the single-zone answer, where the minimum is, C* bottom/top, off-gas,
//! balance residual, supportable biomass, cautions.
//! Which kLa model a case uses, in words.
std::string kla_model_description(const Case& c);
//! One line on the gas: holdup, bubble sizes and rise velocities, gassed level.
std::string gas_summary(const CaseRun& run);

std::string oxygen_summary(const Case& c, const CaseRun& run);

}  // namespace oxystrat
