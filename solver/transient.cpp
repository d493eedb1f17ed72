#include "transient.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <memory>

#include "gas_routing.hpp"
#include "hydrodynamics.hpp"
#include "oxygen_field.hpp"
#include "physics/solubility.hpp"

namespace oxystrat {
namespace {

// One implicit Euler step: the liquid rows gain -V (x - x_old) / h, the gas rows stay algebraic.
class EulerStep : public SteadyProblem {
 public:
  EulerStep(const OxygenProblem& p, const ZoneNetwork& net, const Eigen::VectorXd& old, double h)
      : p_(p), net_(net), old_(old), h_(h) {}
  int size() const override { return p_.size(); }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override {
    p_.residual(x, r);
    for (int k = 0; k < net_.size(); ++k) {
      r[4 * k] -= net_.volume[k] * (x[4 * k] - old_[4 * k]) / h_;
      r[4 * k + 1] -= net_.volume[k] * (x[4 * k + 1] - old_[4 * k + 1]) / h_;
    }
  }
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override {
    p_.jacobian(x, t);
    for (int k = 0; k < net_.size(); ++k) {
      t.emplace_back(4 * k, 4 * k, -net_.volume[k] / h_);
      t.emplace_back(4 * k + 1, 4 * k + 1, -net_.volume[k] / h_);
    }
  }
  double residual_scale() const override { return p_.residual_scale(); }

 private:
  const OxygenProblem& p_;
  const ZoneNetwork& net_;
  const Eigen::VectorXd& old_;
  double h_;
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
  NewtonWorkspace workspace;
  explicit Plant(const Case& cs)
      : c(cs), net(build_zone_geometry(c)), hydro(compute_hydrodynamics(c, net)), routing(route_gas(c, net, hydro)) {
    ctx = std::make_unique<OxygenContext>(OxygenContext{c, net, hydro, routing});
    setup = std::make_unique<OxygenSetup>(*ctx, -1.0);
  }
};

double offgas_o2(const Plant& p, const Eigen::VectorXd& x) {
  double out = 0.0;
  for (int k = 0; k < p.net.size(); ++k) {
    for (const auto& l : p.routing.out[k]) {
      if (l.to < 0) out += l.share * x[4 * k + 2];
    }
  }
  return out;
}

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
  res.probe_zone = std::max(0, plant->net.zone_containing(k.probe_r_m, k.probe_z_m));
  const double air_sat = physics::o2_saturation_air_1atm(c0.vessel.temperature_k) *
                         physics::salting_out_factor(physics::Gas::o2, c0.vessel.temperature_k, c0.broth.ions_mol_m3);

  Eigen::VectorXd x = solve_oxygen_field(*plant->ctx).state;
  if (opts.initial_do_mol_m3 >= 0.0) {
    for (int z = 0; z < plant->net.size(); ++z) x[4 * z] = opts.initial_do_mol_m3;
  }
  double stored_start = 0.0;
  for (int z = 0; z < plant->net.size(); ++z) stored_start += plant->net.volume[z] * x[4 * z];

  // Cascade position u in [0, 3]: speed over [0, 1], then gas over [1, 2], then O2 over [2, 3].
  const auto actuators = [&](double u, Case& c) {
    const auto lerp = [](double a, double b, double f) { return a + (b - a) * std::clamp(f, 0.0, 1.0); };
    c.operation.speed_rps = lerp(k.speed_min_rps, k.speed_max_rps, u);
    c.operation.gas_flow_normal_m3_s = lerp(gas_lo, gas_hi, u - 1.0);
    c.operation.oxygen_fraction = lerp(o2_lo, o2_hi, u - 2.0);
  };
  // The cascade ends at its last stage that can act (a stage with no range would let the integral wind up).
  const double u_max = o2_hi > o2_lo ? 3.0 : gas_hi > gas_lo ? 2.0 : 1.0;
  double integral = 0.0, u = 0.0;
  double t = 0.0, next_control = 0.0, next_output = 0.0;
  size_t next_event = 0;
  std::vector<Override> applied = base_overrides;
  Case current = c0;
  const auto rebuild = [&] { plant = std::make_unique<Plant>(current); };
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
      const double error = (k.setpoint_mol_m3 - x[4 * res.probe_zone]) / air_sat;
      integral += error * k.interval_s;
      u = k.gain * (error + integral / k.integral_time_s);
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
      rebuild();
      // The gas is quasi-steady: start its flows afresh on the new routing, keep the liquid.
      const Eigen::VectorXd fresh = plant->setup->initial_state();
      for (int z = 0; z < plant->net.size(); ++z) x[4 * z + 2] = fresh[4 * z + 2], x[4 * z + 3] = fresh[4 * z + 3];
    }
    double h = std::min(opts.step_s, opts.duration_s - t);
    if (k.enabled) h = std::min(h, next_control - t);
    if (next_event < c0.events.size()) h = std::min(h, c0.events[next_event].time_s - t);
    h = std::max(h, 1e-9);
    plant->setup->update(x);
    const auto& s = *plant->setup;
    const OxygenProblem problem(plant->net, plant->routing, s.transport, s.coeff, s.uptake, s.inlet_o2_mol_s,
                                s.inlet_co2_mol_s);
    const Eigen::VectorXd old = x;
    const EulerStep step(problem, plant->net, old, h);
    const auto rep = solve_newton(step, x, {}, &plant->workspace);
    if (!rep.converged) {
      throw SolveError(fmt::format("the transient step at t = {:.6g} s did not converge (scaled residual {:.3g}); try "
                                   "a smaller --step",
                                   t, rep.residual));
    }
    t += h;
    // Balances at the new time level: that is what implicit Euler conserves exactly.
    TransientSample smp;
    smp.time_s = t;
    smp.probe_do = x[4 * res.probe_zone];
    smp.do_min = 1e300;
    double vol = 0.0, below = 0.0, do_v = 0.0;
    for (int z = 0; z < plant->net.size(); ++z) {
      const double v = plant->net.volume[z], cz = x[4 * z];
      smp.do_min = std::min(smp.do_min, cz);
      do_v += v * cz;
      vol += v;
      below += cz < current.culture.critical_do_mol_m3 ? v : 0.0;
      smp.our_mol_s += s.uptake.our(cz) * v;
    }
    smp.do_mean = do_v / vol;
    smp.volume_below_critical = below / vol;
    const double out = offgas_o2(*plant, x);
    smp.otr_mol_s = s.inlet_o2_mol_s - out;
    smp.speed_rps = current.operation.speed_rps;
    smp.gas_normal_m3_s = current.operation.gas_flow_normal_m3_s;
    smp.oxygen_fraction = current.operation.oxygen_fraction;
    res.o2_fed += s.inlet_o2_mol_s * h;
    res.o2_out += out * h;
    res.o2_taken_up += smp.our_mol_s * h;
    res.trace.push_back(smp);
    if (t >= next_output - 1e-9 || t >= opts.duration_s - 1e-9) {
      std::vector<double> field(plant->net.size());
      for (int z = 0; z < plant->net.size(); ++z) field[z] = x[4 * z];
      res.field_time_s.push_back(t);
      res.do_fields.push_back(field);
      next_output += opts.output_interval_s;
    }
  }
  double stored_end = 0.0;
  for (int z = 0; z < plant->net.size(); ++z) stored_end += plant->net.volume[z] * x[4 * z];
  res.o2_stored_change = stored_end - stored_start;
  return res;
}

}  // namespace oxystrat
