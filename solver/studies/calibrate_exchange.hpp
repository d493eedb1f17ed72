// Calibration at pilot scale, mixing: the turbulent exchange constant fitted to mixing times
// measured at several operating points of the user's own pilot vessel (the case). SI inside.
#pragma once

#include <string>
#include <vector>

#include "solver/flow/mixing_time.hpp"
#include "solver/studies/calibration_data.hpp"

namespace oxystrat {

struct MixingCalibrationOptions {
  MixingOptions mixing;          //!< injection, probe, homogeneity of the measured theta
  bool at_probe = true;          //!< compare with theta at the probe (else the whole vessel)
  double confidence = 0.95;
  double search_factor = 100.0;  //!< search c_t within default / f .. default * f
};

struct MixingPointResult {
  std::string name;
  int line = 0;
  double speed_rps = 0.0, gas_normal_m3_s = 0.0, working_volume_m3 = 0.0;
  double measured_s = 0.0, fitted_s = 0.0, before_s = 0.0;  //!< [s]
  double residual_log = 0.0;  //!< ln(fitted / measured)
  double sensitivity = 0.0;   //!< d ln theta / d ln c_t at the fit [-]
  double weight = 1.0;
};

struct MixingCalibration {
  double before = 0.0, fitted = 0.0;       //!< exchange constant c_t [-]
  double lo = 0.0, hi = 0.0;               //!< interval at `confidence` (NaN: undetermined)
  double confidence = 0.95, t_quantile = 0.0;
  double rms_log = 0.0;
  int points = 0, evaluations = 0;         //!< evaluations: mixing-time computations
  bool at_search_bound = false;
  //! Empty when the fit determines c_t; else why not (the best value at the end of the search
  //! range, or mixing times the exchange hardly moves): then c_t is reported, never set.
  std::string not_determined;
  std::vector<MixingPointResult> rows;
  std::vector<std::string> warnings;
};

//! Fits model.exchange_constant so the network's mixing times match the measured ones on the log
//! scale: a scan over ln c_t then golden-section refinement; the interval from the residual
//! scatter and the sensitivities (Student-t on n - 1 degrees of freedom).
MixingCalibration calibrate_exchange(const LoadedCase& base, const std::vector<Override>& base_overrides,
                                     const CalibrationData& data, const MixingCalibrationOptions& options = {});

}  // namespace oxystrat
