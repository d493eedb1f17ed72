#include "mesh/zone_network.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <numeric>
#include <stdexcept>

#include "mesh/grid_lines.hpp"
#include "input/errors.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

struct Centroid {
  double r, z;
};

// Centroid of the wetted part of an annular cell. Uncut cells in closed form; cells cut by the
// head by a 256-interval midpoint rule (positions are for display and hydrostatics, where 1e-5
// relative is plenty).
Centroid wetted_centroid(const VesselShape& s, double r0, double r1, double z0, double z1) {
  if (s.bottom_height(r1) <= z0) {
    const double r = (2.0 / 3.0) * (r1 * r1 * r1 - r0 * r0 * r0) / (r1 * r1 - r0 * r0);
    return {r, 0.5 * (z0 + z1)};
  }
  constexpr int n = 256;
  double m0 = 0.0, mr = 0.0, mz = 0.0;
  for (int k = 0; k < n; ++k) {
    const double r = r0 + (r1 - r0) * (k + 0.5) / n;
    const double lo = std::clamp(s.bottom_height(r), z0, z1);
    m0 += r * (z1 - lo);
    mr += r * r * (z1 - lo);
    mz += r * 0.5 * (z1 * z1 - lo * lo);
  }
  if (m0 <= 0.0) return {0.5 * (r0 + r1), z1};
  return {mr / m0, mz / m0};
}

}  // namespace

double ZoneNetwork::total_volume() const { return std::accumulate(volume.begin(), volume.end(), 0.0); }

int ZoneNetwork::zone_containing(double rq, double zq) const {
  if (rq < 0.0 || rq > r_lines.back() || zq < 0.0 || zq > z_lines.back()) return -1;
  const auto col = std::min<long>(std::upper_bound(r_lines.begin(), r_lines.end(), rq) - r_lines.begin() - 1,
                                  columns() - 1);
  const auto row = std::min<long>(std::upper_bound(z_lines.begin(), z_lines.end(), zq) - z_lines.begin() - 1,
                                  rows() - 1);
  return zone_at(static_cast<int>(col), static_cast<int>(row));
}

