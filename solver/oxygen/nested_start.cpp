#include "solver/oxygen/nested_start.hpp"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <optional>

#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"

namespace oxystrat {

namespace {

// The coarse field only seeds the fine solve, whose first scaled residual after interpolation is
// 1e-3 .. 1e-5 (the two grids' discretisations differ): a coarse residual of 1e-7 changes the seed
// far below that. Measured against 1e-12 at 5e4 and 2e5 zones: same fine Newton and Krylov
// counts, 30-50 % less coarse work; 1e-5 cost the 5e4 fine solve an extra Newton step.
constexpr double kCoarseTolerance = 1e-7;
// Its gas routing likewise: the inert gas per zone to 1e-8 moves the seed's gas composition by as
// little (at 2.5e5 zones 39 instead of 57 Krylov iterations: ~0.4 s of a million-zone solve).
constexpr double kCoarseRoutingTolerance = 1e-8;

// Coarse zone whose cell holds (r, z); a point in a cell without liquid (the coarse bottom head
// cuts differently) takes the lowest wetted cell above it in the same column.
int containing_zone(const ZoneNetwork& coarse, double r, double z) {
  const int k = coarse.zone_containing(r, z);
  if (k >= 0) return k;
  const auto col = std::clamp<long>(std::upper_bound(coarse.r_lines.begin(), coarse.r_lines.end(), r) - coarse.r_lines.begin() - 1,
                                    0, coarse.columns() - 1);
  for (int row = 0; row < coarse.rows(); ++row) {
    const int above = coarse.zone_at(static_cast<int>(col), row);
    if (above >= 0 && coarse.z1[above] > z) return above;
  }
  for (int row = coarse.rows() - 1; row >= 0; --row) {
    const int any = coarse.zone_at(static_cast<int>(col), row);
    if (any >= 0) return any;
  }
  return 0;  // unreachable for a network with liquid in every column
}

// Volume-weighted mean of the fine zones' values over each coarse zone (the one that holds the
// fine centroid); 0 where no fine centroid falls.
std::vector<double> volume_mean_on(const ZoneNetwork& coarse, const ZoneNetwork& fine, const std::vector<double>& values) {
  std::vector<double> sum(coarse.size(), 0.0), volume(coarse.size(), 0.0);
  const auto owner = coarse_owners(coarse, fine);
  for (int k = 0; k < fine.size(); ++k) {
    const int kc = owner[k];
    sum[kc] += values[k] * fine.volume[k];
    volume[kc] += fine.volume[k];
  }
  for (int kc = 0; kc < coarse.size(); ++kc) sum[kc] = volume[kc] > 0.0 ? sum[kc] / volume[kc] : 0.0;
  return sum;
}

}  // namespace

std::vector<int> coarse_owners(const ZoneNetwork& coarse, const ZoneNetwork& fine) {
  std::vector<int> owner(fine.size());
  for (int k = 0; k < fine.size(); ++k) owner[k] = containing_zone(coarse, fine.r[k], fine.z[k]);
  return owner;
}

std::vector<ZoneStencil> interpolation_stencils(const ZoneNetwork& coarse, const ZoneNetwork& fine) {
  std::vector<ZoneStencil> s(fine.size());
  // Centroids of uncut cells in one column (row) share r (z) exactly; the tolerance only absorbs
  // round-off, it does not admit cut cells (their centroids move by a fraction of a cell).
  const double same = 1e-12 * (coarse.r_lines.back() + coarse.z_lines.back());
  for (int k = 0; k < fine.size(); ++k) {
    const double r = fine.r[k], z = fine.z[k];
    const int kc = containing_zone(coarse, r, z);
    s[k].zone = {kc, kc, kc, kc};
    s[k].weight = {1.0, 0.0, 0.0, 0.0};
    const int c0 = r >= coarse.r[kc] ? coarse.column[kc] : coarse.column[kc] - 1;
    const int r0 = z >= coarse.z[kc] ? coarse.row[kc] : coarse.row[kc] - 1;
    if (c0 < 0 || r0 < 0 || c0 + 1 >= coarse.columns() || r0 + 1 >= coarse.rows()) continue;
    const int a = coarse.zone_at(c0, r0), b = coarse.zone_at(c0 + 1, r0);
    const int c = coarse.zone_at(c0, r0 + 1), d = coarse.zone_at(c0 + 1, r0 + 1);
    if (a < 0 || b < 0 || c < 0 || d < 0) continue;
    const bool rectangle = std::abs(coarse.r[a] - coarse.r[c]) <= same && std::abs(coarse.r[b] - coarse.r[d]) <= same &&
                           std::abs(coarse.z[a] - coarse.z[b]) <= same && std::abs(coarse.z[c] - coarse.z[d]) <= same;
    if (!rectangle) continue;
    const double t = std::clamp((r - coarse.r[a]) / (coarse.r[b] - coarse.r[a]), 0.0, 1.0);
    const double u = std::clamp((z - coarse.z[a]) / (coarse.z[c] - coarse.z[a]), 0.0, 1.0);
    s[k].zone = {a, b, c, d};
    s[k].weight = {(1.0 - t) * (1.0 - u), t * (1.0 - u), (1.0 - t) * u, t * u};
    s[k].bilinear = true;
  }
  return s;
}

std::vector<double> interpolate(const std::vector<ZoneStencil>& stencils, const std::vector<double>& coarse_values) {
  std::vector<double> v(stencils.size());
  for (size_t k = 0; k < stencils.size(); ++k) {
    const auto& s = stencils[k];
    v[k] = s.weight[0] * coarse_values[s.zone[0]] + s.weight[1] * coarse_values[s.zone[1]] +
           s.weight[2] * coarse_values[s.zone[2]] + s.weight[3] * coarse_values[s.zone[3]];
  }
  return v;
}

Eigen::VectorXd nested_state(const ZoneNetwork& coarse, const OxygenField& coarse_field, const ZoneNetwork& fine,
                             const std::vector<double>& fine_inert_mol_m3, const Eigen::VectorXd& cold) {
  const auto stencils = interpolation_stencils(coarse, fine);
  const auto c_o2 = interpolate(stencils, coarse_field.do_mol_m3);
  const auto c_co2 = interpolate(stencils, coarse_field.co2_mol_m3);
  Eigen::VectorXd x = cold;
  for (int k = 0; k < fine.size(); ++k) {
    x[4 * k] = c_o2[k];
    x[4 * k + 1] = c_co2[k];
    // Mole fractions from the coarse zones that carry gas only: a gasless neighbour's y = 0
    // (below the sparger) would put the fine zone's total flow ~25 % low at the gassed edge.
    double w = 0.0, y_o2 = 0.0, y_co2 = 0.0;
    const auto& s = stencils[k];
    for (int i = 0; i < 4; ++i) {
      const int kc = s.zone[i];
      if (s.weight[i] == 0.0 || !(coarse_field.superficial_gas_m_s[kc] > 0.0)) continue;
      w += s.weight[i];
      y_o2 += s.weight[i] * coarse_field.y_o2[kc];
      y_co2 += s.weight[i] * coarse_field.y_co2[kc];
    }
    const double inert = fine_inert_mol_m3[k];
    if (!(w > 0.0) || !(inert > 0.0)) continue;  // keep the no-transfer gas of `cold`
    y_o2 /= w, y_co2 /= w;
    const double y_inert = 1.0 - y_o2 - y_co2;
    if (!(y_inert > 0.0)) continue;
    const double total = inert / y_inert;  // [mol/m3]
    x[4 * k + 2] = y_o2 * total;
    x[4 * k + 3] = y_co2 * total;
  }
  return x;
}

std::optional<HalvedGridField> solve_on_halved_grid(const Case& c, const ZoneNetwork& fine,
                                                    const std::vector<double>* fine_inventory, double biomass_kg_m3,
                                                    const NewtonOptions& newton) {
  if (fine.size() < newton.linear.nested_start_from_zones) return std::nullopt;
  Case coarse_case = c;
  coarse_case.grid = c.grid.halved();
  if (coarse_case.grid.radial == c.grid.radial && coarse_case.grid.axial == c.grid.axial) return std::nullopt;
  try {
    HalvedGridField level;
    level.c = coarse_case;
    level.net = build_zone_geometry(coarse_case);
    level.hydro = compute_hydrodynamics(coarse_case, level.net);
    const Hydrodynamics& hydro = level.hydro;
    SolverOptions seed_linear = newton.linear;
    seed_linear.gas_routing_tolerance = std::max(newton.linear.gas_routing_tolerance, kCoarseRoutingTolerance);
    // This level's gas routing (one sequential multigrid solve) on the second thread, while the
    // levels below, which need only the case, are solved on the first (their own threads then
    // run one by one: nested regions are inactive). A pool thread, so that what the routing
    // frees stays in the heap the later solves on that thread draw from.
    std::vector<double> guess;
    if (fine_inventory != nullptr) guess = volume_mean_on(level.net, fine, *fine_inventory);
    std::optional<GasRouting> gas;
    std::optional<HalvedGridField> below;
    std::exception_ptr failed;
#pragma omp parallel sections num_threads(2)
    {
#pragma omp section
      try {
        gas = route_gas(coarse_case, level.net, hydro, seed_linear, guess.empty() ? nullptr : &guess);
      } catch (...) {
        failed = std::current_exception();
      }
#pragma omp section
      try {
        below = solve_on_halved_grid(coarse_case, level.net, nullptr, biomass_kg_m3, newton);
      } catch (...) {
        below.reset();  // no seed below: this level starts cold
      }
    }
    if (failed) std::rethrow_exception(failed);
    NewtonOptions loose = newton;
    loose.balance_tolerance = std::numeric_limits<double>::infinity();  // a seed: the fine solve closes them
    loose.tolerance = std::max(newton.tolerance, kCoarseTolerance);
    level.routing = std::move(*gas);
    level.field = solve_oxygen_field_seeded({level.c, level.net, hydro, level.routing}, biomass_kg_m3, below, loose);
    return level;
  } catch (const std::exception&) {
    return std::nullopt;
  }
}

}  // namespace oxystrat
