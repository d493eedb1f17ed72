#include "solver/oxygen/oxygen_field.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <limits>
#include <numeric>

#include "physics/bubbles.hpp"
#include "physics/mass_transfer.hpp"
#include "solver/oxygen/coarse_correction.hpp"
#include "solver/oxygen/nested_start.hpp"
#include "solver/oxygen/oxygen_problem.hpp"
#include "physics/solubility.hpp"
#include "solver/flow/transport.hpp"
#include "solver/linalg/parallel_loop.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

struct GasState {
  std::vector<double> holdup, pressure, superficial;
};

// Pressure at zone centres from the head space down each column through the gassed liquid. Row
// by row from the top, all columns at once (the zones of a row are neighbours in memory).
std::vector<double> column_pressures(const Case& c, const ZoneNetwork& net, const std::vector<double>& holdup) {
  std::vector<double> p(net.size());
  std::vector<double> top(net.columns(), c.vessel.head_pressure_pa);
  const double rho_g = c.broth.density_kg_m3 * kG;
  for (int row = net.rows() - 1; row >= 0; --row) {
    for (int col = 0; col < net.columns(); ++col) {
      const int k = net.zone_at(col, row);
      if (k < 0) continue;
      const double liquid = 1.0 - std::min(holdup[k], 0.6);
      p[k] = top[col] + rho_g * liquid * (net.z1[k] - net.z[k]);
      top[col] += rho_g * liquid * (net.z1[k] - std::min(net.z_floor_inner[k], net.z_floor_outer[k]));
    }
  }
  return p;
}

// Holdup and pressure consistent with the gas the zones hold (dry moles per zone volume; a few
// fixed-point sweeps: holdup depends weakly on pressure, so this converges fast). The relative
// gas flux, holdup x slip, stands for the zone's superficial gas velocity: in a bubble column
// without liquid flow they are the same.
GasState gas_state(const OxygenContext& ctx, const std::vector<double>& dry_mol_m3) {
  const auto& net = ctx.net;
  const double t = ctx.c.vessel.temperature_k;
  const double pw = physics::water_vapour_pressure(t);
  GasState g;
  g.holdup.assign(net.size(), 0.0);
  g.superficial.assign(net.size(), 0.0);
  for (int sweep = 0; sweep < 4; ++sweep) {
    g.pressure = column_pressures(ctx.c, net, g.holdup);
    // Wet gas volume per zone volume. Beyond ~0.3 bubbly flow gives way to churning plumes, which
    // a caution reports; the hydrostatic head counts at most 60 % gas so the columns stay liquid.
    parallel_loop(net.size(), net.size() >= 50000, [&](int k) {
      g.holdup[k] = dry_mol_m3[k] * kR * t / (g.pressure[k] - pw);
      g.superficial[k] = g.holdup[k] * ctx.routing.slip_m_s[k];
    });
  }
  return g;
}

double local_kla(const Case& c, double eps, double vs, double holdup, double sauter_m, double viscosity_pa_s) {
  if (c.model.kla_model == KlaModel::local_correlation) {
    // The correlation was fitted near 20 degC: the usual factor carries it to the broth's temperature.
    return vant_riet_kla(vant_riet_constants(c.broth.coalescence, c.model), c.broth.density_kg_m3 * eps, vs) *
           kla_temperature_factor(c.vessel.temperature_k) * c.model.kla_factor;
  }
  if (holdup <= 0.0) return 0.0;
  // kL from the broth's own viscosity and the O2 diffusivity at its temperature: the temperature
  // is already in it, so no temperature factor on top.
  const double t = c.vessel.temperature_k;
  const double nu = viscosity_pa_s / c.broth.density_kg_m3;
  const double sc = nu / physics::o2_diffusivity_water(t);
  return eddy_model_kl(eps, nu, sc) * interfacial_area(holdup, sauter_m) * c.model.kla_factor;
}

std::vector<double> scaled(const std::vector<double>& v, double f) {
  std::vector<double> out(v.size());
  for (size_t k = 0; k < v.size(); ++k) out[k] = f * v[k];
  return out;
}

}  // namespace

