#include "solver/flow/loop_flow.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

namespace oxystrat {
namespace {

// Rises from 0 at distance 0 to 1 at `length`, steepest at 0, optionally through a straight jet
// stretch reaching jet_share at `jet`.
double piece(double distance, double length, double jet) {
  if (distance <= 0.0) return 0.0;
  if (distance >= length) return 1.0;
  if (jet > 0.0) {
    if (distance < jet) return jet_share * distance / jet;
    return jet_share + (1.0 - jet_share) * std::sin(0.5 * std::numbers::pi * (distance - jet) / (length - jet));
  }
  return std::sin(0.5 * std::numbers::pi * distance / length);
}

double radial_shape(const CirculationLoop& l, double wall_r, double r) {
  if (r <= 0.0 || r >= wall_r) return 0.0;
  if (r < l.r_core) {
    const double s = r / l.r_core;
    return s * s * (2.0 - s * s);  // ~ r^2 at the axis: finite axial velocity there
  }
  if (r <= l.r_eye) return 1.0;
  const double x = (r - l.r_eye) / (wall_r - l.r_eye);
  return std::cos(0.5 * std::numbers::pi * x);
}

}  // namespace

std::vector<CirculationLoop> circulation_loops(const Case& c, const std::vector<double>& circulation_m3_s) {
  const double wall_r = 0.5 * c.vessel.diameter_m;
  const double h = c.vessel.liquid_height_m;
  const auto& imps = c.impellers;
  std::vector<CirculationLoop> loops;
  for (size_t m = 0; m < imps.size(); ++m) {
    const auto& imp = imps[m];
    const double lo = m == 0 ? 0.0 : 0.5 * (imps[m - 1].elevation_m + imp.elevation_m);
    const double hi = m + 1 == imps.size() ? h : 0.5 * (imp.elevation_m + imps[m + 1].elevation_m);
    const double half_band = 0.5 * imp.blade_height_m;
    CirculationLoop base;
    base.r_core = 0.5 * imp.diameter_m;
    base.floor_on_head = m == 0;
    if (is_radial(imp.type)) {
      // Two loops meeting in the discharge plane; the jet reaches the wall, so psi keeps its
      // peak across the inner half of the annulus outside the tip.
      base.r_eye = base.r_core + 0.5 * (wall_r - base.r_core);
      CirculationLoop lower = base, upper = base;
      lower.z_lo = lo, lower.z_hi = imp.elevation_m;
      lower.fall_len = radial_eye_height * (lower.z_hi - lower.z_lo);
      lower.rise_len = lower.z_hi - lower.z_lo - lower.fall_len;
      lower.fall_jet = half_band;
      lower.flow_m3_s = -0.5 * circulation_m3_s[m];
      upper.floor_on_head = false;
      upper.z_lo = imp.elevation_m, upper.z_hi = hi;
      upper.rise_len = radial_eye_height * (upper.z_hi - upper.z_lo);
      upper.fall_len = upper.z_hi - upper.z_lo - upper.rise_len;
      upper.rise_jet = half_band;
      upper.flow_m3_s = 0.5 * circulation_m3_s[m];
      loops.push_back(lower);
      loops.push_back(upper);
    } else {
      // One loop through the swept disc, at its peak across the blade band.
      CirculationLoop loop = base;
      loop.r_eye = base.r_core;
      loop.z_lo = lo, loop.z_hi = hi;
      loop.rise_len = imp.elevation_m - half_band - lo;
      loop.fall_len = hi - imp.elevation_m - half_band;
      loop.flow_m3_s = (pumping_direction(imp.type) < 0 ? 1.0 : -1.0) * circulation_m3_s[m];
      loops.push_back(loop);
    }
  }
  // Neighbours turning the same way are one loop: the flow passes from one to the other. The
  // merged loop keeps the ends of its first and last member and no radial plateau.
  std::vector<CirculationLoop> merged;
  for (const auto& l : loops) {
    if (!merged.empty() && (merged.back().flow_m3_s > 0.0) == (l.flow_m3_s > 0.0)) {
      auto& m = merged.back();
      m.fall_len = l.fall_len;
      m.fall_jet = l.fall_jet;
      m.z_hi = l.z_hi;
      m.r_core = m.r_eye = std::max(m.r_core, l.r_core);
      if (std::abs(l.flow_m3_s) > std::abs(m.flow_m3_s)) m.flow_m3_s = l.flow_m3_s;
    } else {
      merged.push_back(l);
    }
  }
  return merged;
}

double stream_function(const std::vector<CirculationLoop>& loops, const VesselShape& shape, double r, double z) {
  const double wall_r = shape.radius();
  double psi = 0.0;
  for (const auto& l : loops) {
    const double floor = l.floor_on_head ? std::max(l.z_lo, shape.bottom_height(r)) : l.z_lo;
    if (z <= floor || z >= l.z_hi) continue;
    const double g = std::min(piece(z - floor, l.rise_len, l.rise_jet), piece(l.z_hi - z, l.fall_len, l.fall_jet));
    psi += l.flow_m3_s / (2.0 * std::numbers::pi) * radial_shape(l, wall_r, r) * g;
  }
  return psi;
}

}  // namespace oxystrat
