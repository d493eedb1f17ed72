// The levers the trade pulls to raise oxygen transfer: agitator speed, gas flow, back pressure,
// O2 enrichment, and another impeller set. Each is moved alone, from the case's own value towards
// its limit, to the smallest value at which the case meets its [constraints]; what that costs
// (power, shear, flooding, pCO2, pressure, safety) is recorded beside it.
#pragma once

#include <algorithm>
#include <optional>
#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/constraints.hpp"

namespace oxystrat {

//! What a case gives at one operating point, in SI: the side effects a lever is judged by.
struct LeverEffects {
  double power_gassed_w = 0.0;
  double total_power_w = 0.0;          //!< drawn: agitator drive + compressor [W]
  double oxygen_purchased_kg_s = 0.0;  //!< pure O2 blended into the inlet gas [kg/s]
  std::optional<double> cost_per_h;    //!< with [prices], in the case's currency
  double cooling_required_w = 0.0;     //!< heat the cooling must remove [W]
  std::optional<double> cooling_margin;  //!< with [cooling]: (available - required) / required
  double power_per_volume_w_m3 = 0.0;
  double tip_speed_m_s = 0.0;
  int flooded_impellers = 0;
  double epsilon_max_w_kg = 0.0;      //!< largest dissipation, impeller discharges included [W/kg]
  double pco2_max_pa = 0.0;
  double head_pressure_pa = 0.0;
  double bottom_pressure_pa = 0.0;
  double oxygen_fraction = 0.0;
  double gas_flow_normal_m3_s = 0.0;
  double do_min_mol_m3 = 0.0;
  double volume_fraction_below_critical = 0.0;
  double kla_mean_1_s = 0.0;
  std::vector<ConstraintCheck> checks;
  bool feasible = false;
  std::vector<std::string> cautions;
};

LeverEffects lever_effects(const Case& c, const CaseRun& run);

struct LeverResult {
  std::string name;        //!< "speed", "gas flow", "head pressure", "O2 fraction", "impellers"
  std::string key;         //!< the case key moved ("operation.speed"), or the other case file
  std::string unit;        //!< unit of `current`, `limit` and `value` as printed ("rpm")
  double current = 0.0;    //!< the case's own value
  double limit = 0.0;      //!< how far the lever may go
  std::string limit_reason;
  bool already = false;    //!< the case meets its constraints as it is
  bool found = false;      //!< a value within the limit meets them
  double value = 0.0;      //!< the smallest such value (the limit when none)
  LeverEffects effects;    //!< at `value`
  std::string note;        //!< why it failed, or what to watch
  std::string si_unit;     //!< SI unit of the lever's quantity ("1/s"; normal m3/s for vvm); empty: none
  double si_per_unit = 1.0;  //!< SI value = `current`, `limit` or `value` x this
};

struct LeverOptions {
  std::string impeller_case;  //!< a case file whose impellers replace the case's (optional)
  int scan_points = 8;        //!< values tried between the case's own and the limit
  int refine_steps = 7;       //!< bisection steps between the last failing and first passing value
  int threads = 0;            //!< 0: OpenMP default
};

struct LeversStudy {
  LeverEffects base;
  std::vector<LeverResult> levers;  //!< ranked: feasible first, by added gassed power (least first)
};

//! Pure O2 a lever buys on top of what the case buys as written [kg/s] (0 for a lever that
//! does not enrich): drawn power leaves it out, so the advice states it beside the power.
inline double added_oxygen_kg_s(const LeverResult& r, const LeversStudy& s) {
  return std::max(0.0, r.effects.oxygen_purchased_kg_s - s.base.oxygen_purchased_kg_s);
}

//! Moves each lever alone. Errors in one lever's runs are that lever's note, never the study's.
LeversStudy study_levers(const LoadedCase& loaded, const std::vector<Override>& overrides, const LeverOptions& options);

}  // namespace oxystrat