OxygenSetup::OxygenSetup(const OxygenContext& context, double biomass_kg_m3) : ctx(context) {
  const Case& c = ctx.c;
  const auto& net = ctx.net;
  const double t = c.vessel.temperature_k;
  water_pressure_pa = physics::water_vapour_pressure(t);
  const double molar = ctx.hydro.gas_molar_flow_mol_s;
  if (molar <= 0.0) throw SolveError("no gas is sparged: the oxygen field is not solved");
  inlet_o2_mol_s = molar * c.operation.oxygen_fraction;
  inlet_co2_mol_s = molar * c.operation.co2_fraction;
  const double in_inert = molar - inlet_o2_mol_s - inlet_co2_mol_s;
  henry_o2 = physics::henry_o2(t) * physics::salting_out_factor(physics::Gas::o2, t, c.broth.ions_mol_m3);
  henry_co2 = physics::henry_co2(t) * physics::salting_out_factor(physics::Gas::co2, t, c.broth.ions_mol_m3);
  const double x_bio = biomass_kg_m3 >= 0.0 ? biomass_kg_m3 : c.culture.biomass_kg_m3;
  uptake.rate_mol_m3_s = c.culture.q_o2_max_mol_kg_s * x_bio;
  uptake.k_o2_mol_m3 = c.culture.k_o2_mol_m3;
  uptake.rq = c.culture.rq;
  transport = transport_matrix(net, ctx.hydro.face_flow, ctx.hydro.face_exchange);
  coeff.inert_mol_m3 = scaled(ctx.routing.unit_inventory, in_inert);
  // Vessel-level correlation: total gassed power per volume and vs at mid-height (ungassed).
  const double p_mid = c.vessel.head_pressure_pa + 0.5 * c.broth.density_kg_m3 * kG * c.vessel.liquid_height_m;
  const double vs_mid = molar * kR * t / (p_mid - water_pressure_pa) / (std::numbers::pi * std::pow(net.shape.radius(), 2));
  kla_vessel_1_s =
      vant_riet_kla(vant_riet_constants(c.broth.coalescence, c.model), ctx.hydro.power_gassed_w / c.vessel.working_volume_m3,
                    vs_mid) *
      kla_temperature_factor(t) * c.model.kla_factor;
}

Eigen::VectorXd OxygenSetup::initial_state() const {
  const Case& c = ctx.c;
  const int n = ctx.net.size();
  const auto o = scaled(ctx.routing.unit_inventory, inlet_o2_mol_s);
  const auto q = scaled(ctx.routing.unit_inventory, inlet_co2_mol_s);
  std::vector<double> m(n);
  for (int k = 0; k < n; ++k) m[k] = o[k] + q[k] + coeff.inert_mol_m3[k];
  const auto g0 = gas_state(ctx, m);
  Eigen::VectorXd x(4 * n);
  for (int k = 0; k < n; ++k) {
    x[4 * k] = 0.5 * henry_o2 * c.operation.oxygen_fraction * (g0.pressure[k] - water_pressure_pa);
    x[4 * k + 1] = henry_co2 * c.operation.co2_fraction * (g0.pressure[k] - water_pressure_pa);
    x[4 * k + 2] = o[k];
    x[4 * k + 3] = q[k];
  }
  return x;
}

