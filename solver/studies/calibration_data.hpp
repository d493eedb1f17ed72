// Measured operating points of the user's own pilot vessel for calibration: the data files
// (kLa or mixing time per point), and the case at each point.
#pragma once

#include <string>
#include <vector>

#include "input/case_reader.hpp"

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

//! The case (with its --set overrides) at the operating point of a data row: speed, gas flow and,
//! when given, head pressure and temperature set as overrides. Throws CaseError naming the data
//! file and line when the case rejects the point.
LoadedCase case_at_point(const LoadedCase& base, const std::vector<Override>& base_overrides,
                         const CalibrationData& data, const CalibrationPoint& p,
                         const std::vector<Override>& extra = {});

//! The points' weights scaled to mean 1.
std::vector<double> normalised_weights(const CalibrationData& data);

}  // namespace oxystrat
