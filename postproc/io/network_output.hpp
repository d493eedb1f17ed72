// What every run writes about its case and zone network: HDF5 groups /case, /zones, /faces and
// the matching VTK cell arrays.
#pragma once

#include <vector>

#include "input/case_reader.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/vtk_writer.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

void write_case_h5(H5Writer& h5, const LoadedCase& loaded);
void write_network_h5(H5Writer& h5, const ZoneNetwork& net);
//! The geometric zone arrays for VTK (volume, depth, pressure, region tags).
std::vector<CellArray> network_cell_arrays(const ZoneNetwork& net);

}  // namespace oxystrat
