// Files of a transient run: HDF5 time series of every summary value and field, CSV traces of the
// probe and the controller, a ParaView .pvd series of the fields, the report and terminal text.
#pragma once

#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/oxygen/transient.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

//! trace.csv (every step), probe.csv, controller.csv, result.h5, fields/*.vtu + transient.pvd,
//! report.html, all inside `folder`.
void write_transient_outputs(RunFolder& folder, const LoadedCase& loaded, const ZoneNetwork& net,
                             const TransientResult& r, const std::vector<std::string>& cautions);

//! What the terminal shows at the end of a run.
std::string transient_text(const Case& c, const TransientResult& r, const std::vector<std::string>& cautions);

}  // namespace oxystrat
