#include "solver/studies/levers.hpp"

#include <fmt/format.h>
#include <omp.h>

#include <algorithm>
#include <cmath>

#include "physics/solubility.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

// A lever: the case key it writes, the unit it is written in, and the values it may take.
struct LeverSpec {
  std::string name, key, unit;
  double current = 0.0, limit = 0.0;
  std::string reason;
  std::string si_unit;         // the SI unit of the lever's quantity, for files
  double si_per_unit = 1.0;    // SI value = value in `unit` x this
};

LeverSpec spec(std::string name, std::string key, std::string unit, double current, double limit, std::string reason) {
  LeverSpec s;
  s.name = std::move(name), s.key = std::move(key), s.unit = std::move(unit);
  s.current = current, s.limit = limit, s.reason = std::move(reason);
  return s;
}

// The lever as the case has it, before it is moved.
LeverResult result_of(const LeverSpec& s) {
  LeverResult r;
  r.name = s.name, r.key = s.key, r.unit = s.unit, r.current = s.current, r.limit = s.limit, r.limit_reason = s.reason;
  r.si_unit = s.si_unit, r.si_per_unit = s.si_per_unit;
  return r;
}

// The SI unit and factor of each lever unit: files hold SI (docs/outputs.md).
void set_si(LeverSpec& s, const Case& c) {
  // Move-assigned strings: GCC 12 warns falsely (-Wrestrict) on assigning literals here.
  if (s.unit == "rpm") s.si_unit = std::string("1/s"), s.si_per_unit = 1.0 / 60.0;
  if (s.unit == "vvm") s.si_unit = std::string("m3/s"), s.si_per_unit = c.vessel.working_volume_m3 / 60.0;  // normal m3/s
  if (s.unit == "bar(a)") s.si_unit = std::string("Pa"), s.si_per_unit = 1e5;
  if (s.unit == "%") s.si_unit = std::string("1"), s.si_per_unit = 0.01;
}

std::vector<LeverSpec> lever_specs(const Case& c) {
  std::vector<LeverSpec> out;
  const double rpm = c.operation.speed_rps * 60.0;
  double d_max = 0.0;
  for (const auto& i : c.impellers) d_max = std::max(d_max, i.diameter_m);
  if (c.constraints.max_tip_speed_m_s) {
    out.push_back(spec("speed", "operation.speed", "rpm", rpm,
                       std::min(*c.constraints.max_tip_speed_m_s / (M_PI * d_max), max_speed_rps) * 60.0,
                       "the tip-speed limit of [constraints]"));
  } else {
    out.push_back(spec("speed", "operation.speed", "rpm", rpm, std::min(2.0 * rpm, 60.0 * max_speed_rps),
                       "twice the case's speed (no tip-speed limit given)"));
  }
  const double vvm = c.operation.gas_flow_normal_m3_s * 60.0 / c.vessel.working_volume_m3;
  out.push_back(spec("gas flow", "operation.gas_flow", "vvm", vvm, std::max(vvm, 1.5),
                 "1.5 vvm, the top of full-scale practice (Benz 2003)"));
  const double bar = 1e5;
  const double head = c.vessel.head_pressure_pa / bar;
  if (c.vessel.pressure_rating_pa > 0.0) {
    out.push_back(spec("head pressure", "vessel.head_pressure", "bar(a)", head, std::max(head, 0.9 * c.vessel.pressure_rating_pa / bar),
                   "90 % of the vessel's pressure rating"));
  } else {
    out.push_back(spec("head pressure", "vessel.head_pressure", "bar(a)", head, std::max(head, 2.0),
                   "2 bar(a) (no pressure rating given: check the vessel's certificate)"));
  }
  out.push_back(spec("O2 fraction", "operation.oxygen_fraction", "%", 100.0 * c.operation.oxygen_fraction, 100.0,
                 "pure O2 (oxygen service of every wetted part required)"));
  for (auto& s : out) set_si(s, c);
  return out;
}

// Every moved point is only checked against the constraints: a margin solve of the field, no
// supportable biomass, no single-zone answer.
CaseRunOptions lever_run_options() {
  CaseRunOptions o;
  o.supportable_biomass = o.single_zone = false;
  o.field_solve = margin_solve_options();
  return o;
}

struct Evaluation {
  bool ok = false;
  std::string error;
  LeverEffects effects;
};

Evaluation evaluate(const LoadedCase& base, const std::vector<Override>& overrides, const LeverSpec& s, double value) {
  Evaluation e;
  try {
    auto o = overrides;
    o.push_back(parse_override(fmt::format("{}=\"{:.10g} {}\"", s.key, value, s.unit)));
    const auto loaded = read_case_text(base.source_text, base.file_name, o);
    const auto run = run_case(loaded.data, lever_run_options());
    e.effects = lever_effects(loaded.data, run);
    e.ok = true;
  } catch (const Error& err) {
    e.error = err.what();
  }
  return e;
}

