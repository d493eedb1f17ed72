#include "solver/oxygen/transient.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <memory>

#include "input/errors.hpp"
#include "solver/oxygen/culture_growth.hpp"
#include "solver/oxygen/do_control.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/heat_balance.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "solver/oxygen/transient_events.hpp"
#include "solver/oxygen/transient_step.hpp"

namespace oxystrat {

using namespace transient_detail;

TransientResult run_transient(const LoadedCase& base, const std::vector<Override>& base_overrides,
                              const TransientOptions& opts) {
  check_transient_events(base, base_overrides);
  TransientResult res;
  const Case& c0 = base.data;
  const auto& k = c0.control;
  auto plant = std::make_unique<Plant>(c0);
  const int n = plant->net.size();
  // The case reader keeps both points in the broth; a zone the grid cannot find is not replaced by
  // another one silently.
  const auto zone_of = [&plant](const char* what, double r, double z) {
    const int k = plant->net.zone_containing(r, z);
    if (k < 0) throw CaseError(fmt::format("the {} at r = {:.4g} m, z = {:.4g} m lies in no zone of the grid", what, r, z));
    return k;
  };
  res.probe_zone = zone_of("DO probe", k.probe_r_m, k.probe_z_m);
  res.grows = c0.culture.grows();
  res.working_volume_m3 = plant->net.total_volume();
  if (c0.feed.enabled) res.feed_zone = zone_of("feed point", c0.feed.r_m, c0.feed.z_m);
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

  DoController controller(c0, air_sat);
  double u = 0.0;  // cascade position [-]
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
      if (k.enabled) {  // a new set-point or limits; the controller keeps its actuators
        controller.retune(current);
        current.operation.speed_rps = speed;
        current.operation.gas_flow_normal_m3_s = gas;
        current.operation.oxygen_fraction = o2;
      }
      ++next_event;
      changed = true;
    }
    if (k.enabled && t >= next_control - 1e-9) {
      u = controller.update(b.x[4 * res.probe_zone]);
      const double speed = current.operation.speed_rps, gas = current.operation.gas_flow_normal_m3_s,
                   o2 = current.operation.oxygen_fraction;
      controller.actuate(u, current);
      changed = changed || current.operation.speed_rps != speed || current.operation.gas_flow_normal_m3_s != gas ||
                current.operation.oxygen_fraction != o2;
      next_control += current.control.interval_s;  // an event may retune it
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
      smp.controller_at_top = k.enabled && u >= 0.999 * controller.max_output();
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
