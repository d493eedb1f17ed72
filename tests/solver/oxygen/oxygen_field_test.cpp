// Steady oxygen field: analytic single-zone limit, exact O2 balance, analytic Jacobian, grid
// convergence, monotone physics, and the hydrostatic fall of C* in a tall vessel.
#include <gtest/gtest.h>

#include <cmath>

#include "case_fixtures.hpp"
#include "input/case_reader.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "solver/oxygen/oxygen_problem.hpp"
#include "solver/flow/transport.hpp"

namespace oxystrat {
namespace {

using fixtures::Chain;

OxygenField solve(const Case& c) {
  const Chain ch(c);
  return solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
}

TEST(OxygenField, SingleZoneReproducesTheTextbookBalance) {
  // One zone: kLa (C* - C) = OUR exactly, with C* at the zone's gas. Monod and zero-order (K -> 0).
  for (double k_o2 : {0.003, 0.0}) {
    Case c = fixtures::gassed_vessel(1, 1);
    c.culture.k_o2_mol_m3 = k_o2;
    c.culture.biomass_kg_m3 = 5.0;  // keeps C > 0 so the zero-order rate is defined
    const auto f = solve(c);
    ASSERT_EQ(f.do_mol_m3.size(), 1u);
    // Zero order is Monod with K floored at 1e-9 mol/m3 inside the solver (a 1e-8 relative change).
    const double k = std::max(k_o2, 1e-9);
    const double our = c.culture.q_o2_max_mol_kg_s * c.culture.biomass_kg_m3 * f.do_mol_m3[0] / (k + f.do_mol_m3[0]);
    EXPECT_NEAR(f.do_mol_m3[0], f.cstar_mol_m3[0] - our / f.kla_1_s[0], 1e-12);  // Newton tolerance
    // The single zone's kLa is the vessel-level van 't Riet value (normalisation is the identity).
    EXPECT_NEAR(f.kla_1_s[0] / f.kla_vessel_1_s, 1.0, 0.02);  // holdup-corrected vs ungassed mid-height pressure
  }
}

TEST(OxygenField, OxygenBalanceIsExact) {
  // Gas in - gas out = sum OTR V = sum OUR V at steady state, to 1e-9 relative (Newton converged to 1e-12).
  for (const auto& grid : {std::pair{1, 1}, std::pair{6, 16}, std::pair{12, 40}}) {
    const auto f = solve(fixtures::gassed_vessel(grid.first, grid.second));
    EXPECT_LT(std::abs(f.o2_balance_error), 1e-9);
    EXPECT_NEAR(f.otr_total_mol_s / f.our_total_mol_s, 1.0, 1e-9);
    EXPECT_NEAR((f.o2_in_mol_s - f.o2_out_mol_s) / f.otr_total_mol_s, 1.0, 1e-9);
  }
}

TEST(OxygenField, AnalyticJacobianMatchesFiniteDifferences) {
  const Case c = fixtures::gassed_vessel(3, 6);
  const Chain ch(c);
  const auto f = solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
  const int n = ch.net.size();
  TransferCoefficients coeff;
  for (int k = 0; k < n; ++k) {
    coeff.transfer_o2.push_back(f.kla_1_s[k] * ch.net.volume[k]);
    coeff.transfer_co2.push_back(0.9 * f.kla_1_s[k] * ch.net.volume[k]);
    coeff.cstar_per_y_o2.push_back(0.4 + 0.01 * k);
    coeff.cstar_per_y_co2.push_back(10.0 + 0.1 * k);
    coeff.inert_mol_m3.push_back(f.state[4 * k + 2] * 3.0);
  }
  const SparseMatrix l = transport_matrix(ch.net, ch.hydro.face_flow, ch.hydro.face_exchange);
  Uptake u{c.culture.q_o2_max_mol_kg_s * c.culture.biomass_kg_m3, c.culture.k_o2_mol_m3, 1.1, {}};
  Eigen::VectorXd x = f.state;
  for (int i = 0; i < x.size(); ++i) x[i] = x[i] * (1.0 + 0.1 * std::sin(i)) + 1e-4;  // away from kinks
  // Both forms of the transfer: kLa fixed, and kLa following the zone's gas from g0 (here 0.8-1.2
  // times the gas of x, so the ratio is not 1).
  for (const bool follows_gas : {false, true}) {
    coeff.gas_mol_m3.clear();
    for (int k = 0; follows_gas && k < n; ++k) {
      coeff.gas_mol_m3.push_back((x[4 * k + 2] + x[4 * k + 3] + coeff.inert_mol_m3[k]) * (1.0 + 0.2 * std::cos(k)));
    }
    const OxygenProblem p(ch.net, ch.routing, l, coeff, u, 1.0, 0.01);
    std::vector<Eigen::Triplet<double>> t;
    p.jacobian(x, t);
    Eigen::SparseMatrix<double> j(p.size(), p.size());
    j.setFromTriplets(t.begin(), t.end());
    const Eigen::MatrixXd fd = finite_difference_jacobian(p, x);
    const Eigen::MatrixXd an = Eigen::MatrixXd(j);
    // Central differences with h ~ 1e-6 x: truncation ~1e-12, cancellation ~1e-10 relative to the row scale.
    for (int r = 0; r < p.size(); ++r) {
      const double scale = std::max(1e-12, an.row(r).cwiseAbs().maxCoeff());
      for (int col = 0; col < p.size(); ++col) {
        EXPECT_NEAR(an(r, col), fd(r, col), 1e-6 * scale) << r << "," << col << (follows_gas ? " (follows gas)" : "");
      }
    }
  }
}

TEST(OxygenProblem, TransferFollowsTheZonesGasAndEndsWithIt) {
  // Exact algebra: at g = g0 the transfer is the plain kLa V (K y - C); at half the gas, of the
  // same composition, half of it; with no gas left, none (round-off only).
  TransferCoefficients coeff;
  coeff.transfer_o2 = {2e-3};
  coeff.transfer_co2 = {1.8e-3};
  coeff.cstar_per_y_o2 = {1.2};
  coeff.cstar_per_y_co2 = {30.0};
  coeff.inert_mol_m3 = {0.0};  // pure O2 sparged: nothing that stays in the gas
  coeff.gas_mol_m3 = {2.0};
  const double c = 0.3, d = 0.5, go = 1.9, gc = 0.1;  // g = g0
  const ZoneTransfer full = zone_transfer(coeff, 0, c, d, go, gc);
  EXPECT_NEAR(full.otr, 2e-3 * (1.2 * go / 2.0 - c), 1e-18);
  EXPECT_NEAR(full.ctr, 1.8e-3 * (30.0 * gc / 2.0 - d), 1e-18);
  const ZoneTransfer half = zone_transfer(coeff, 0, c, d, 0.5 * go, 0.5 * gc);
  EXPECT_NEAR(half.otr, 0.5 * full.otr, 1e-18);
  EXPECT_NEAR(half.ctr, 0.5 * full.ctr, 1e-18);
  const ZoneTransfer none = zone_transfer(coeff, 0, c, d, 0.0, 0.0);
  EXPECT_EQ(none.otr, 0.0);
  EXPECT_EQ(none.ctr, 0.0);
}

TEST(OxygenField, PureOxygenWhoseGasDissolvesCompletelyInPlacesConverges) {
  // Found by attacking the tool: the viscous demo sparged with pure O2. Far from the caverns the
  // bubbles dissolve completely; at a fixed kLa such a zone had no steady state (its gas stays
  // pure O2 as it vanishes) and Newton stalled at a scaled residual of 2.6e-9. The O2 balance
  // closes to the solver's 1e-9 and every gas amount is positive.
  Case c = read_case_file(fixtures::source_dir() + "/cases/viscous-broth-40m3.toml").data;
  c.operation.oxygen_fraction = 1.0;
  c.operation.co2_fraction = 0.0;
  const Chain ch(c);
  const auto f = solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
  EXPECT_LT(std::abs(f.o2_balance_error), 1e-9);
  for (int k = 0; k < ch.net.size(); ++k) EXPECT_GE(f.state[4 * k + 2], 0.0) << k;
  EXPECT_GT(f.do_min, c.culture.critical_do_mol_m3);  // pure O2 lifts the whole tank above critical
}

TEST(OxygenProblem, AStepKeepsEveryGasAmountPositive) {
  // Gas O2 and CO2 may fall at most tenfold per Newton step; a step inside that range, and any step
  // of the liquid (continued linearly below zero), is left as it is. Exact: the bound is a max().
  const Case c = fixtures::gassed_vessel(3, 6);
  const Chain ch(c);
  const auto f = solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
  const SparseMatrix l = transport_matrix(ch.net, ch.hydro.face_flow, ch.hydro.face_exchange);
  TransferCoefficients coeff;
  coeff.inert_mol_m3.assign(ch.net.size(), 1.0);
  const Uptake u{1e-3, c.culture.k_o2_mol_m3, 1.0, {}};
  const OxygenProblem p(ch.net, ch.routing, l, coeff, u, 1.0, 0.0);
  const Eigen::VectorXd& x = f.state;
  ASSERT_GT(x[2], 0.0);
  ASSERT_GT(x[7], 0.0);
  Eigen::VectorXd x_try = x;
  x_try[0] = -1.0;            // liquid O2 below zero: left alone
  x_try[2] = -x[2];           // gas O2 below zero
  x_try[7] = 0.05 * x[7];     // gas CO2 falls twentyfold
  x_try[10] = 0.5 * x[10];    // gas O2 halves: inside the bound
  p.keep_in_domain(x, x_try);
  EXPECT_EQ(x_try[0], -1.0);
  EXPECT_EQ(x_try[2], 0.1 * x[2]);
  EXPECT_EQ(x_try[7], 0.1 * x[7]);
  EXPECT_EQ(x_try[10], 0.5 * x[10]);
  for (int i = 11; i < x.size(); ++i) EXPECT_EQ(x_try[i], x[i]);
}

TEST(OxygenField, ZonesTheGasDoesNotReachTransferNothing) {
  // The viscous demo: the drift-flux transport leaves traces of 1e-12 .. 1e-30 of the volume as
  // gas in the stagnant broth beside its caverns. Such a zone is gas-free (kLa 0), every other zone
  // transfers, and the O2 balance still closes (1e-9 of the O2 fed, the solver's own test).
  const Case c = read_case_file(fixtures::source_dir() + "/cases/viscous-broth-40m3.toml").data;
  const Chain ch(c);
  const auto f = solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
  int gas_free = 0;
  for (int k = 0; k < ch.net.size(); ++k) {
    if (f.holdup[k] < gas_free_holdup) {
      ++gas_free;
      EXPECT_EQ(f.kla_1_s[k], 0.0) << k;
    } else {
      EXPECT_GT(f.kla_1_s[k], 0.0) << k;
    }
  }
  EXPECT_GT(gas_free, 0);  // the case exercises the rule
  EXPECT_LT(std::abs(f.o2_balance_error), 1e-9);
}

TEST(OxygenField, AZoneTheSpargedGasDoesNotReachTransfersNothingWhateverGasItHolds) {
  // The second gas-free rule: a zone is gas-free when the sparged gas, none of it dissolved, would
  // leave less than gas_free_holdup there, whatever O2 and CO2 the state puts in it (without
  // inert gas to hold its composition, that O2 and CO2 would dissolve away at a fixed kLa; Newton
  // chased them towards 0/0 tenfold per step on the viscous demo's 1e5-zone grid).
  const Case c = fixtures::gassed_vessel(6, 16);
  const Chain ch(c);
  GasRouting routing = ch.routing;
  const int zone = ch.net.size() / 2;
  routing.unit_inventory[zone] = 0.0;  // the sparged gas does not reach it
  const OxygenContext ctx{c, ch.net, ch.hydro, routing};
  OxygenSetup setup(ctx, -1.0);
  Eigen::VectorXd x = OxygenSetup(OxygenContext{c, ch.net, ch.hydro, ch.routing}, -1.0).initial_state();
  ASSERT_GT(x[4 * zone + 2], 0.0);  // yet the state holds O2 and CO2 gas there
  setup.update(x);
  EXPECT_GT(setup.holdup[zone], gas_free_holdup);
  EXPECT_EQ(setup.coeff.transfer_o2[zone], 0.0);
  EXPECT_EQ(setup.coeff.transfer_co2[zone], 0.0);
  EXPECT_GT(setup.coeff.transfer_o2[zone + 1], 0.0);  // its neighbour transfers
}

TEST(OxygenField, ViscousDemoSolvesOnAFineGrid) {
  // The fault the two rules above mend: on 2.9e4 zones a Newton step took a trace-gas zone's gas
  // O2 below zero, the preconditioner broke down and the solve failed. Now it converges, with the
  // O2 balance closed to the solver's 1e-9 and no zone's gas negative.
  const Case c = read_case_file(fixtures::source_dir() + "/cases/viscous-broth-40m3.toml",
                                {parse_override("grid.radial=50"), parse_override("grid.axial=600")})
                     .data;
  const Chain ch(c);
  ASSERT_GT(ch.net.size(), 25000);
  const auto f = solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
  EXPECT_LT(std::abs(f.o2_balance_error), 1e-9);
  for (int k = 0; k < ch.net.size(); ++k) EXPECT_GE(f.state[4 * k + 2], 0.0) << k;
}

TEST(OxygenField, GridConvergenceOfMinimumDoAndStarvedVolume) {
  // Refining by 1.5 three times: the upwind scheme is first order and the grid lines move with the
  // refinement, so successive changes are not monotone level by level (measured 3, 4, 4 and 2 x
  // 1e-4 mol/m3 from 6 x 16 to 32 x 81); over the sequence the change shrinks, and it is small.
  const auto at = [](int r, int a) { return solve(fixtures::gassed_vessel(r, a)); };
  const auto l1 = at(9, 24), l2 = at(14, 36), l3 = at(21, 54), l4 = at(32, 81);
  EXPECT_LT(std::abs(l4.do_mean - l3.do_mean), std::abs(l2.do_mean - l1.do_mean));
  EXPECT_LT(std::abs(l4.do_mean - l3.do_mean) / l4.do_mean, 0.05);
  EXPECT_LT(std::abs(l4.volume_fraction_below_critical - l3.volume_fraction_below_critical), 0.10);
}

TEST(OxygenField, MonotonePhysics) {
  // More speed, back pressure or O2 raise DO_min; more gas raises the mean DO; more biomass lowers
  // both. Not more gas for DO_min: the minimum sits in the bottom head below the lower impeller,
  // fed by that impeller's lower loop, and more gas loads the impeller, cutting its power and
  // pumping (Cui et al. 1996; the pumping as the power, [mem]) — a real effect of the model.
  Case base = fixtures::gassed_vessel();
  base.culture.biomass_kg_m3 = 8.0;
  const double d0 = solve(base).do_mean;
  const double dmin0 = solve(base).do_min;
  auto changed = [&](auto&& edit) {
    Case c = base;
    edit(c);
    return solve(c);
  };
  EXPECT_GT(changed([](Case& c) { c.operation.speed_rps *= 1.2; }).do_min, dmin0);
  EXPECT_GT(changed([](Case& c) { c.operation.gas_flow_normal_m3_s *= 1.3; }).do_mean, d0);
  EXPECT_GT(changed([](Case& c) { c.vessel.head_pressure_pa += 0.5e5; }).do_min, dmin0);
  EXPECT_GT(changed([](Case& c) { c.operation.oxygen_fraction = 0.30; }).do_min, dmin0);
  EXPECT_LT(changed([](Case& c) { c.culture.biomass_kg_m3 *= 1.3; }).do_min, dmin0);
  EXPECT_LT(changed([](Case& c) { c.culture.biomass_kg_m3 *= 1.3; }).do_mean, d0);
}

TEST(OxygenField, CstarFallsFromBottomToTopOfATallVessel) {
  const Case c = read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml").data;
  const Chain ch(c);
  const auto f = solve_oxygen_field({c, ch.net, ch.hydro, ch.routing});
  // Along the gassed wall column, C* decreases with height: pressure falls and the gas loses O2.
  const int col = ch.net.columns() - 2;
  double last = 1e300;
  int lowest = -1, highest = -1;
  for (int row = 0; row < ch.net.rows(); ++row) {
    const int k = ch.net.zone_at(col, row);
    if (k < 0 || f.holdup[k] <= 0.0) continue;
    EXPECT_LT(f.cstar_mol_m3[k], last + 1e-12) << "row " << row;
    last = f.cstar_mol_m3[k];
    if (lowest < 0) lowest = k;
    highest = k;
  }
  ASSERT_GE(lowest, 0);
  // About 0.8 bar of liquid head over 8 m, less the gas holdup.
  EXPECT_GT(f.pressure_pa[lowest] - f.pressure_pa[highest], 0.5e5);
  EXPECT_GT(f.cstar_mol_m3[lowest], 1.5 * f.cstar_mol_m3[highest]);
}

TEST(OxygenField, SupportableBiomassPutsTheWorstZoneAtCriticalDo) {
  const Case c = fixtures::gassed_vessel();
  const Chain ch(c);
  const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
  const auto f = solve_oxygen_field(ctx);
  const double x_max = max_supportable_biomass(ctx, f);
  const auto at_max = solve_oxygen_field(ctx, x_max);
  EXPECT_NEAR(at_max.do_min / c.culture.critical_do_mol_m3, 1.0, 1e-2);  // bisection to 1e-4 in biomass
}

TEST(OxygenField, SupportableBiomassOfTheLooseSearchIsBracketedByFullSolves) {
  // The search solves to 1e-10 only; full solves (1e-12, balances closed) 3e-4 either side of
  // its answer (its bracket is 1e-4 wide) must fall on either side of critical DO. The tall demo
  // at about 8000 zones (multigrid, nested start), where a loose solve's DO error is largest of
  // the bundled sizes.
  const Case c = fixtures::tall_demo(40, 200);
  const Chain ch(c);
  const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
  const auto f = solve_oxygen_field(ctx);
  const double x_max = max_supportable_biomass(ctx, f, 1e-4);
  const double critical = c.culture.critical_do_mol_m3;
  EXPECT_GE(solve_oxygen_field(ctx, x_max * (1.0 - 3e-4)).do_min, critical);
  EXPECT_LT(solve_oxygen_field(ctx, x_max * (1.0 + 3e-4)).do_min, critical);
}

TEST(OxygenField, MarginSolveGivesTheFullSolvesValuesForEveryConstraint) {
  // The levers and the biomass search only compare the field with limits, so they solve to 1e-10
  // with the balances open (margin_solve_options). What the constraints read must match the full
  // solve far below any margin: DO and pCO2 to 1e-6 relative (measured: DO within 5e-9 of air
  // saturation here; 4e-7 at a million zones, the last pass's move), and the starved volume may differ only by zones
  // whose DO lies within that of critical. The tall demo at about 8000 zones (multigrid, nested
  // start).
  const Case c = fixtures::tall_demo(40, 200);
  const Chain ch(c);
  const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
  const auto full = solve_oxygen_field(ctx);
  const auto margin = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, margin_solve_options());
  const double air = full.air_saturation_mol_m3, critical = c.culture.critical_do_mol_m3;
  EXPECT_NEAR(margin.do_min, full.do_min, 1e-6 * air);
  EXPECT_NEAR(margin.pco2_max_pa, full.pco2_max_pa, 1e-6 * full.pco2_max_pa);
  EXPECT_NEAR(margin.kla_mean_1_s, full.kla_mean_1_s, 1e-6 * full.kla_mean_1_s);
  double near_critical = 0.0, largest_change = 0.0;
  for (int k = 0; k < ch.net.size(); ++k) {
    largest_change = std::max(largest_change, std::abs(margin.do_mol_m3[k] - full.do_mol_m3[k]));
    if (std::abs(full.do_mol_m3[k] - critical) < 1e-6 * air) near_critical += ch.net.volume[k];
  }
  EXPECT_LT(largest_change, 1e-6 * air);
  EXPECT_LE(std::abs(margin.volume_fraction_below_critical - full.volume_fraction_below_critical),
            near_critical / ch.net.total_volume() + 1e-15);
}

TEST(CaseRun, NoGasSkipsTheOxygenSolveWithANote) {
  Case c = fixtures::gassed_vessel();
  c.operation.gas_flow_normal_m3_s = 0.0;
  const auto run = run_case(c);
  EXPECT_FALSE(run.field.has_value());
  ASSERT_FALSE(run.notes.empty());
  EXPECT_NE(run.notes.front().find("no gas"), std::string::npos);
}

TEST(CaseRun, ZoneModelFindsTheStarvedRegionTheSingleZoneMisses) {
  // The bundled three-Rushton demo: the one-average-kLa answer stays above critical DO; the zone
  // model finds a starved share of the volume (the top, above the last impeller, where the
  // pressure and the gas's O2 are lowest and the dissipation is weak).
  const Case c = read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml").data;
  const auto run = run_case(c, {false});
  EXPECT_GT(run.single_zone->do_min, c.culture.critical_do_mol_m3);
  EXPECT_GT(run.field->volume_fraction_below_critical, 0.0);
}

}  // namespace
}  // namespace oxystrat