// The smallest value between the case's and the limit at which the case is feasible: a scan,
// then bisection between the last failing and the first passing value.
LeverResult move_lever(const LoadedCase& base, const std::vector<Override>& overrides, const LeverSpec& s,
                       const LeverOptions& o) {
  LeverResult r = result_of(s);
  if (!(s.limit > s.current)) {
    r.value = s.current;
    r.note = fmt::format("no room: the case is already at the limit ({})", s.reason);
    const auto e = evaluate(base, overrides, s, s.current);
    if (e.ok) r.effects = e.effects;
    return r;
  }
  double lo = s.current, hi = s.limit;
  Evaluation passing;
  bool found = false;
  for (int i = 1; i <= o.scan_points && !found; ++i) {
    const double v = s.current + (s.limit - s.current) * i / o.scan_points;
    const auto e = evaluate(base, overrides, s, v);
    if (e.ok && e.effects.feasible) {
      hi = v, passing = e, found = true;
    } else {
      lo = v;
      if (!e.ok) r.note = e.error;
      if (e.ok) passing = e;  // the last evaluated state, for the report when nothing passes
    }
  }
  if (!found) {
    r.value = s.limit;
    r.effects = passing.effects;
    std::string broken;
    for (const auto& k : passing.effects.checks) {
      if (!k.satisfied) broken += (broken.empty() ? "" : "; ") + k.detail;
    }
    if (r.note.empty()) r.note = "not met up to the limit: " + broken;
    return r;
  }
  for (int i = 0; i < o.refine_steps; ++i) {
    const double mid = 0.5 * (lo + hi);
    const auto e = evaluate(base, overrides, s, mid);
    if (e.ok && e.effects.feasible) {
      hi = mid, passing = e;
    } else {
      lo = mid;
    }
  }
  r.found = true;
  r.value = hi;
  r.effects = passing.effects;
  return r;
}

LeverResult swap_impellers(const LoadedCase& base, const std::vector<Override>& overrides, const std::string& other) {
  LeverResult r;
  r.name = "impellers", r.key = other, r.limit_reason = "the impellers of " + other;
  try {
    const auto o = read_case_file(other);
    auto c = read_case_text(base.source_text, base.file_name, overrides).data;
    if (std::abs(o.data.vessel.diameter_m - c.vessel.diameter_m) > 1e-6 * c.vessel.diameter_m) {
      r.note = fmt::format("{} describes a vessel of {:.3g} m, not {:.3g} m: its impellers do not fit", other,
                           o.data.vessel.diameter_m, c.vessel.diameter_m);
      return r;
    }
    c.impellers = o.data.impellers;
    const auto run = run_case(c, lever_run_options());
    r.effects = lever_effects(c, run);
    r.found = r.effects.feasible;
    if (!r.found) r.note = "the other impellers alone do not meet the constraints";
  } catch (const Error& e) {
    r.note = e.what();
  }
  return r;
}

}  // namespace

LeverEffects lever_effects(const Case& c, const CaseRun& run) {
  LeverEffects e;
  const auto& h = run.hydro;
  e.power_gassed_w = h.power_gassed_w;
  e.power_per_volume_w_m3 = h.power_gassed_w / c.vessel.working_volume_m3;
  for (const auto& i : h.impellers) {
    e.tip_speed_m_s = std::max(e.tip_speed_m_s, i.tip_speed_m_s);
    e.flooded_impellers += i.regime == GasRegime::flooded ? 1 : 0;
  }
  e.epsilon_max_w_kg = run.limits.shear.epsilon_max_w_kg;  // the impeller maxima, as the constraint uses
  e.total_power_w = run.limits.cost.total_power_w;
  e.oxygen_purchased_kg_s = run.limits.cost.oxygen_purchased_mol_s * physics::molar_mass_o2;
  e.cost_per_h = run.limits.cost.total_per_h;
  e.cooling_required_w = run.limits.heat.required_w;
  e.cooling_margin = run.limits.heat.margin;
  e.head_pressure_pa = c.vessel.head_pressure_pa;
  e.bottom_pressure_pa = c.vessel.head_pressure_pa + c.broth.density_kg_m3 * kG * c.vessel.liquid_height_m;
  e.oxygen_fraction = c.operation.oxygen_fraction;
  e.gas_flow_normal_m3_s = c.operation.gas_flow_normal_m3_s;
  if (run.field) {
    e.pco2_max_pa = run.field->pco2_max_pa;
    e.do_min_mol_m3 = run.field->do_min;
    e.volume_fraction_below_critical = run.field->volume_fraction_below_critical;
    e.kla_mean_1_s = run.field->kla_mean_1_s;
  }
  e.checks = check_constraints(c, run);
  e.feasible = feasible(e.checks);
  e.cautions = run.cautions;
  return e;
}

LeversStudy study_levers(const LoadedCase& loaded, const std::vector<Override>& overrides, const LeverOptions& o) {
  LeversStudy s;
  const Case& c = loaded.data;
  // The case itself by a full solve, as the verdict of `run` judges it: the two never disagree on
  // whether it passes, however close it sits to a limit.
  s.base = lever_effects(c, run_case(c, {false, false}));
  const auto specs = lever_specs(c);
  const int count = static_cast<int>(specs.size()) + (o.impeller_case.empty() ? 0 : 1);
  s.levers.resize(count);
  const int threads = o.threads > 0 ? o.threads : omp_get_max_threads();
#pragma omp parallel for schedule(dynamic, 1) num_threads(threads)
  for (int i = 0; i < count; ++i) {
    if (i < static_cast<int>(specs.size())) {
      if (s.base.feasible) {
        LeverResult r = result_of(specs[i]);
        r.already = r.found = true;
        r.value = specs[i].current;
        r.effects = s.base;
        s.levers[i] = r;
      } else {
        s.levers[i] = move_lever(loaded, overrides, specs[i], o);
      }
    } else {
      s.levers[i] = swap_impellers(loaded, overrides, o.impeller_case);
    }
  }
  // Ranked: the levers that work first; among them the cheapest per hour when the case is priced,
  // else the least drawn power (agitator and compressor: more gas costs compressor power).
  std::stable_sort(s.levers.begin(), s.levers.end(), [](const LeverResult& a, const LeverResult& b) {
    if (a.found != b.found) return a.found;
    if (a.effects.cost_per_h && b.effects.cost_per_h) return *a.effects.cost_per_h < *b.effects.cost_per_h;
    return a.effects.total_power_w < b.effects.total_power_w;
  });
  return s;
}

}  // namespace oxystrat