void OxygenSetup::update(const Eigen::VectorXd& x) {
  const Case& c = ctx.c;
  const auto& net = ctx.net;
  const int n = net.size();
  std::vector<double> dry(n);
  for (int k = 0; k < n; ++k) dry[k] = std::max(0.0, x[4 * k + 2] + x[4 * k + 3] + coeff.inert_mol_m3[k]);
  const GasState gas = gas_state(ctx, dry);
  coeff.gas_mol_m3 = dry;
  holdup = gas.holdup;
  pressure_pa = gas.pressure;
  superficial_m_s = gas.superficial;
  coeff.transfer_o2.resize(n);
  coeff.transfer_co2.resize(n);
  coeff.cstar_per_y_o2.resize(n);
  coeff.cstar_per_y_co2.resize(n);
  std::vector<double> kla(n);
  // Gas-free: little gas now, or little that the sparged gas would leave there if none of it
  // dissolved. The second holds the inert gas that anchors the zone's composition; without it, a
  // zone's O2 and CO2 could dissolve away inside one Newton pass at a fixed kLa, towards a
  // composition 0/0 that Newton approaches tenfold per step and never reaches.
  const double molar_volume_rt = kR * c.vessel.temperature_k;
  const double sparged = ctx.hydro.gas_molar_flow_mol_s;
  // Zone by zone in parallel, summed in zone order (the same total for any thread count).
  parallel_loop(n, n >= 50000, [&](int k) {
    const double undissolved =
        ctx.routing.unit_inventory[k] * sparged * molar_volume_rt / (gas.pressure[k] - water_pressure_pa);
    kla[k] = std::min(gas.holdup[k], undissolved) < gas_free_holdup
                 ? 0.0
                 : local_kla(c, ctx.hydro.epsilon[k], gas.superficial[k], gas.holdup[k], ctx.routing.sauter_m[k],
                             ctx.hydro.apparent_viscosity[k]);
  });
  double kla_volume = 0.0;
  for (int k = 0; k < n; ++k) kla_volume += kla[k] * net.volume[k];
  // The published correlation fixes the vessel's total; the local form only distributes it.
  const bool normalise = c.model.kla_normalise && c.model.kla_model == KlaModel::local_correlation;
  const double scale = normalise && kla_volume > 0.0 ? kla_vessel_1_s * net.total_volume() / kla_volume : 1.0;
  for (int k = 0; k < n; ++k) {
    // The correlation holds for water-like broths; where the broth is thicker, the liquid film
    // thickens (the mechanistic model has the viscosity in kL already).
    const double thick = c.model.kla_model == KlaModel::local_correlation
                             ? viscous_kla_factor(ctx.hydro.apparent_viscosity[k])
                             : 1.0;
    coeff.transfer_o2[k] = scale * kla[k] * thick * net.volume[k];
    coeff.transfer_co2[k] = co2_kla_ratio * coeff.transfer_o2[k];
    coeff.cstar_per_y_o2[k] = henry_o2 * (gas.pressure[k] - water_pressure_pa);
    coeff.cstar_per_y_co2[k] = henry_co2 * (gas.pressure[k] - water_pressure_pa);
  }
}

