// What every run writes about its case and zone network: HDF5 groups /case, /zones, /faces and
// the matching VTK cell arrays.
#pragma once

#include <vector>

#include "case/case_reader.hpp"
#include "h5_writer.hpp"
#include "vtk_writer.hpp"
#include "zone_network.hpp"

namespace oxystrat {

void write_case_h5(H5Writer& h5, const LoadedCase& loaded);
void write_network_h5(H5Writer& h5, const ZoneNetwork& net);
//! The geometric zone arrays for VTK (volume, depth, pressure, region tags).
std::vector<CellArray> network_cell_arrays(const ZoneNetwork& net);

}  // namespace oxystrat
