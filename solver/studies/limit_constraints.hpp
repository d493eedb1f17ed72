// The [constraints] on heat and shear: the required cooling duty, the margin over the available
// cooling, the smallest eddies and the largest local dissipation (impeller maxima included).
#pragma once

#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/constraints.hpp"

namespace oxystrat {

//! Appends one check per heat or shear constraint the case sets: "heat", "cooling",
//! "kolmogorov_length", "dissipation".
void append_limit_checks(const Case& c, const CaseRun& run, std::vector<ConstraintCheck>& out);

}  // namespace oxystrat
