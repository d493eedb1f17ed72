#include "solver/oxygen/transient.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <memory>

#include "solver/oxygen/culture_growth.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/heat_balance.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "physics/solubility.hpp"

namespace oxystrat {
namespace {

// One implicit Euler step: the liquid rows gain -V (x - x_old) / h, the gas rows stay algebraic.
class EulerStep : public SteadyProblem {
 public:
  EulerStep(const OxygenProblem& p, const ZoneNetwork& net, const Eigen::VectorXd& old, double h)
      : p_(p), net_(net), old_(old), h_(h) {
    // Zero for a residual is also small against the storage term V C / h: with short steps that
    // term dwarfs the O2 fed, and its round-off alone would stay above 1e-12 of the feed.
    double storage = 0.0;
    for (int k = 0; k < net.size(); ++k) storage += net.volume[k] * (std::abs(old[4 * k]) + std::abs(old[4 * k + 1])) / h;
    scale_ = std::max(p.residual_scale(), 1e-3 * storage);
  }
  int size() const override { return p_.size(); }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override {
    p_.residual(x, r);
    for (int k = 0; k < net_.size(); ++k) {
      r[4 * k] -= net_.volume[k] * (x[4 * k] - old_[4 * k]) / h_;
      r[4 * k + 1] -= net_.volume[k] * (x[4 * k + 1] - old_[4 * k + 1]) / h_;
    }
  }
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override {
    jacobian_zones(x, 0, net_.size(), t);
  }
  bool jacobian_zones(const Eigen::VectorXd& x, int zone_begin, int zone_end,
                      std::vector<Eigen::Triplet<double>>& t) const override {
    for (int k = zone_begin; k < zone_end; ++k) {  // zone by zone, so that any split lists the same
      p_.jacobian_zones(x, k, k + 1, t);
      t.emplace_back(4 * k, 4 * k, -net_.volume[k] / h_);
      t.emplace_back(4 * k + 1, 4 * k + 1, -net_.volume[k] / h_);
    }
    return true;
  }
  double residual_scale() const override { return scale_; }
  //! Same unknowns and gas routing as the steady problem: the structured solve applies.
  ZoneLayout zone_layout() const override { return p_.zone_layout(); }

