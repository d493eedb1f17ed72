// Scale-up from a pilot: the production vessel's operating point under each criterion engineers
// use (equal gassed P/V, tip speed, kLa, mixing time, superficial gas velocity, and the zone
// model's own: equal minimum DO), each run through the zone model and checked against the
// production case's [constraints]. The pilot's gas rate carries over as vvm unless the criterion
// is about the gas itself.
#pragma once

#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/studies/levers.hpp"

namespace oxystrat {

//! What a vessel does at one operating point: the quantities the criteria compare [SI].
struct ScaleMetrics {
  double speed_rps = 0.0;
  double gas_normal_m3_s = 0.0;
  double vvm = 0.0;                     //!< [1/min]
  double power_per_volume_w_m3 = 0.0;   //!< gassed
  double tip_speed_m_s = 0.0;
  double kla_1_s = 0.0;                 //!< vessel-level correlation at the point
  double superficial_gas_m_s = 0.0;     //!< at mid-height
  double theta95_s = 0.0;               //!< whole vessel
  double do_min_mol_m3 = 0.0;
  double max_biomass_kg_m3 = 0.0;
  LeverEffects effects;                 //!< power, shear, pCO2, constraints
};

struct ScaleUpRow {
  std::string criterion;     //!< "equal P/V", ...
  bool reached = true;       //!< the criterion could be met within the speed range tried
  std::string note;
  ScaleMetrics production;
};

struct ScaleUpStudy {
  ScaleMetrics pilot;
  std::vector<ScaleUpRow> rows;  //!< the production case as written first, then one per criterion
};

struct ScaleUpOptions {
  double speed_factor = 8.0;  //!< speeds tried from the production case's / f to x f
  int threads = 0;
};

ScaleUpStudy study_scale_up(const LoadedCase& pilot, const LoadedCase& production,
                            const std::vector<Override>& production_overrides, const ScaleUpOptions& options = {});

}  // namespace oxystrat
