// Calibration at pilot scale, kLa: the van 't Riet constants of the case's kLa correlation fitted
// to measured kLa values at several operating points of the user's own pilot vessel (the case). Every operating
// point is run through the project's own hydrodynamics (gassed power, gas flow at mid-height), so
// the fitted constants belong to exactly the power and gas model the prediction at scale uses.
// SI inside: kLa [1/s], mixing time [s], P/V [W/m3], vs [m/s].
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "mesh/zone_network.hpp"
#include "physics/mass_transfer.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/studies/calibration_data.hpp"

namespace oxystrat {

//! The vessel-level van 't Riet inputs of an operating point, computed as the oxygen-field setup
//! does: gassed power of all impellers per working volume, the superficial velocity of the
//! (wet, ungassed-liquid) inlet gas at mid-height, the temperature factor 1.024^(T - 20 degC) and
//! the case's kla_factor. kLa = a (P/V)^alpha vs^beta * temperature_factor * kla_factor.
struct VesselKlaInputs {
  double power_per_volume_w_m3 = 0.0;  //!< Pg / V [W/m3]
  double superficial_gas_m_s = 0.0;    //!< vs at mid-height [m/s]
  double temperature_factor = 1.0;     //!< [-]
  double kla_factor = 1.0;             //!< [-]
};
VesselKlaInputs vessel_kla_inputs(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h);
//! The vessel-level kLa [1/s] for constants k.
double vessel_kla(const VantRietConstants& k, const VesselKlaInputs& in);

//! The published band of the exponents: the span of van 't Riet's (1979) two forms (coalescing
//! 0.4 and 0.5, non-coalescing 0.7 and 0.2 on P/V and vs).
inline constexpr double published_power_exponent_lo = 0.4, published_power_exponent_hi = 0.7;
inline constexpr double published_gas_exponent_lo = 0.2, published_gas_exponent_hi = 0.5;

struct KlaCalibrationOptions {
  double confidence = 0.95;     //!< of the intervals
  bool zone_model_check = true; //!< also solve the steady field at every point with the fitted constants
};

//! One operating point of a kLa calibration.
struct KlaPointResult {
  std::string name;
  int line = 0;
  double speed_rps = 0.0;            //!< [1/s]
  double gas_normal_m3_s = 0.0;      //!< [m3/s] at 0 degC, 1 atm
  double working_volume_m3 = 0.0;    //!< [m3]
  VesselKlaInputs inputs;
  double measured_1_s = 0.0;         //!< [1/s]
  double fitted_1_s = 0.0;           //!< the fitted vessel-level correlation [1/s]
  double before_1_s = 0.0;           //!< the case's correlation before the fit [1/s]
  double zone_mean_1_s = -1.0;       //!< volume-mean kLa of the zone model, fitted constants [1/s]; < 0: not computed
  double residual_log = 0.0;         //!< ln(fitted / measured) [-]
  double weight = 1.0;               //!< normalised to mean 1 [-]
};

struct KlaCalibration {
  VantRietConstants before{}, fitted{};  //!< the case's constants and the fitted ones (SI)
  bool power_exponent_fitted = true, gas_exponent_fitted = true;
  //! Intervals at `confidence`; equal to the value for a constant that was held.
  double prefactor_lo = 0.0, prefactor_hi = 0.0;
  double power_exponent_lo = 0.0, power_exponent_hi = 0.0;
  double gas_exponent_lo = 0.0, gas_exponent_hi = 0.0;
  double confidence = 0.95, t_quantile = 0.0;
  int points = 0, parameters = 0;
  std::optional<double> r_squared;  //!< of ln kLa, weighted; absent when the measured values have no spread
  double rms_log = 0.0;        //!< weighted RMS of ln(fitted/measured) [-]
  double exponent_correlation = 0.0;  //!< correlation of ln(P/V) and ln(vs) over the points [-]
  double pv_min = 0.0, pv_max = 0.0, vs_min = 0.0, vs_max = 0.0;  //!< ranges covered [W/m3], [m/s]
  double speed_min_rps = 0.0, speed_max_rps = 0.0, vvm_min = 0.0, vvm_max = 0.0;
  double zone_check_max_deviation = -1.0;  //!< max |zone mean / fitted - 1| [-]; < 0: not computed
  std::vector<KlaPointResult> rows;
  std::vector<std::string> warnings;  //!< complete sentences for the user
};

//! Fits ln kLa = ln a + alpha ln(P/V) + beta ln(vs) (weighted least squares, Student-t intervals)
//! over the points. An exponent whose regressor hardly varies, or both when they vary together,
//! is held at the case's value and the warnings say so. Throws CaseError for too few points, for
//! points with no spread (neither exponent can be fitted: the speed and the gas flow both vary by
//! less than 10 %), or a case whose kLa model is not the correlation.
KlaCalibration calibrate_kla(const LoadedCase& base, const std::vector<Override>& base_overrides,
                             const CalibrationData& data, const KlaCalibrationOptions& options = {});

}  // namespace oxystrat
