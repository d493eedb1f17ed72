// A measured dissolved-oxygen trace as a plant exports it (CSV with units in the header), read
// into SI for the kLa fit: time [s]; DO as a concentration [mol/m3] or a fraction of air
// saturation [1] (a trace in %). Also the DO values and uptake rates given beside a trace, which
// must be in the same kind of quantity as the trace.
#pragma once

#include <string>
#include <vector>

namespace oxystrat {

//! What the DO column of a trace measures.
enum class DoScale {
  concentration,  //!< dissolved O2 [mol/m3]
  saturation,     //!< fraction of air saturation [1] (read from %)
};

//! A measured DO trace, SI.
struct DoTrace {
  std::string file_name;        //!< for messages
  std::vector<double> time_s;   //!< sample times, strictly increasing [s]
  std::vector<double> value;    //!< DO [mol/m3] or [1], by `scale`
  std::vector<int> line;        //!< source line of each row (1-based), for messages
  DoScale scale = DoScale::concentration;
  std::string time_header, do_header;  //!< the header cells as written ("time [min]")
  std::string time_unit, do_unit;      //!< units as written ("min", "mg/L", "%")
  double time_factor = 1.0;  //!< SI value of one time_unit [s]
  double do_factor = 1.0;    //!< SI value of one do_unit [mol/m3] or [1]
};

//! Parses a trace: optional '#' comment lines, a header row naming both columns with units
//! (`time [s],DO [%]`, `t min;DO mg/L`), then one row per sample; ',' or ';' separates the
//! columns (with ';' a decimal comma is accepted). Time in s, min or h; DO in %, % air saturation,
//! mg/L (O2, 31.9988 g/mol), mmol/L, mol/m3 and the project's other concentration units. Throws
//! CaseError naming the file, line, column and what was expected; needs at least
//! `min_trace_points` rows.
DoTrace parse_do_trace(const std::string& text, const std::string& file_name);
//! Reads and parses a trace file.
DoTrace read_do_trace(const std::string& path);
inline constexpr int min_trace_points = 10;

//! A whole gassing-out run as a logger records it falls (stripping) before it rises: the rise is
//! what the fit needs. When the lowest reading lies after the first rows and the trace falls to
//! it by more than a fifth of its range, returns the trace from that reading on and says so in
//! `note` (the rows and the time left out); otherwise the trace as it is and an empty note.
DoTrace rise_from_minimum(const DoTrace& trace, std::string& note);

//! SI value of a DO quantity for a trace of the given scale: a concentration ("0.21 mmol/L",
//! "6.8 mg/L") for a concentration trace, a percentage ("100 %") for a saturation trace. `what`
//! names the option in messages. Throws CaseError.
double parse_do_value(const std::string& text, DoScale scale, const std::string& what);
//! SI uptake rate for a trace of the given scale: mmol/L/h, mmol/(L h), mol/m3/s, mol/(m3 s),
//! mg/L/h [mol/(m3 s)] for a concentration trace; %/h, %/min, %/s [1/s] for a saturation trace.
double parse_uptake_rate(const std::string& text, DoScale scale, const std::string& what);

}  // namespace oxystrat
