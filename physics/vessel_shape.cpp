#include "physics/vessel_shape.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

namespace oxystrat {

std::string to_string(BottomShape s) {
  switch (s) {
    case BottomShape::flat: return "flat";
    case BottomShape::ellipsoidal: return "ellipsoidal";
    case BottomShape::hemispherical: return "hemispherical";
  }
  return "?";
}

// Head formulas: a head of revolution with semi-axes R (radial) and h (axial), a quarter ellipse
// in section. 2:1 ellipsoidal: h = T/4, V_head = pi T^3/24; hemispherical: h = T/2, V = pi T^3/12
// (standard vessel-head formulas, e.g. Perry's Chemical Engineers' Handbook, 8th ed., sec. 10).

VesselShape::VesselShape(double diameter_m, BottomShape bottom)
    : radius_(0.5 * diameter_m), bottom_(bottom) {
  switch (bottom) {
    case BottomShape::flat: head_depth_ = 0.0; break;
    case BottomShape::ellipsoidal: head_depth_ = 0.25 * diameter_m; break;
    case BottomShape::hemispherical: head_depth_ = 0.5 * diameter_m; break;
  }
}

double VesselShape::bottom_height(double r) const {
  if (head_depth_ == 0.0) return 0.0;
  const double s = std::clamp(r / radius_, 0.0, 1.0);
  return head_depth_ * (1.0 - std::sqrt(std::max(0.0, 1.0 - s * s)));
}

double VesselShape::wetted_radius(double z) const {
  if (head_depth_ == 0.0) return z >= 0.0 ? radius_ : 0.0;
  if (z <= 0.0) return 0.0;
  if (z >= head_depth_) return radius_;
  const double u = (head_depth_ - z) / head_depth_;
  return radius_ * std::sqrt(std::max(0.0, 1.0 - u * u));
}

double VesselShape::volume_below(double z) const {
  const double pi = std::numbers::pi;
  const double r2 = radius_ * radius_;
  if (z <= 0.0) return 0.0;
  if (z >= head_depth_) return (2.0 / 3.0) * pi * r2 * head_depth_ + pi * r2 * (z - head_depth_);
  const double h = head_depth_;
  return pi * r2 / (h * h) * (h * z * z - z * z * z / 3.0);
}

double VesselShape::height_for_volume(double v) const {
  const double head_volume = volume_below(head_depth_);
  const double area = std::numbers::pi * radius_ * radius_;
  if (v >= head_volume) return head_depth_ + (v - head_volume) / area;
  // Inside the head the volume is a monotone cubic in z: bisection is exact enough and simple.
  double lo = 0.0, hi = head_depth_;
  for (int i = 0; i < 200 && hi - lo > 1e-15 * head_depth_; ++i) {
    const double mid = 0.5 * (lo + hi);
    (volume_below(mid) < v ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

double VesselShape::moment(double r) const {
  if (head_depth_ == 0.0) return 0.0;
  const double s = std::clamp(r / radius_, 0.0, 1.0);
  const double w = std::max(0.0, 1.0 - s * s);
  const double r2 = radius_ * radius_;
  // d/dr [h r^2/2 + h R^2/3 (1 - r^2/R^2)^(3/2)] = h r - h r sqrt(1 - r^2/R^2) = r * bottom_height(r)
  return head_depth_ * (0.5 * s * s * r2 + r2 / 3.0 * w * std::sqrt(w)) - head_depth_ * r2 / 3.0;
}

double VesselShape::annulus_volume(double r0, double r1, double z0, double z1) const {
  if (r1 <= r0 || z1 <= z0) return 0.0;
  const double pi = std::numbers::pi;
  // Below r_full the whole height z0..z1 is wetted; beyond r_none nothing is.
  const double r_full = std::clamp(wetted_radius(z0), r0, r1);
  const double r_none = std::clamp(wetted_radius(z1), r0, r1);
  // Differences of squares as (a - b)(a + b): exactly zero for a == b, also where the compiler
  // fuses a * a - b * b into one multiply-add (which leaves b * b's rounding error behind).
  double v = (z1 - z0) * 0.5 * ((r_full - r0) * (r_full + r0));
  // Partly wetted band: integral of r (z1 - bottom_height(r)) dr.
  if (r_none > r_full) {
    v += z1 * 0.5 * ((r_none - r_full) * (r_none + r_full)) - (moment(r_none) - moment(r_full));
  }
  return 2.0 * pi * v;
}

}  // namespace oxystrat