namespace {

// One coarse-grid correction of x between two outer passes. The fine Krylov vectors are idle
// then: their memory serves the coarse solve. A correction that leaves the fine residual a
// hundred times larger is undone (the next pass would spend its iterations removing it).
void correct_on_halved_grid(CoarseCorrection& correction, const OxygenProblem& problem, const std::vector<double>& inert,
                            Eigen::VectorXd& x, NewtonWorkspace& ws, const NewtonOptions& newton) {
  ws.blocks.release_krylov_vectors();
  Eigen::VectorXd r(x.size());
  problem.residual(x, r);
  const double before = r.cwiseAbs().maxCoeff();
  const Eigen::VectorXd kept = x;
  if (!correction.apply(r, inert, x, newton)) return;
  problem.residual(x, r);
  if (!(r.cwiseAbs().maxCoeff() <= 100.0 * before)) x = kept;
}

// The steady field from `warm`'s state, or else from a cold start seeded by `halved` (when it
// is null, solved here first).
OxygenField solve_field(const OxygenContext& ctx, double biomass_kg_m3, const OxygenField* warm,
                        std::optional<HalvedGridField>* halved, NewtonWorkspace* workspace, const NewtonOptions& newton) {
  NewtonWorkspace local;
  NewtonWorkspace& ws = workspace != nullptr ? *workspace : local;
  const Case& c = ctx.c;
  const auto& net = ctx.net;
  const int n = net.size();
  OxygenSetup setup(ctx, biomass_kg_m3);
  const auto& coeff = setup.coeff;
  const auto& uptake = setup.uptake;
  const auto& transport = setup.transport;
  const double in_o2 = setup.inlet_o2_mol_s, in_co2 = setup.inlet_co2_mol_s;
  const double h_co2 = setup.henry_co2;
  OxygenField f;
  Eigen::VectorXd x;
  std::optional<CoarseCorrection> correction;  // on the halved grid, between the outer passes
  if (warm != nullptr && warm->state.size() == 4 * n) {
    x = warm->state;
  } else {
    x = setup.initial_state();
    std::optional<HalvedGridField> own;
    if (halved == nullptr) {
      own = solve_on_halved_grid(c, net, &ctx.routing.unit_inventory, biomass_kg_m3, newton);
      halved = &own;
    }
    if (*halved) {
      const OxygenField& coarse = (*halved)->field;
      x = nested_state((*halved)->net, coarse, net, coeff.inert_mol_m3, x);
      f.coarse_levels = 1 + coarse.coarse_levels;
      f.coarse_newton_iterations = coarse.newton_iterations + coarse.coarse_newton_iterations;
      f.coarse_outer_iterations = coarse.outer_iterations + coarse.coarse_outer_iterations;
      f.coarse_linear_iterations = coarse.linear_iterations + coarse.coarse_linear_iterations;
      // The halved grid stays for the corrections, or else is freed now (the fine solve's peak).
      if (n >= newton.linear.coarse_correction_from_zones) correction.emplace(std::move(**halved), net, biomass_kg_m3);
      halved->reset();
    }
  }

  NewtonReport rep;
  constexpr int kMaxOuter = 30;
  std::vector<double> previous;
  // Outer loop: holdup, pressure and kLa follow the gas flows of the last solution.
  for (f.outer_iterations = 1; f.outer_iterations <= kMaxOuter; ++f.outer_iterations) {
    setup.update(x);
    double change = previous.empty() ? 1.0 : 0.0;  // holdup change the update made
    for (int k = 0; k < n && !previous.empty(); ++k) change = std::max(change, std::abs(setup.holdup[k] - previous[k]));
    previous = setup.holdup;
    // Holdup settled to 1e-8 (the loose passes leave their own error in it, so tighter than the
    // model needs; an extra pass costs one or two Newton steps). The last allowed pass is full too.
    const bool last = change < 1e-8 || f.outer_iterations == kMaxOuter;
    const OxygenProblem problem(net, ctx.routing, transport, coeff, uptake, in_o2, in_co2);
    Eigen::VectorXd trial = x;
    // While the holdup still moves, the next update disturbs the balances again: cut the residual
    // a hundredfold only; the last pass (holdup settled) is solved to the full tolerance.
    NewtonOptions pass = newton;
    if (!last) {
      pass.balance_tolerance = std::numeric_limits<double>::infinity();  // the last pass closes the balances
      pass.reduction = 1e-2;
    }
    rep = solve_newton(problem, trial, pass, &ws);
    if (!rep.converged) {
      // Continuation in the uptake from the feasible no-culture state.
      trial = x;
      for (double s : {0.0, 0.25, 0.5, 0.75, 1.0}) {
        Uptake u = uptake;
        u.rate_mol_m3_s *= s;
        const OxygenProblem step(net, ctx.routing, transport, coeff, u, in_o2, in_co2);
        NewtonOptions slow = newton;
        slow.max_iterations = 200;
        rep = solve_newton(step, trial, slow, &ws);
        if (!rep.converged) break;
      }
    }
    if (!rep.converged) {
      if (rep.general_lu_refused) {
        throw SolveError(fmt::format(
            "the steady oxygen solve did not converge: the structured linear solve failed after {} Newton "
            "iterations and {} zones are too many for the general sparse LU to take over. Try a coarser grid",
            rep.iterations, n));
      }
      throw SolveError(fmt::format(
          "the steady oxygen solve did not converge (scaled residual {:.3g} after {} Newton iterations). Try a "
          "finer or coarser grid, a lower biomass, or check gas flow and speed",
          rep.residual, rep.iterations));
    }
    x = trial;
    f.newton_iterations += rep.iterations;
    f.linear_iterations += rep.linear_iterations;
    if (last) break;
    if (correction) correct_on_halved_grid(*correction, problem, coeff.inert_mol_m3, x, ws, newton);
  }
  if (correction) f.coarse_linear_iterations += correction->linear_iterations();

  // Fields and summary.
  f.state = x;
  const double air_sat = c.do_percent.reference_mol_m3;
  f.air_saturation_mol_m3 = air_sat;
  auto resize = [n](std::vector<double>& v) { v.assign(n, 0.0); };
  for (auto* v : {&f.do_mol_m3, &f.co2_mol_m3, &f.cstar_mol_m3, &f.kla_1_s, &f.otr_mol_m3_s, &f.our_mol_m3_s, &f.y_o2,
                  &f.y_co2, &f.pco2_pa, &f.do_saturation}) {
    resize(*v);
  }
  f.holdup = setup.holdup;
  f.pressure_pa = setup.pressure_pa;
  f.superficial_gas_m_s = setup.superficial_m_s;
  const double total_v = net.total_volume();
  double kla_v = 0.0, do_v = 0.0, below_v = 0.0;
  f.do_min = std::numeric_limits<double>::infinity();
  for (int k = 0; k < n; ++k) {
    // The solve stops at a scaled residual of 1e-12: a zone that is truly anoxic can end a hair
    // below zero. Such round-off is reported as 0; anything larger stays visible.
    const auto round_off = [](double v, double scale) { return v < 0.0 && v > -1e-9 * scale ? 0.0 : v; };
    const double no = round_off(x[4 * k + 2], coeff.inert_mol_m3[k] + 1e-300), nc = round_off(x[4 * k + 3], coeff.inert_mol_m3[k] + 1e-300);
    const double total = no + nc + coeff.inert_mol_m3[k];
    f.do_mol_m3[k] = round_off(x[4 * k], air_sat);
    f.co2_mol_m3[k] = round_off(x[4 * k + 1], air_sat);
    f.y_o2[k] = total > 0.0 ? no / total : 0.0;
    f.y_co2[k] = total > 0.0 ? nc / total : 0.0;
    f.cstar_mol_m3[k] = coeff.cstar_per_y_o2[k] * f.y_o2[k];
    // The balances' own kLa and transfer: kLa follows the zone's gas from the value it was last
    // computed at (oxygen_problem.hpp); the outer loop has settled, so they differ by < 1e-8.
    const ZoneTransfer z = zone_transfer(coeff, k, x[4 * k], x[4 * k + 1], x[4 * k + 2], x[4 * k + 3]);
    f.kla_1_s[k] = coeff.transfer_o2[k] * z.gas_ratio / net.volume[k];
    f.otr_mol_m3_s[k] = z.otr / net.volume[k];
    f.our_mol_m3_s[k] = uptake.our(f.do_mol_m3[k]);
    f.pco2_pa[k] = f.co2_mol_m3[k] / h_co2;
    f.do_saturation[k] = f.do_mol_m3[k] / air_sat;
    kla_v += f.kla_1_s[k] * net.volume[k];
    do_v += f.do_mol_m3[k] * net.volume[k];
    if (f.do_mol_m3[k] < c.culture.critical_do_mol_m3) below_v += net.volume[k];
    if (f.do_mol_m3[k] < f.do_min) f.do_min = f.do_mol_m3[k], f.do_min_zone = k;
    f.otr_total_mol_s += f.otr_mol_m3_s[k] * net.volume[k];
    f.our_total_mol_s += f.our_mol_m3_s[k] * net.volume[k];
    f.pco2_max_pa = std::max(f.pco2_max_pa, f.pco2_pa[k]);
  }
  for (int k = 0; k < n; ++k) {
    f.gas_volume_m3 += f.holdup[k] * net.volume[k];
    f.holdup_max = std::max(f.holdup_max, f.holdup[k]);
    if (f.holdup[k] > bubbly_flow_holdup) f.volume_fraction_churning += net.volume[k] / total_v;
  }
  f.holdup_mean = f.gas_volume_m3 / total_v;
  // The zones are the ungassed liquid's; the gas they hold swells the dispersion above it.
  f.gassed_level_m = net.shape.height_for_volume(total_v + f.gas_volume_m3);
  f.kla_mean_1_s = kla_v / total_v;
  f.do_mean = do_v / total_v;
  f.volume_fraction_below_critical = below_v / total_v;
  // Off-gas: what leaves through the surface.
  std::vector<double> g_o(n), g_c(n);
  for (int k = 0; k < n; ++k) g_o[k] = x[4 * k + 2], g_c[k] = x[4 * k + 3];
  const double out_o = surface_flow(ctx.routing, g_o), out_c = surface_flow(ctx.routing, g_c);
  const double out_i = surface_flow(ctx.routing, coeff.inert_mol_m3);
  f.o2_in_mol_s = in_o2;
  f.o2_out_mol_s = out_o;
  f.offgas_y_o2 = out_o / (out_o + out_c + out_i);
  f.offgas_y_co2 = out_c / (out_o + out_c + out_i);
  f.o2_balance_error = (in_o2 - out_o - f.otr_total_mol_s) / in_o2;
  f.kla_vessel_1_s = setup.kla_vessel_1_s;
  return f;
}

}  // namespace

