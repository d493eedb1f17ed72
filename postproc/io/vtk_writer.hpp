// ParaView output: the zone network revolved into 3D (zones.vtu) and its (r, z) half-section
// (section.vtu), one cell per zone (and sector), zone arrays as cell data.
#pragma once

#include <string>
#include <vector>

#include "mesh/zone_network.hpp"

namespace oxystrat {

//! One per-zone array. A vector field is given by its (r, z) components; it is written as a
//! 3-component Cartesian array.
struct CellArray {
  std::string name;
  std::vector<double> values;    //!< scalar, or the r component of a vector
  std::vector<double> values_z;  //!< z component of a vector; empty for scalars
};

void write_zones_vtu(const std::string& path, const ZoneNetwork& net, int sectors,
                     const std::vector<CellArray>& arrays);
void write_section_vtu(const std::string& path, const ZoneNetwork& net, const std::vector<CellArray>& arrays);

//! A ParaView collection (.pvd) listing time-stamped .vtu files (paths relative to the .pvd).
void write_pvd(const std::string& path, const std::vector<double>& times_s, const std::vector<std::string>& files);

}  // namespace oxystrat