ZoneNetwork build_zone_geometry(const Case& c) {
  ZoneNetwork net;
  net.shape = VesselShape(c.vessel.diameter_m, c.vessel.bottom);
  net.liquid_height = c.vessel.liquid_height_m;
  const double big_r = net.shape.radius();
  const double h = net.liquid_height;

  // Grid lines through every impeller band edge and tip, the sparger and the head seam, in each
  // direction that has more than one cell (a one-cell direction is the textbook lumped limit).
  std::vector<double> r_req, z_req;
  for (const auto& imp : c.impellers) {
    r_req.push_back(0.5 * imp.diameter_m);
    z_req.push_back(imp.elevation_m - 0.5 * imp.blade_height_m);
    z_req.push_back(imp.elevation_m + 0.5 * imp.blade_height_m);
  }
  if (c.has_sparger) {
    r_req.push_back(0.5 * c.sparger.diameter_m);
    z_req.push_back(c.sparger.elevation_m);
  }
  z_req.push_back(net.shape.head_depth());
  net.r_lines = c.grid.radial > 1 ? aligned_lines(0.0, big_r, r_req, c.grid.radial) : std::vector<double>{0.0, big_r};
  net.z_lines = c.grid.axial > 1 ? aligned_lines(0.0, h, z_req, c.grid.axial) : std::vector<double>{0.0, h};

  const int nc = net.columns();
  const int nr = net.rows();
  const auto cell = [nc](int i, int j) { return static_cast<size_t>(j) * nc + i; };
  // Wetted extent of the face between cell (i, j) and its outer neighbour (heights lo..hi), and
  // of the face with the cell above (radii r_lines[i]..returned radius).
  const auto radial_face = [&](int i, int j) {
    const double floor = net.shape.bottom_height(net.r_lines[i + 1]);
    return std::pair{std::max(net.z_lines[j], floor), net.z_lines[j + 1]};
  };
  const auto axial_face_outer_radius = [&](int i, int j) {
    return std::min(net.r_lines[i + 1], net.shape.wetted_radius(net.z_lines[j + 1]));
  };
  std::vector<char> wet(static_cast<size_t>(nc) * nr, 0), joined(wet.size(), 0);
  for (int j = 0; j < nr; ++j) {
    for (int i = 0; i < nc; ++i) {
      wet[cell(i, j)] = net.shape.annulus_volume(net.r_lines[i], net.r_lines[i + 1], net.z_lines[j], net.z_lines[j + 1]) > 0.0;
    }
  }
  // A wetted cell becomes a zone only if it has a face with another: where the head just touches
  // a cell corner, the volume and the face extents can round to opposite sides of zero (they are
  // computed in different expressions), and a zone without faces would make every transport
  // operator singular.
  for (int j = 0; j < nr; ++j) {
    for (int i = 0; i < nc; ++i) {
      if (!wet[cell(i, j)]) continue;
      if (i + 1 < nc && wet[cell(i + 1, j)]) {
        const auto [lo, hi] = radial_face(i, j);
        if (hi > lo) joined[cell(i, j)] = joined[cell(i + 1, j)] = 1;
      }
      if (j + 1 < nr && wet[cell(i, j + 1)] && axial_face_outer_radius(i, j) > net.r_lines[i]) {
        joined[cell(i, j)] = joined[cell(i, j + 1)] = 1;
      }
    }
  }
  net.zone_of_cell.assign(static_cast<size_t>(nc) * nr, -1);
  for (int j = 0; j < nr; ++j) {
    for (int i = 0; i < nc; ++i) {
      if (!wet[cell(i, j)] || !(joined[cell(i, j)] || nc * nr == 1)) continue;
      const double r0 = net.r_lines[i], r1 = net.r_lines[i + 1];
      const double z0 = net.z_lines[j], z1 = net.z_lines[j + 1];
      net.zone_of_cell[cell(i, j)] = net.size();
      const auto centroid = wetted_centroid(net.shape, r0, r1, z0, z1);
      net.column.push_back(i);
      net.row.push_back(j);
      net.volume.push_back(net.shape.annulus_volume(r0, r1, z0, z1));
      net.r.push_back(centroid.r);
      net.z.push_back(centroid.z);
      net.r0.push_back(r0);
      net.r1.push_back(r1);
      net.z0.push_back(z0);
      net.z1.push_back(z1);
      net.z_floor_inner.push_back(std::clamp(net.shape.bottom_height(r0), z0, z1));
      net.z_floor_outer.push_back(std::clamp(net.shape.bottom_height(r1), z0, z1));
      net.depth.push_back(h - centroid.z);
      net.pressure.push_back(c.vessel.head_pressure_pa + c.broth.density_kg_m3 * kG * (h - centroid.z));
    }
  }

  // Faces between neighbouring zones, with their wetted extent.
  const double pi = std::numbers::pi;
  for (int j = 0; j < nr; ++j) {
    for (int i = 0; i < nc; ++i) {
      const int a = net.zone_at(i, j);
      if (a < 0) continue;
      if (i + 1 < nc) {
        const int b = net.zone_at(i + 1, j);
        const double rf = net.r_lines[i + 1];
        const auto [lo, hi] = radial_face(i, j);
        if (b >= 0 && hi > lo) {
          Face f;
          f.zone_a = a;
          f.zone_b = b;
          f.orientation = FaceOrientation::radial;
          f.area = 2.0 * pi * rf * (hi - lo);
          f.ra = rf, f.za = lo, f.rb = rf, f.zb = hi;
          f.a_on_wall = lo > net.z_lines[j];
          f.spacing = net.r[b] - net.r[a];
          net.faces.push_back(f);
        }
      }
      if (j + 1 < nr) {
        const int b = net.zone_at(i, j + 1);
        const double zf = net.z_lines[j + 1];
        const double r_wet = axial_face_outer_radius(i, j);
        const double r_in = net.r_lines[i];
        if (b >= 0 && r_wet > r_in) {
          Face f;
          f.zone_a = a;
          f.zone_b = b;
          f.orientation = FaceOrientation::axial;
          f.area = pi * (r_wet * r_wet - r_in * r_in);
          f.ra = r_in, f.za = zf, f.rb = r_wet, f.zb = zf;
          f.b_on_wall = r_wet < net.r_lines[i + 1];
          f.spacing = net.z[b] - net.z[a];
          net.faces.push_back(f);
        }
      }
    }
  }

  // Regions: the impeller domains split at the midpoints between impeller planes.
  const int nz = net.size();
  net.region.assign(nz, ZoneRegion{});
  for (int k = 0; k < nz; ++k) {
    int d = 0;
    for (size_t m = 0; m + 1 < c.impellers.size(); ++m) {
      if (net.z[k] > 0.5 * (c.impellers[m].elevation_m + c.impellers[m + 1].elevation_m)) d = static_cast<int>(m) + 1;
    }
    net.region[k].domain = d;
  }
  for (size_t m = 0; m < c.impellers.size(); ++m) {
    const auto& imp = c.impellers[m];
    const double ri = 0.5 * imp.diameter_m;
    const double lo = imp.elevation_m - 0.5 * imp.blade_height_m;
    const double hi = imp.elevation_m + 0.5 * imp.blade_height_m;
    bool any = false;
    for (int k = 0; k < nz; ++k) {
      if (net.region[k].discharge < 0 && net.r[k] < ri && net.z[k] > lo && net.z[k] < hi) {
        net.region[k].discharge = static_cast<int>(m);
        any = true;
      }
    }
    // A grid too coarse to resolve the swept volume: the zone holding the blades stands in for it.
    if (!any) {
      const int k = net.zone_containing(0.5 * ri, imp.elevation_m);
      if (k >= 0 && net.region[k].discharge < 0) net.region[k].discharge = static_cast<int>(m);
    }
  }

  // Sparged gas enters the row just above the sparger, spread over its footprint r <= R_s by area.
  net.sparger_share.assign(nz, 0.0);
  if (c.has_sparger) {
    const double rs = 0.5 * c.sparger.diameter_m;
    const double zs = c.sparger.elevation_m;
    int row = nr - 1;
    for (int j = 0; j < nr; ++j) {
      if (net.z_lines[j + 1] > zs + 1e-9 * h) {
        row = j;
        break;
      }
    }
    double total = 0.0;
    for (int i = 0; i < nc; ++i) {
      const int k = net.zone_at(i, row);
      const double r_in = net.r_lines[i];
      const double r_out = std::min(net.r_lines[i + 1], rs);
      if (k < 0 || r_out <= r_in) continue;
      net.sparger_share[k] = r_out * r_out - r_in * r_in;
      total += net.sparger_share[k];
    }
    if (total <= 0.0) {  // footprint in a dry cell (coarse grid in the head): use the zone above the sparger
      const int k = net.zone_containing(0.5 * rs, zs);
      if (k < 0) throw CaseError("sparger lies outside the liquid");
      net.sparger_share[k] = total = 1.0;
    }
    for (int k = 0; k < nz; ++k) {
      net.sparger_share[k] /= total;
      net.region[k].sparger = net.sparger_share[k] > 0.0;
    }
  }
  return net;
}

}  // namespace oxystrat
