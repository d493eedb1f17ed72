#include "solver/studies/scale_up.hpp"

#include <fmt/format.h>
#include <omp.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <numbers>

#include "physics/solubility.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/mixing_time.hpp"
#include "solver/oxygen/case_run.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

double mid_height_superficial(const Case& c) {
  const double t = c.vessel.temperature_k;
  const double p = c.vessel.head_pressure_pa + 0.5 * c.broth.density_kg_m3 * kG * c.vessel.liquid_height_m;
  const double molar = c.operation.gas_flow_normal_m3_s / normal_molar_volume;
  const double area = std::numbers::pi * 0.25 * c.vessel.diameter_m * c.vessel.diameter_m;
  return molar * kR * t / (p - physics::water_vapour_pressure(t)) / area;
}

// Normal gas flow [m3/s] that gives superficial velocity `vs` at mid-height of case c.
double gas_for_superficial(const Case& c, double vs) {
  const double ratio = mid_height_superficial(c) / std::max(c.operation.gas_flow_normal_m3_s, 1e-300);
  return vs / ratio;
}

enum class Depth { hydro, mixing, field };

ScaleMetrics metrics(const Case& c, Depth depth) {
  ScaleMetrics m;
  m.speed_rps = c.operation.speed_rps;
  m.gas_normal_m3_s = c.operation.gas_flow_normal_m3_s;
  m.vvm = 60.0 * m.gas_normal_m3_s / c.vessel.working_volume_m3;
  m.superficial_gas_m_s = mid_height_superficial(c);
  if (depth == Depth::field) {
    const auto run = run_case(c, {true, false});
    m.effects = lever_effects(c, run);
    m.power_per_volume_w_m3 = m.effects.power_per_volume_w_m3;
    m.tip_speed_m_s = m.effects.tip_speed_m_s;
    m.kla_1_s = run.field ? run.field->kla_vessel_1_s : 0.0;
    m.do_min_mol_m3 = m.effects.do_min_mol_m3;
    m.max_biomass_kg_m3 = run.max_biomass_kg_m3;
    m.theta95_s = tracer_mixing_time(run.net, run.hydro, {}).theta_s;
    return m;
  }
  const auto net = build_zone_geometry(c);
  const auto h = compute_hydrodynamics(c, net);
  m.power_per_volume_w_m3 = h.power_gassed_w / c.vessel.working_volume_m3;
  for (const auto& i : h.impellers) m.tip_speed_m_s = std::max(m.tip_speed_m_s, i.tip_speed_m_s);
  if (depth == Depth::mixing) m.theta95_s = tracer_mixing_time(net, h, {}).theta_s;
  return m;
}

Case at_point(const LoadedCase& base, const std::vector<Override>& overrides, double speed_rps, double gas_normal_m3_s) {
  auto o = overrides;
  o.push_back(parse_override(fmt::format("operation.speed=\"{:.12g} rpm\"", 60.0 * speed_rps)));
  o.push_back(parse_override(fmt::format("operation.gas_flow=\"{:.12g} Nm3/h\"", 3600.0 * gas_normal_m3_s)));
  return read_case_text(base.source_text, base.file_name, o).data;
}

// The speed at which `value(speed)` (monotone in speed) equals `target`: bisection on ln N.
struct Solved {
  bool reached = false;
  double speed_rps = 0.0;
};
Solved speed_for(const std::function<double(double)>& value, double target, double lo, double hi, bool rising) {
  double f_lo = value(lo) - target, f_hi = value(hi) - target;
  if (!rising) f_lo = -f_lo, f_hi = -f_hi;
  if (f_lo > 0.0) return {false, lo};
  if (f_hi < 0.0) return {false, hi};
  double a = std::log(lo), b = std::log(hi);
  for (int i = 0; i < 40 && b - a > 1e-5; ++i) {
    const double mid = 0.5 * (a + b);
    double f = value(std::exp(mid)) - target;
    if (!rising) f = -f;
    (f < 0.0 ? a : b) = mid;
  }
  return {true, std::exp(0.5 * (a + b))};
}

}  // namespace

