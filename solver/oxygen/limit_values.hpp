// The heat, shear and cost values of a run as named summary values (the rows of compare, the
// columns of sweep): only those that apply, never a NaN placeholder.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/oxygen/summary_values.hpp"

namespace oxystrat {

//! Appends heat_*, cooling_*, max_biomass_heat, dissipation_max, kolmogorov_length_min, compressor_power,
//! total_power, operating_cost, ... in SI with their display units. Values of absent tables ([cooling],
//! [prices]) are left out.
void append_limit_values(const Case& c, const CaseRun& run, std::vector<SummaryValue>& out);
//! The names append_limit_values can give for this case, in its order: those of [cooling] and
//! [prices] only when the case has the table. A run leaves out a margin or a cost per kg that
//! is undefined (no heat to remove, no O2 transferred).
std::vector<std::string> limit_value_names(const Case& c);

}  // namespace oxystrat
