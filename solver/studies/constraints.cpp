#include "solver/studies/constraints.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "solver/studies/limit_constraints.hpp"
#include "physics/constants.hpp"

namespace oxystrat {

std::vector<ConstraintCheck> check_constraints(const Case& c, const CaseRun& run) {
  const auto& k = c.constraints;
  std::vector<ConstraintCheck> out;
  const double floor = k.min_do_mol_m3.value_or(c.culture.critical_do_mol_m3);
  if (run.field) {
    // The share of the volume below the floor, against the allowed share.
    double below = 0.0;
    for (int z = 0; z < run.net.size(); ++z) {
      if (run.field->do_mol_m3[z] < floor) below += run.net.volume[z];
    }
    below /= run.net.total_volume();
    const bool ok = below <= k.max_volume_below_critical + 1e-12;
    out.push_back({"do_min", ok,
                   fmt::format("DO min {:.4f} mmol/L, {:.1f} % of the volume below {:.4f} mmol/L (allowed {:.1f} %)",
                               run.field->do_min, 100 * below, floor, 100 * k.max_volume_below_critical)});
  } else {
    out.push_back({"do_min", false, "no gas: no oxygen supply"});
  }
  double tip = 0.0;
  bool flooded = false;
  for (const auto& i : run.hydro.impellers) {
    tip = std::max(tip, i.tip_speed_m_s);
    flooded = flooded || i.regime == GasRegime::flooded;
  }
  if (k.max_tip_speed_m_s) {
    out.push_back({"tip_speed", tip <= *k.max_tip_speed_m_s,
                   fmt::format("tip speed {:.2f} m/s (limit {:.2f} m/s)", tip, *k.max_tip_speed_m_s)});
  }
  if (k.max_power_per_volume_w_m3) {
    const double pv = run.hydro.power_gassed_w / c.vessel.working_volume_m3;
    out.push_back({"power_per_volume", pv <= *k.max_power_per_volume_w_m3,
                   fmt::format("Pg/V {:.3g} kW/m3 (limit {:.3g} kW/m3)", pv / 1e3, *k.max_power_per_volume_w_m3 / 1e3)});
  }
  if (k.max_pco2_pa && run.field) {
    out.push_back({"pco2", run.field->pco2_max_pa <= *k.max_pco2_pa,
                   fmt::format("pCO2 max {:.0f} mmHg (limit {:.0f} mmHg)", run.field->pco2_max_pa / kMmHgPa,
                               *k.max_pco2_pa / kMmHgPa)});
  }
  if (!k.allow_flooding) out.push_back({"flooding", !flooded, flooded ? "an impeller is flooded" : "no impeller flooded"});
  append_limit_checks(c, run, out);  // heat and shear
  return out;
}

bool feasible(const std::vector<ConstraintCheck>& checks) {
  return std::all_of(checks.begin(), checks.end(), [](const auto& c) { return c.satisfied; });
}

}  // namespace oxystrat
