// Gas transport by drift flux: the inert gas balance is exact, gas reaches the zones below the
// sparger at complete dispersion and hardly when the impeller floods, bubbles are smaller where
// the dissipation is higher, and the holdup of a single-impeller vessel lies near a published
// correlation.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "case_fixtures.hpp"
#include "input/case_reader.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/studies/reference_cases.hpp"
#include "solver/oxygen/oxygen_field.hpp"

namespace oxystrat {
namespace {

using fixtures::Chain;

// One Rushton at H = T = 1 m in air-water (the validation's holdup vessel).
Case single_rushton(double speed_rpm, double vvm) { return reference_gassed_single_rushton(speed_rpm, vvm); }

TEST(GasRouting, EverythingSpargedLeavesThroughTheSurface) {
  // Inert gas: sparged = off-gas exactly (the transport's column sums vanish but at the surface),
  // to round-off of the sparse solve.
  for (const auto& c : {fixtures::gassed_vessel(6, 16), single_rushton(300, 1.0)}) {
    const Chain ch(c);
    EXPECT_NEAR(surface_flow(ch.routing, ch.routing.unit_inventory), 1.0, 1e-10);
    for (double g : ch.routing.unit_inventory) EXPECT_GT(g, 0.0);  // dispersion reaches every zone
  }
}

TEST(GasRouting, MultigridRoutingLeavesThroughTheSurfaceToItsTolerance) {
  // The large-network path on a small network: GMRES with multigrid to a relative residual of
  // 1e-10 (SolverOptions::gas_routing_tolerance, |s|_2 <= 1). The off-gas error is the residual's
  // sum, at most sqrt(N) times its 2-norm: 1e-10 x sqrt(~100 zones) = 1e-9. From zero, from a
  // start it corrects (the answer 30 % high in every other zone) and from one already within the
  // tolerance (the answer): the tolerance is on the residual of the start from zero in each case.
  const Case c = fixtures::gassed_vessel(6, 16);
  const auto net = build_zone_geometry(c);
  const auto hydro = compute_hydrodynamics(c, net);
  SolverOptions o;
  o.multigrid_from_zones = 1;
  o.multigrid_coarsest_size = 10;  // a real hierarchy on this small network
  const Chain exact(c);  // the exact LU of the default path
  std::vector<double> rough = exact.routing.unit_inventory;
  for (size_t k = 0; k < rough.size(); k += 2) rough[k] *= 1.3;
  const std::vector<const std::vector<double>*> starts{nullptr, &rough, &exact.routing.unit_inventory};
  for (const auto* start : starts) {
    const auto routing = route_gas(c, net, hydro, o, start);
    EXPECT_NEAR(surface_flow(routing, routing.unit_inventory), 1.0, 1e-10 * std::sqrt(net.size()));
    // Each zone's inventory as the LU's to 1e-8 relative. The error is the residual's image under
    // G^-1, so it depends on where GMRES stops inside its tolerance: measured 5e-11 from zero
    // (relative residual 4e-12) and 1.7e-9 from the rough start (relative residual 6e-11, just
    // inside the 1e-10); 1e-8 leaves room for another network.
    for (int k = 0; k < net.size(); ++k) {
      EXPECT_NEAR(routing.unit_inventory[k], exact.routing.unit_inventory[k], 1e-8 * exact.routing.unit_inventory[k]) << k;
    }
  }
}

double share_below_sparger(const Case& c) {
  const Chain ch(c);
  const auto& g = ch.routing.unit_inventory;
  double below = 0.0, v_below = 0.0, above = 0.0, v_above = 0.0;
  for (int k = 0; k < ch.net.size(); ++k) {
    (ch.net.z[k] < c.sparger.elevation_m ? below : above) += g[k] * ch.net.volume[k];
    (ch.net.z[k] < c.sparger.elevation_m ? v_below : v_above) += ch.net.volume[k];
  }
  return (below / v_below) / (above / v_above);
}

TEST(GasRouting, MultigridRoutingHoldsNoNegativeGasBesideTheCaverns) {
  // The viscous demo on 6 000 zones (the multigrid path): the stagnant broth beside the caverns
  // gets gas only by its bubbles' slow dispersion, 1e-30 and less of the inventory the caverns
  // hold. The iterative solve's error there, inside its tolerance, was negative (-1e-8 mol/m3
  // of inert gas on a halved 1e5-zone grid), which turned the zones' gas composition inside out.
  // -G^-1 of an M-matrix is non-negative: so must every inventory be, and the off-gas still
  // equals the sparged gas to the solve's tolerance.
  const Case c = read_case_file(fixtures::source_dir() + "/cases/viscous-broth-40m3.toml",
                                {parse_override("grid.radial=25"), parse_override("grid.axial=250")})
                     .data;
  const auto net = build_zone_geometry(c);
  ASSERT_GE(net.size(), SolverOptions{}.multigrid_from_zones);
  const auto routing = route_gas(c, net, compute_hydrodynamics(c, net));
  for (int k = 0; k < net.size(); ++k) EXPECT_GE(routing.unit_inventory[k], 0.0) << k;
  EXPECT_NEAR(surface_flow(routing, routing.unit_inventory), 1.0, 1e-10 * std::sqrt(net.size()));
}

TEST(GasRouting, CompletelyDispersingImpellerCarriesGasBelowTheSparger) {
  // 300 rpm, 0.5 vvm: completely dispersed (Nienow et al. 1985); 100 rpm, 2 vvm: flooded. The
  // lower loop of the dispersing impeller carries bubbles down past the sparger (measured 0.27 of
  // the holdup above it); the flooded impeller's weak loops leave gas there to turbulent
  // dispersion alone (0.06).
  const Case dispersed = single_rushton(300, 0.5), flooded = single_rushton(100, 2.0);
  const Chain a(dispersed), b(flooded);
  ASSERT_EQ(a.hydro.impellers[0].regime, GasRegime::dispersed);
  ASSERT_EQ(b.hydro.impellers[0].regime, GasRegime::flooded);
  EXPECT_GT(share_below_sparger(dispersed), 0.15);
  EXPECT_GT(share_below_sparger(dispersed), 3.0 * share_below_sparger(flooded));
}

TEST(GasRouting, BubblesAreSmallerWhereTheDissipationIsHigher) {
  const Case c = single_rushton(300, 1.0);
  const Chain ch(c);
  for (int i = 0; i < ch.net.size(); ++i) {
    for (int j = 0; j < ch.net.size(); ++j) {
      if (ch.hydro.epsilon[i] > ch.hydro.epsilon[j]) {
        EXPECT_LE(ch.routing.sauter_m[i], ch.routing.sauter_m[j]);
      }
    }
  }
  const auto [lo, hi] = std::minmax_element(ch.routing.sauter_m.begin(), ch.routing.sauter_m.end());
  EXPECT_LT(*lo, 0.5 * *hi);  // the impeller stream breaks bubbles well below the bulk's
  EXPECT_LE(*hi, coalesced_bubble_cap_m);
}

TEST(GasRouting, HoldupOfASingleRushtonNearThePublishedCorrelation) {
  // Volume-mean holdup against eps_G = 0.13 (P/V)^0.33 vs^0.67 (P/V in W/m3, vs in m/s), the form
  // for coalescing air-water in stirred tanks usually attributed to Smith, van 't Riet & Middleton
  // (1977) [mem: constants not confirmed]. Tolerance 35 %: the correlation's own scatter (~25 %,
  // [mem]) and the model's; measured -32 % to 0 % over these six points (the model's holdup rises
  // less with power than the correlation's).
  for (double rpm : {200.0, 300.0, 400.0}) {
    for (double vvm : {0.5, 1.0}) {
      const Case c = single_rushton(rpm, vvm);
      const Chain ch(c);
      const auto f = solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
      const double pv = ch.hydro.power_gassed_w / c.vessel.working_volume_m3;
      const double vs = vvm * c.vessel.working_volume_m3 / 60.0 * (293.15 / 273.15) / (M_PI * 0.25);
      const double published = 0.13 * std::pow(pv, 0.33) * std::pow(vs, 0.67);
      EXPECT_NEAR(f.holdup_mean / published, 1.0, 0.35) << rpm << " rpm, " << vvm << " vvm";
    }
  }
}

}  // namespace
}  // namespace oxystrat
