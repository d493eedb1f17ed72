// The scalar results of one case as a flat, named list with units: one row of a sweep table,
// one column of a comparison, one set of constraint checks.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/case_run.hpp"

namespace oxystrat {

// One name, one SI value: files for programs (HDF5) take `value` in `unit`; tables for people (CSV,
// terminal, report) show display() in shown_unit(). The name is /summary's for the same quantity.
struct SummaryValue {
  std::string name;            //!< stable identifier, e.g. "do_min"
  std::string unit;            //!< SI unit of `value` ("W", "1/s", "mol/m3", "1")
  double value = 0.0;          //!< in `unit` (SI)
  std::string label;           //!< human label for reports
  std::string display_unit;    //!< unit of the tables people read ("kW"); empty: `unit`
  double display_per_si = 1.0; //!< display value = value x this

  double display() const { return value * display_per_si; }
  const std::string& shown_unit() const { return display_unit.empty() ? unit : display_unit; }
};

//! A value in SI with the engineering unit its tables show (the factor from units::display_scale).
SummaryValue summary_entry(std::string name, double value_si, const std::string& si_unit,
                           const std::string& display_unit, std::string label);

//! Power, P/V, tip speed, regimes, kLa, DO, share below critical, supportable biomass, off-gas,
//! pCO2, mean OTR; theta95 only when given. All SI, each with its display unit. NaN where a value does not apply (no gas): writers leave such
//! values out.
std::vector<SummaryValue> summary_values(const Case& c, const CaseRun& run, std::optional<double> theta95_s);

//! The names summary_values() gives, in its order (known before anything is run).
std::vector<std::string> summary_value_names(bool with_theta95);

//! SI value by name (throws std::out_of_range).
double summary_value(const std::vector<SummaryValue>& values, const std::string& name);
//! Display value by name, in the entry's shown_unit() (throws std::out_of_range).
double summary_display(const std::vector<SummaryValue>& values, const std::string& name);

//! The current name of a summary value given under a name of an earlier release
//! ("volume_below_critical" -> "volume_fraction_below_critical"); other names unchanged.
std::string current_summary_name(const std::string& name);

}  // namespace oxystrat
