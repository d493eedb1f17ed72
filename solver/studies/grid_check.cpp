#include "solver/studies/grid_check.hpp"

#include <fmt/format.h>

#include <cmath>

#include "solver/oxygen/case_run.hpp"
#include "solver/flow/mixing_time.hpp"

namespace oxystrat {

namespace {

// A grid coarser than `finer` (zone count n_finer) by a cell-size ratio of at least 1.5: the
// alignment lines keep some cells, so the counts are reduced step by step until the measured
// ratio sqrt(n_finer / n) reaches 1.5.
Grid coarser(const Case& c, const Grid& finer, int n_finer) {
  for (double f = 1.5; f < 20.0; f += 0.05) {
    Case ci = c;
    ci.grid.radial = std::max(1, static_cast<int>(std::lround(finer.radial / f)));
    ci.grid.axial = std::max(1, static_cast<int>(std::lround(finer.axial / f)));
    if (std::sqrt(static_cast<double>(n_finer) / build_zone_geometry(ci).size()) >= 1.5) return ci.grid;
  }
  return Grid{1, 1};
}

}  // namespace

std::string grid_check_verdict(const GridConvergence& cv, bool near_zero, const std::string& unit) {
  if (cv.converged_already) return "the same on all three grids";
  if (cv.oscillatory) return "oscillates between grids: no order can be observed; refine (grid.radial, grid.axial)";
  if (near_zero) {
    return fmt::format("near zero on the fine grid: judge by the absolute band +-{:.3g} {}", cv.gci_fine_absolute, unit);
  }
  if (!in_asymptotic_range(cv.observed_order, network_scheme_order)) {
    return fmt::format("observed order {:.2f} against the scheme's {:.0f}: not in the asymptotic range, so the GCI "
                       "({:.2g} %) is no error estimate; refine (grid.radial, grid.axial)",
                       cv.observed_order, network_scheme_order, 100 * cv.gci_fine);
  }
  if (cv.gci_fine > 0.10) {
    return fmt::format("GCI {:.0f} %: the grid is too coarse for this quantity; refine", 100 * cv.gci_fine);
  }
  return fmt::format("GCI {:.1f} %: adequate", 100 * cv.gci_fine);
}

GridCheck grid_check(const Case& c) {
  GridCheck g;
  Grid grids[3] = {c.grid, {}, {}};
  grids[1] = coarser(c, grids[0], build_zone_geometry(c).size());
  Case medium = c;
  medium.grid = grids[1];
  grids[2] = coarser(c, grids[1], build_zone_geometry(medium).size());
  double values[3][3] = {};  // [grid][quantity]
  for (int i = 0; i < 3; ++i) {
    Case ci = c;
    ci.grid = grids[i];
    const auto run = run_case(ci, {false});
    g.zones[i] = run.net.size();
    g.cell_size[i] = std::sqrt(run.net.shape.radius() * run.net.liquid_height / run.net.size());
    values[i][0] = run.field ? run.field->do_min : std::nan("");
    values[i][1] = run.field ? 100.0 * run.field->volume_fraction_below_critical : std::nan("");
    values[i][2] = tracer_mixing_time(run.net, run.hydro, {}).theta_s;
  }
  const char* names[3] = {"DO min", "volume below critical DO", "theta95"};
  const char* unit_names[3] = {"mmol/L", "%", "s"};
  for (int q = 0; q < 3; ++q) {
    GridCheckQuantity gq{names[q], unit_names[q], values[0][q], values[1][q], values[2][q], {}, ""};
    if (!std::isfinite(gq.fine)) continue;
    gq.convergence = grid_convergence(gq.fine, gq.medium, gq.coarse, g.cell_size[0], g.cell_size[1], g.cell_size[2]);
    const bool tiny = std::abs(gq.fine) < 1e-3 * std::max(std::abs(gq.medium), std::abs(gq.coarse)) ||
                      (q == 0 && gq.fine < 1e-4) || (q == 1 && gq.fine < 0.05);
    gq.verdict = grid_check_verdict(gq.convergence, tiny, gq.unit);
    if (gq.verdict.find("refine") != std::string::npos) g.warnings.push_back(std::string(names[q]) + ": " + gq.verdict);
    g.quantities.push_back(gq);
  }
  return g;
}

}  // namespace oxystrat