ScaleUpStudy study_scale_up(const LoadedCase& pilot, const LoadedCase& production,
                            const std::vector<Override>& overrides, const ScaleUpOptions& o) {
  ScaleUpStudy s;
  s.pilot = metrics(pilot.data, Depth::field);
  const Case& prod = production.data;
  const double n0 = prod.operation.speed_rps;
  // Within the speeds a case may give: the reader refuses a point beyond them, and the criterion
  // would be lost to that error (a production vessel smaller than the pilot needs high speeds).
  const double lo = n0 / o.speed_factor, hi = std::min(n0 * o.speed_factor, max_speed_rps);
  const double gas_vvm = s.pilot.vvm * prod.vessel.working_volume_m3 / 60.0;  // equal vvm [Nm3/s]
  const double gas_vs = gas_for_superficial(prod, s.pilot.superficial_gas_m_s);

  struct Criterion {
    std::string name;
    double gas;
    Depth depth;
    std::function<double(const ScaleMetrics&)> measure;
    double target;
    bool rising;
  };
  const std::vector<Criterion> criteria{
      {"equal P/V (gassed), equal vvm", gas_vvm, Depth::hydro, [](const ScaleMetrics& m) { return m.power_per_volume_w_m3; },
       s.pilot.power_per_volume_w_m3, true},
      {"equal tip speed, equal vvm", gas_vvm, Depth::hydro, [](const ScaleMetrics& m) { return m.tip_speed_m_s; },
       s.pilot.tip_speed_m_s, true},
      {prod.model.kla_model == KlaModel::mechanistic ? "equal kLa (mechanistic, volume mean), equal vvm"
                                                      : "equal kLa (vessel correlation), equal vvm",
       gas_vvm, Depth::field, [](const ScaleMetrics& m) { return m.kla_1_s; },
       s.pilot.kla_1_s, true},
      {"equal mixing time, equal vvm", gas_vvm, Depth::mixing, [](const ScaleMetrics& m) { return m.theta95_s; },
       s.pilot.theta95_s, false},
      {"equal DO min (zone model), equal vvm", gas_vvm, Depth::field, [](const ScaleMetrics& m) { return m.do_min_mol_m3; },
       s.pilot.do_min_mol_m3, true},
      {"equal P/V (gassed), equal superficial gas velocity", gas_vs, Depth::hydro,
       [](const ScaleMetrics& m) { return m.power_per_volume_w_m3; }, s.pilot.power_per_volume_w_m3, true},
  };
  s.rows.resize(criteria.size() + 1);
  const int threads = o.threads > 0 ? o.threads : omp_get_max_threads();
#pragma omp parallel for schedule(dynamic, 1) num_threads(threads)
  for (int i = 0; i <= static_cast<int>(criteria.size()); ++i) {
    ScaleUpRow& row = s.rows[i];
    try {
      if (i == 0) {
        row.criterion = "production case as written";
        row.production = metrics(prod, Depth::field);
        continue;
      }
      const auto& k = criteria[i - 1];
      row.criterion = k.name;
      const auto value = [&](double speed) { return k.measure(metrics(at_point(production, overrides, speed, k.gas), k.depth)); };
      const auto solved = speed_for(value, k.target, lo, hi, k.rising);
      row.reached = solved.reached;
      if (!solved.reached) {
        row.note = fmt::format("not reachable between {:.3g} and {:.3g} rpm; shown at the nearer end", 60 * lo, 60 * hi);
      }
      row.production = metrics(at_point(production, overrides, solved.speed_rps, k.gas), Depth::field);
    } catch (const Error& e) {
      row.reached = false;
      row.note = e.what();
    }
  }
  return s;
}

}  // namespace oxystrat