 private:
  const OxygenProblem& p_;
  const ZoneNetwork& net_;
  const Eigen::VectorXd& old_;
  double h_, scale_ = 0.0;
};

// The vessel at one operating point; rebuilt when speed, gas or an event changes it. The grid
// depends on geometry only, so states carry over zone by zone.
struct Plant {
  Case c;
  ZoneNetwork net;
  Hydrodynamics hydro;
  GasRouting routing;
  std::unique_ptr<OxygenContext> ctx;
  std::unique_ptr<OxygenSetup> setup;
  NewtonWorkspace o2_workspace, culture_workspace;
  explicit Plant(const Case& cs)
      : c(cs), net(build_zone_geometry(c)), hydro(compute_hydrodynamics(c, net)), routing(route_gas(c, net, hydro)) {
    ctx = std::make_unique<OxygenContext>(OxygenContext{c, net, hydro, routing});
    setup = std::make_unique<OxygenSetup>(*ctx, -1.0);
  }
};

// Gas of one species (2: O2, 3: CO2) leaving through the head space [mol/s].
double offgas(const Plant& p, const Eigen::VectorXd& x, int species) {
  std::vector<double> g(p.net.size());
  for (int k = 0; k < p.net.size(); ++k) g[k] = x[4 * k + species];
  return surface_flow(p.routing, g);
}

// The whole state of the broth: O2/CO2 (solver layout) and, for a growing culture, substrate and
// biomass per zone.
struct BrothState {
  Eigen::VectorXd x;
  std::vector<double> substrate, biomass;
};

// O2 uptake of a growing culture: per-zone multipliers of a reference rate.
Uptake culture_uptake(const Uptake& base, const GrowthKinetics& g, const BrothState& b, double biomass_ref) {
  Uptake u = base;
  if (b.biomass.empty()) return u;
  const double q_ref = std::max(g.o2_uptake_capacity(1e300), 1e-300);
  u.rate_mol_m3_s = q_ref * biomass_ref;
  u.zone_scale.resize(b.biomass.size());
  for (size_t k = 0; k < b.biomass.size(); ++k) {
    u.zone_scale[k] = b.biomass[k] * g.o2_uptake_capacity(b.substrate[k]) / (q_ref * biomass_ref);
  }
  return u;
}

// What one step did, for the balances.
struct StepFlows {
  bool converged = false;
  int newton = 0;
  double o2_in = 0.0, o2_out = 0.0, o2_uptake = 0.0, co2_in = 0.0, co2_out = 0.0;  // [mol/s]
  double substrate_fed = 0.0, substrate_consumed = 0.0, biomass_grown = 0.0;       // [kg] over the step
  Uptake uptake;
};

// Advances `b` by h (operator splitting: O2/CO2 at the old culture, then substrate and biomass at the new DO).
StepFlows advance(Plant& p, const Case& c, BrothState& b, double h, double feed_volume_m3, int feed_zone,
                  double biomass_ref) {
  StepFlows f;
  auto& s = *p.setup;
  s.update(b.x);
  const GrowthKinetics g(c.culture);
  f.uptake = culture_uptake(s.uptake, g, b, biomass_ref);
  const OxygenProblem problem(p.net, p.routing, s.transport, s.coeff, f.uptake, s.inlet_o2_mol_s, s.inlet_co2_mol_s);
  const Eigen::VectorXd old = b.x;
  const EulerStep step(problem, p.net, old, h);
  const auto rep = solve_newton(step, b.x, {}, &p.o2_workspace);
  f.newton += rep.iterations;
  if (!rep.converged) return f;
  const int n = p.net.size();
  f.o2_in = s.inlet_o2_mol_s;
  f.co2_in = s.inlet_co2_mol_s;
  f.o2_out = offgas(p, b.x, 2);
  f.co2_out = offgas(p, b.x, 3);
  for (int k = 0; k < n; ++k) f.o2_uptake += f.uptake.our(b.x[4 * k]) * f.uptake.scale(k) * p.net.volume[k];
  if (b.biomass.empty()) {
    f.converged = true;
    return f;
  }
  // Substrate and biomass together, at the DO of the new level.
  std::vector<double> feed(n, 0.0), c_new(n);
  if (feed_zone >= 0) feed[feed_zone] = c.feed.concentration_kg_m3 * feed_volume_m3 / h;
  for (int k = 0; k < n; ++k) c_new[k] = b.x[4 * k];
  Eigen::VectorXd sx_old(2 * n);
  for (int k = 0; k < n; ++k) sx_old[2 * k] = b.substrate[k], sx_old[2 * k + 1] = b.biomass[k];
  const CultureStep culture(p.net, s.transport, g, c_new, sx_old, feed, h);
  Eigen::VectorXd sx = sx_old;
  const auto rc = solve_newton(culture, sx, {}, &p.culture_workspace);
  f.newton += rc.iterations;
  if (!rc.converged) return f;
  f.substrate_fed = feed_zone >= 0 ? c.feed.concentration_kg_m3 * feed_volume_m3 : 0.0;
  for (int k = 0; k < n; ++k) {
    const double v = p.net.volume[k], sk = sx[2 * k], xk = sx[2 * k + 1];
    b.substrate[k] = sk;
    b.biomass[k] = xk;
    f.substrate_consumed += v * xk * g.substrate_uptake(sk, c_new[k]) * h;
    f.biomass_grown += v * g.growth_rate(sk, c_new[k]) * xk * h;
  }
  f.converged = true;
  return f;
}

// Local error of the implicit Euler step, (h/2)|x'_new - x'_old|, against tol (|x| + reference).
struct ErrorEstimator {
  std::vector<double> reference;  // per watched value: DO of every zone, then S, then X
  std::vector<double> last_slope;
  bool have_slope = false;
  static std::vector<double> watched(const BrothState& b) {
    std::vector<double> w;
    const auto n = b.x.size() / 4;
    w.reserve(3 * n);
    for (Eigen::Index k = 0; k < static_cast<Eigen::Index>(n); ++k) w.push_back(b.x[4 * k]);
    w.insert(w.end(), b.substrate.begin(), b.substrate.end());
    w.insert(w.end(), b.biomass.begin(), b.biomass.end());
    return w;
  }
  std::vector<double> slope(const BrothState& from, const BrothState& to, double h) const {
    auto a = watched(from), s = watched(to);
    for (size_t i = 0; i < s.size(); ++i) s[i] = (s[i] - a[i]) / h;
    return s;
  }
  double error(const std::vector<double>& new_slope, const BrothState& to, double h, double tol) const {
    if (!have_slope) return 0.0;
    const auto v = watched(to);
    double worst = 0.0;
    for (size_t i = 0; i < v.size(); ++i) {
      worst = std::max(worst, 0.5 * h * std::abs(new_slope[i] - last_slope[i]) / (tol * (std::abs(v[i]) + reference[i])));
    }
    return worst;
  }
};

}  // namespace

TransientResult run_transient(const LoadedCase& base, const std::vector<Override>& base_overrides,
                              const TransientOptions& opts) {
  TransientResult res;
  const Case& c0 = base.data;
  const auto& k = c0.control;
  const double gas_lo = k.gas_min_m3_s >= 0.0 ? k.gas_min_m3_s : c0.operation.gas_flow_normal_m3_s;
  const double gas_hi = k.gas_max_m3_s >= 0.0 ? k.gas_max_m3_s : gas_lo;
  const double o2_lo = c0.operation.oxygen_fraction;
  const double o2_hi = k.oxygen_max >= 0.0 ? k.oxygen_max : o2_lo;
  auto plant = std::make_unique<Plant>(c0);
  const int n = plant->net.size();
  res.probe_zone = std::max(0, plant->net.zone_containing(k.probe_r_m, k.probe_z_m));
  res.grows = c0.culture.grows();
  res.working_volume_m3 = plant->net.total_volume();
  if (c0.feed.enabled) res.feed_zone = std::max(0, plant->net.zone_containing(c0.feed.r_m, c0.feed.z_m));
  const double air_sat = c0.do_percent.reference_mol_m3;
  const double biomass_ref = std::max(c0.culture.biomass_kg_m3, 1e-9);

  BrothState b;
  // The starting field: the steady one at the culture's own initial uptake (uniform S0 and X0, so
  // one equivalent biomass at q_O2,max says it exactly).
  double biomass_start = -1.0;
  if (res.grows) {
    const GrowthKinetics g(c0.culture);
    biomass_start = c0.culture.biomass_kg_m3 * g.o2_uptake_capacity(c0.culture.substrate_kg_m3) /
                    std::max(c0.culture.q_o2_max_mol_kg_s, 1e-300);
    if (c0.culture.q_o2_max_mol_kg_s <= 0.0) biomass_start = 0.0;
  }
  b.x = solve_oxygen_field(*plant->ctx, biomass_start).state;
  if (opts.initial_do_mol_m3 >= 0.0) {
    for (int z = 0; z < n; ++z) b.x[4 * z] = opts.initial_do_mol_m3;
  }
  if (res.grows) {
    b.substrate.assign(n, c0.culture.substrate_kg_m3);
    b.biomass.assign(n, c0.culture.biomass_kg_m3);
  }
  const auto content = [&](const BrothState& st, int which) {  // 0: O2 [mol], 1: substrate, 2: biomass [kg]
    double sum = 0.0;
    for (int z = 0; z < n; ++z) {
      const double v = which == 0 ? st.x[4 * z] : which == 1 ? st.substrate[z] : st.biomass[z];
      sum += plant->net.volume[z] * v;
    }
    return sum;
  };
  const double o2_start = content(b, 0);
  const double s_start = res.grows ? content(b, 1) : 0.0, x_start = res.grows ? content(b, 2) : 0.0;

  ErrorEstimator est;
  // Error references: air saturation for DO (a probe reads to ~1 % of it; critical DO itself would
  // make the steps chase noise in anoxic zones), K_S for substrate, 1 % of the biomass.
  est.reference.assign(n, air_sat);
  if (res.grows) {
    est.reference.insert(est.reference.end(), n, std::max(c0.culture.k_substrate_kg_m3, 1e-4));
    est.reference.insert(est.reference.end(), n, 1e-2 * biomass_ref);
  }

  // Cascade position u in [0, 3]: speed over [0, 1], then gas over [1, 2], then O2 over [2, 3].
  const auto actuators = [&](double u, Case& c) {
    const auto lerp = [](double a, double b, double f) { return a + (b - a) * std::clamp(f, 0.0, 1.0); };
    c.operation.speed_rps = lerp(k.speed_min_rps, k.speed_max_rps, u);
    c.operation.gas_flow_normal_m3_s = lerp(gas_lo, gas_hi, u - 1.0);
    c.operation.oxygen_fraction = lerp(o2_lo, o2_hi, u - 2.0);
  };
  // The cascade ends at its last stage that can act (a stage with no range would let the integral wind up).
  const double u_max = o2_hi > o2_lo ? 3.0 : gas_hi > gas_lo ? 2.0 : 1.0;
  double integral = 0.0, u = 0.0, last_measured = 0.0;
  bool have_measured = false;
  double t = 0.0, next_control = 0.0, next_output = 0.0;
  double h_next = opts.adaptive ? std::min(opts.step_s, 1.0) : opts.step_s;
  size_t next_event = 0;
  std::vector<Override> applied = base_overrides;
  Case current = c0;
  const auto store_frame = [&](const StepFlows& fl) {
    TransientFrame fr;
    fr.time_s = t;
    const auto& s = *plant->setup;
    for (int z = 0; z < n; ++z) {
      const double no = b.x[4 * z + 2], nc = b.x[4 * z + 3], total = no + nc + s.coeff.inert_mol_m3[z];
      fr.do_mol_m3.push_back(b.x[4 * z]);
      fr.co2_mol_m3.push_back(b.x[4 * z + 1]);
      fr.cstar_mol_m3.push_back(total > 0.0 ? s.coeff.cstar_per_y_o2[z] * no / total : 0.0);
      fr.kla_1_s.push_back(s.coeff.transfer_o2[z] / plant->net.volume[z]);
      fr.our_mol_m3_s.push_back(fl.uptake.our(b.x[4 * z]) * fl.uptake.scale(z));
    }
    if (res.grows) {
      const GrowthKinetics g(current.culture);
      fr.substrate_kg_m3 = b.substrate;
      fr.biomass_kg_m3 = b.biomass;
      for (int z = 0; z < n; ++z) fr.growth_rate_1_s.push_back(g.growth_rate(b.substrate[z], b.x[4 * z]));
    }
    res.frames.push_back(std::move(fr));
  };
  {  // the state at t = 0 is the first frame
    plant->setup->update(b.x);
    StepFlows start;
    start.uptake = culture_uptake(plant->setup->uptake, GrowthKinetics(c0.culture), b, biomass_ref);
    store_frame(start);
    next_output = opts.output_interval_s;
  }
  while (t < opts.duration_s - 1e-9) {
    bool changed = false;
    while (next_event < c0.events.size() && c0.events[next_event].time_s <= t + 1e-9) {
      for (const auto& s : c0.events[next_event].sets) applied.push_back(parse_override(s));
      const double speed = current.operation.speed_rps, gas = current.operation.gas_flow_normal_m3_s,
                   o2 = current.operation.oxygen_fraction;
      current = read_case_text(base.source_text, base.file_name, applied).data;
      if (k.enabled) {  // the controller keeps its actuators
        current.operation.speed_rps = speed;
        current.operation.gas_flow_normal_m3_s = gas;
        current.operation.oxygen_fraction = o2;
      }
      ++next_event;
      changed = true;
    }
    if (k.enabled && t >= next_control - 1e-9) {
      const double measured = b.x[4 * res.probe_zone] / air_sat;
      const double error = k.setpoint_mol_m3 / air_sat - measured;
      // Derivative on the measurement, not the error: a set-point step gives no kick.
      const double slope = have_measured ? (measured - last_measured) / k.interval_s : 0.0;
      last_measured = measured;
      have_measured = true;
      integral += error * k.interval_s;
      u = k.gain * (error + integral / k.integral_time_s - k.derivative_time_s * slope);
      if (u < 0.0 || u > u_max) {  // anti-windup: hold the integral while the output is saturated
        integral -= error * k.interval_s;
        u = std::clamp(u, 0.0, u_max);
      }
      const double speed = current.operation.speed_rps, gas = current.operation.gas_flow_normal_m3_s,
                   o2 = current.operation.oxygen_fraction;
      actuators(u, current);
      changed = changed || current.operation.speed_rps != speed || current.operation.gas_flow_normal_m3_s != gas ||
                current.operation.oxygen_fraction != o2;
      next_control += k.interval_s;
    }
    if (changed) {
      est.have_slope = false;  // kLa and C* jump with the actuators: no error estimate across it
      plant = std::make_unique<Plant>(current);
      // The gas is quasi-steady: start its flows afresh on the new routing, keep the liquid.
      const Eigen::VectorXd fresh = plant->setup->initial_state();
      for (int z = 0; z < n; ++z) b.x[4 * z + 2] = fresh[4 * z + 2], b.x[4 * z + 3] = fresh[4 * z + 3];
    }
    double limit = std::min(opts.step_s, opts.duration_s - t);
    if (k.enabled) limit = std::min(limit, next_control - t);
    if (next_event < c0.events.size()) limit = std::min(limit, c0.events[next_event].time_s - t);
    limit = std::min(limit, next_output - t);
    double h = std::max(std::min(h_next, limit), 1e-9);
    // Try the step; shrink it when Newton fails or the local error is too large.
    for (;;) {
      BrothState trial = b;
      const double fed_before = current.feed.volume_until(t), fed_after = current.feed.volume_until(t + h);
      auto fl = advance(*plant, current, trial, h, fed_after - fed_before, res.feed_zone, biomass_ref);
      res.newton_iterations += fl.newton;
      double err = 0.0;
      std::vector<double> slope;
      if (fl.converged && opts.adaptive) {
        slope = est.slope(b, trial, h);
        err = est.error(slope, trial, h, opts.tolerance);
      }
      if (!fl.converged || err > 1.0) {
        ++res.rejected_steps;
        const double shrink = fl.converged ? std::clamp(0.9 / std::sqrt(err), 0.2, 0.9) : 0.25;
        if (!opts.adaptive && !fl.converged) {
          throw SolveError(fmt::format("the transient step at t = {:.6g} s did not converge; try a smaller --step", t));
        }
        h *= shrink;
        if (h < 1e-6) {
          throw SolveError(fmt::format("the transient step at t = {:.6g} s did not converge even with a step of "
                                       "{:.3g} s; check the case (extreme feed, uptake or gas settings)",
                                       t, h));
        }
        continue;
      }
      // Accepted.
      b = std::move(trial);
      if (opts.adaptive) {
        est.last_slope = std::move(slope);
        est.have_slope = true;
        h_next = h * std::clamp(0.9 / std::sqrt(std::max(err, 1e-12)), 0.2, 2.0);
      }
      t += h;
      // Balances at the new time level: that is what implicit Euler conserves exactly.
      res.o2_fed += fl.o2_in * h;
      res.o2_out += fl.o2_out * h;
      res.o2_taken_up += fl.o2_uptake * h;
      res.substrate_fed += fl.substrate_fed;
      res.substrate_consumed += fl.substrate_consumed;
      res.biomass_grown += fl.biomass_grown;
      TransientSample smp;
      smp.time_s = t;
      smp.step_s = h;
      smp.probe_do = b.x[4 * res.probe_zone];
      smp.do_min = smp.substrate_min = 1e300;
      smp.do_max = smp.substrate_max = -1e300;
      const GrowthKinetics g(current.culture);
      double vol = 0.0, below = 0.0, do_v = 0.0, s_v = 0.0, x_v = 0.0, mu_v = 0.0;
      for (int z = 0; z < n; ++z) {
        const double v = plant->net.volume[z], cz = b.x[4 * z];
        smp.do_min = std::min(smp.do_min, cz);
        smp.do_max = std::max(smp.do_max, cz);
        smp.pco2_max_pa = std::max(smp.pco2_max_pa, b.x[4 * z + 1] / plant->setup->henry_co2);
        do_v += v * cz;
        vol += v;
        below += cz < current.culture.critical_do_mol_m3 ? v : 0.0;
        if (res.grows) {
          smp.substrate_min = std::min(smp.substrate_min, b.substrate[z]);
          smp.substrate_max = std::max(smp.substrate_max, b.substrate[z]);
          s_v += v * b.substrate[z];
          x_v += v * b.biomass[z];
          mu_v += v * g.growth_rate(b.substrate[z], cz);
        }
      }
      if (!res.grows) smp.substrate_min = smp.substrate_max = 0.0;
      smp.do_mean = do_v / vol;
      smp.substrate_mean = s_v / vol;
      smp.biomass_mean = res.grows ? x_v / vol : current.culture.biomass_kg_m3;
      smp.growth_rate_mean = mu_v / vol;
      smp.volume_below_critical = below / vol;
      smp.our_mol_s = fl.o2_uptake;
      smp.otr_mol_s = fl.o2_in - fl.o2_out;
      smp.cer_mol_s = fl.co2_out - fl.co2_in;
      smp.speed_rps = current.operation.speed_rps;
      smp.gas_normal_m3_s = current.operation.gas_flow_normal_m3_s;
      smp.oxygen_fraction = current.operation.oxygen_fraction;
      smp.controller_output = u;
      smp.feed_rate_m3_s = current.feed.rate_at(t);
      smp.fed_volume_m3 = current.feed.volume_until(t);
      smp.heat_load_w = heat_balance(current, {plant->hydro.power_gassed_w, plant->hydro.gas_molar_flow_mol_s,
                                               smp.our_mol_s, smp.otr_mol_s, smp.cer_mol_s}).required_w;
      res.trace.push_back(smp);
      if (t >= next_output - 1e-9 || t >= opts.duration_s - 1e-9) {
        store_frame(fl);
        while (next_output <= t + 1e-9) next_output += opts.output_interval_s;
      }
      if (opts.progress) opts.progress(t);
      break;
    }
  }
  res.o2_stored_change = content(b, 0) - o2_start;
  if (res.grows) {
    res.substrate_stored_change = content(b, 1) - s_start;
    res.biomass_stored_change = content(b, 2) - x_start;
  }
  return res;
}

}  // namespace oxystrat
