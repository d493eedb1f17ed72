// The scalar results of one case as a flat, named list with units: one row of a sweep table,
// one column of a comparison, one set of constraint checks.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/case_run.hpp"

namespace oxystrat {

struct SummaryValue {
  std::string name;    //!< stable identifier, e.g. "do_min"
  std::string unit;    //!< display unit of `value`
  double value = 0.0;  //!< in `unit` (display units: people read these tables)
  std::string label;   //!< human label for reports
};

//! Power, P/V, tip speed, regimes, kLa, DO, share below critical, supportable biomass, off-gas,
//! pCO2; theta95 only when given. NaN where a value does not apply (no gas): writers leave such
//! values out.
std::vector<SummaryValue> summary_values(const Case& c, const CaseRun& run, std::optional<double> theta95_s);

//! The names summary_values() gives, in its order (known before anything is run).
std::vector<std::string> summary_value_names(bool with_theta95);

//! Value by name (throws std::out_of_range).
double summary_value(const std::vector<SummaryValue>& values, const std::string& name);

}  // namespace oxystrat
