// Calibration at pilot scale: the van 't Riet constants of the case's kLa correlation fitted to
// measured kLa values, and the turbulent exchange constant fitted to measured mixing times, each
// measured at several operating points of the user's own pilot vessel (the case). Every operating
// point is run through the project's own hydrodynamics (gassed power, gas flow at mid-height), so
// the fitted constants belong to exactly the power and gas model the prediction at scale uses.
// SI inside: kLa [1/s], mixing time [s], P/V [W/m3], vs [m/s].
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "physics/mass_transfer.hpp"
#include "solver/flow/mixing_time.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

//! What a calibration data file measures.
enum class CalibrationQuantity {
  kla,          //!< kLa per operating point (or a gassing-out trace to fit it from)
  mixing_time,  //!< tracer mixing time theta_x per operating point
};

//! One measured operating point, as read (units checked, values SI).
struct CalibrationPoint {
  std::string name;            //!< the name column, or "line N"
  int line = 0;                //!< source line (1-based)
  std::string speed_text;      //!< "400 rpm": the operating point as a case value
  std::string gas_text;        //!< "1.2 vvm", "0.36 Nm3/h"
  std::string pressure_text;   //!< head pressure as a case value, empty: the case's own
  std::string temperature_text;  //!< broth temperature as a case value, empty: the case's own
  double value = 0.0;          //!< measured kLa [1/s] or mixing time [s]
  double weight = 1.0;         //!< relative weight in the fit on the log scale [-]
  std::string trace;           //!< gassing-out trace the kLa was fitted from (path), or empty
};

struct CalibrationData {
  std::string file_name;
  CalibrationQuantity quantity = CalibrationQuantity::kla;
  std::vector<CalibrationPoint> points;
  std::vector<std::string> notes;  //!< e.g. a kLa taken from a trace, for the user
};

//! Parses a data file: optional '#' comment lines, a header naming the columns with units
//! (`speed [rpm],gas flow [Nm3/h],kLa [1/h]`), one row per operating point; ',' or ';' separates
//! the cells (with ';' a decimal comma is accepted). Columns, in any order: speed, gas flow
//! (the case's gas-flow units: vvm, Nm3/h, ..., m3/h actual), the measured value (kLa in 1/h,
//! 1/min, 1/s; or mixing time in s, min), and optionally head pressure, temperature, weight [-]
//! or uncertainty (of the measured value, in its unit or %), name, and for kLa a trace: a
//! gassing-out CSV (relative to the data file) fitted with the kla-fit code when the kLa cell is
//! empty. Throws CaseError naming the file, line, column, cell and what was expected.
CalibrationData parse_calibration_data(const std::string& text, const std::string& file_name,
                                       CalibrationQuantity quantity);
CalibrationData read_calibration_data(const std::string& path, CalibrationQuantity quantity);

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
  double r_squared = 0.0;      //!< of ln kLa, weighted; NaN when the data have no spread
  double rms_log = 0.0;        //!< weighted RMS of ln(fitted/measured) [-]
  double exponent_correlation = 0.0;  //!< correlation of ln(P/V) and ln(vs) over the points [-]
  double pv_min = 0.0, pv_max = 0.0, vs_min = 0.0, vs_max = 0.0;  //!< ranges covered [W/m3], [m/s]
  double speed_min_rps = 0.0, speed_max_rps = 0.0, vvm_min = 0.0, vvm_max = 0.0;
  double zone_check_max_deviation = -1.0;  //!< max |zone mean / fitted - 1| [-]; < 0: not computed
  std::vector<KlaPointResult> rows;
  std::vector<std::string> warnings;  //!< complete sentences for the user
};

//! The case (with its --set overrides) at the operating point of a data row: speed, gas flow and,
//! when given, head pressure and temperature set as overrides. Throws CaseError naming the data
//! file and line when the case rejects the point.
LoadedCase case_at_point(const LoadedCase& base, const std::vector<Override>& base_overrides,
                         const CalibrationData& data, const CalibrationPoint& p,
                         const std::vector<Override>& extra = {});

//! Fits ln kLa = ln a + alpha ln(P/V) + beta ln(vs) (weighted least squares, Student-t intervals)
//! over the points. An exponent whose regressor hardly varies, or both when they vary together,
//! is held at the case's value and the warnings say so. Throws CaseError for too few points or a
//! case whose kLa model is not the correlation.
KlaCalibration calibrate_kla(const LoadedCase& base, const std::vector<Override>& base_overrides,
                             const CalibrationData& data, const KlaCalibrationOptions& options = {});

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
  std::vector<MixingPointResult> rows;
  std::vector<std::string> warnings;
};

//! Fits model.exchange_constant so the network's mixing times match the measured ones on the log
//! scale: a scan over ln c_t then golden-section refinement; the interval from the residual
//! scatter and the sensitivities (Student-t on n - 1 degrees of freedom).
MixingCalibration calibrate_exchange(const LoadedCase& base, const std::vector<Override>& base_overrides,
                                     const CalibrationData& data, const MixingCalibrationOptions& options = {});

}  // namespace oxystrat
