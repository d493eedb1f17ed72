// The zone network: well-mixed annular zones of an axisymmetric (r, z) grid and the faces between
// them. Plain data, built once from a Case; the hydrodynamics adds flows to it (hydrodynamics.hpp).
#pragma once

#include <vector>

#include "input/case.hpp"
#include "physics/vessel_shape.hpp"

namespace oxystrat {

enum class FaceOrientation { radial, axial };  // radial: a cylinder r = const; axial: a disc z = const

struct Face {
  int zone_a = 0;  //!< inner (radial face) or lower (axial face) zone
  int zone_b = 0;  //!< outer or upper zone
  FaceOrientation orientation = FaceOrientation::radial;
  double area = 0.0;  //!< wetted area [m2]
  //! End points of the face's (r, z) trace [m]; a on the axis/bottom side, b on the other.
  double ra = 0.0, za = 0.0, rb = 0.0, zb = 0.0;
  bool a_on_wall = false;  //!< end a lies on the vessel bottom (stream function is 0 there)
  bool b_on_wall = false;
  //! Distance between the two zone centres across the face [m].
  double spacing = 0.0;
};

//! Tags of one zone: which impeller's domain it lies in, which impeller's swept volume (or -1),
//! whether sparged gas enters it.
struct ZoneRegion {
  int domain = 0;
  int discharge = -1;
  bool sparger = false;
};

struct ZoneNetwork {
  VesselShape shape{1.0, BottomShape::flat};
  double liquid_height = 0.0;  //!< H [m]
  std::vector<double> r_lines;  //!< radial grid lines, 0 .. R [m]
  std::vector<double> z_lines;  //!< axial grid lines, 0 .. H [m]

  // Per zone (index = zone id). Only grid cells with wetted volume become zones.
  std::vector<int> column, row;         //!< grid position
  std::vector<double> volume;           //!< wetted volume [m3]
  std::vector<double> r, z;             //!< centroid [m]
  std::vector<double> r0, r1, z0, z1;   //!< grid-cell bounds [m]
  std::vector<double> z_floor_inner, z_floor_outer;  //!< wetted bottom at r0 and r1 [m] (= z0 unless cut by the head)
  std::vector<double> depth;            //!< depth of the centroid below the surface [m]
  std::vector<double> pressure;         //!< absolute hydrostatic pressure at the centroid, ungassed [Pa]
  std::vector<ZoneRegion> region;
  std::vector<double> sparger_share;    //!< share of the sparged gas entering each zone [-], sums to 1

  std::vector<Face> faces;
  std::vector<int> zone_of_cell;        //!< grid cell (row * columns + column) -> zone id, or -1

  int columns() const { return static_cast<int>(r_lines.size()) - 1; }
  int rows() const { return static_cast<int>(z_lines.size()) - 1; }
  int size() const { return static_cast<int>(volume.size()); }
  int zone_at(int col, int row) const { return zone_of_cell[static_cast<size_t>(row) * columns() + col]; }
  double total_volume() const;
  //! Zone whose grid cell contains (r, z), or -1 outside the liquid.
  int zone_containing(double r, double z) const;
};

//! Builds the grid, zones and faces of a case (no flows yet).
ZoneNetwork build_zone_geometry(const Case& c);

}  // namespace oxystrat
