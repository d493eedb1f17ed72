// Exact geometry of an axisymmetric vessel with a flat, 2:1 ellipsoidal or hemispherical bottom.
// Heights are measured from the lowest point of the vessel.
#pragma once

#include <string>

namespace oxystrat {

enum class BottomShape { flat, ellipsoidal, hemispherical };
std::string to_string(BottomShape s);

class VesselShape {
 public:
  VesselShape(double diameter_m, BottomShape bottom);

  double radius() const { return radius_; }
  //! Depth of the bottom head [m]: 0, T/4 (2:1 ellipsoidal) or T/2 (hemispherical).
  double head_depth() const { return head_depth_; }
  BottomShape bottom() const { return bottom_; }

  //! Height of the bottom surface at radius r [m].
  double bottom_height(double r) const;
  //! Radius of the liquid cross-section at height z [m] (the inverse of bottom_height).
  double wetted_radius(double z) const;
  //! Liquid volume between the lowest point and height z [m3].
  double volume_below(double z) const;
  //! Height z whose volume_below equals v [m].
  double height_for_volume(double v) const;
  //! Wetted volume of the annular cell r0..r1, z0..z1 [m3], exact.
  double annulus_volume(double r0, double r1, double z0, double z1) const;

 private:
  double radius_;
  double head_depth_;
  BottomShape bottom_;
  //! Integral of r * bottom_height(r) dr from 0 to r [m3].
  double moment(double r) const;
};

}  // namespace oxystrat