OxygenField solve_oxygen_field(const OxygenContext& ctx, double biomass_kg_m3, const OxygenField* warm,
                               NewtonWorkspace* workspace, const NewtonOptions& newton) {
  return solve_field(ctx, biomass_kg_m3, warm, nullptr, workspace, newton);
}

OxygenField solve_oxygen_field_seeded(const OxygenContext& ctx, double biomass_kg_m3, std::optional<HalvedGridField>& halved,
                                      const NewtonOptions& newton) {
  return solve_field(ctx, biomass_kg_m3, nullptr, &halved, nullptr, newton);
}

NewtonOptions margin_solve_options() {
  NewtonOptions o;
  o.tolerance = 1e-10;
  o.balance_tolerance = std::numeric_limits<double>::infinity();
  return o;
}

double max_supportable_biomass(const OxygenContext& ctx, const OxygenField& field_at_case, double rel_tol) {
  const double critical = ctx.c.culture.critical_do_mol_m3;
  const double x_case = ctx.c.culture.biomass_kg_m3;
  if (ctx.c.culture.q_o2_max_mol_kg_s <= 0.0) return std::numeric_limits<double>::infinity();
  OxygenField warm = field_at_case;
  NewtonWorkspace ws;
  // A margin needs DO_min to the search's resolution, not to the field's 1e-12: solved to a scaled
  // residual of 1e-10 (balances left open), the tall demo's supportable biomass moved by less than
  // 1e-6 relative at 5e3 to 2e5 zones, and the search took a third less time (bench/notes.md).
  const NewtonOptions search = margin_solve_options();
  const auto margin = [&](double x) {
    warm = solve_oxygen_field(ctx, x, &warm, &ws, search);
    return warm.do_min - critical;
  };
  // Bracket: DO_min falls as biomass rises.
  double lo = 0.0, hi = std::max(x_case, 1.0);
  double f_hi = field_at_case.do_min - critical;
  if (x_case <= 0.0 || f_hi >= 0.0) {
    lo = x_case;
    for (int i = 0; i < 12 && f_hi >= 0.0; ++i) {
      lo = hi;
      hi *= 2.0;
      if (hi > 1000.0) return 1000.0;
      f_hi = margin(hi);
    }
  }
  double f_lo = margin(lo);
  if (f_lo < 0.0) return 0.0;
  // Illinois (regula falsi with halving of the stale end) keeps the bracket like bisection, so it
  // is robust where DO_min has kinks (the minimum zone moves), and converges superlinearly.
  int stale = 0;
  for (int it = 0; it < 100 && hi - lo > rel_tol * hi; ++it) {
    double x = lo + (hi - lo) * f_lo / (f_lo - f_hi);
    if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
    const double fx = margin(x);
    if (fx >= 0.0) {
      lo = x, f_lo = fx;
      if (stale == -1) f_hi *= 0.5;
      stale = -1;
    } else {
      hi = x, f_hi = fx;
      if (stale == 1) f_lo *= 0.5;
      stale = 1;
    }
    if (std::abs(fx) < 1e-9 * critical) return x;
  }
  return 0.5 * (lo + hi);
}

std::vector<bool> gassed_zones(const OxygenField& f) {
  std::vector<bool> gassed(f.holdup.size());
  for (size_t k = 0; k < gassed.size(); ++k) gassed[k] = f.holdup[k] >= gas_free_holdup;
  return gassed;
}

}  // namespace oxystrat
