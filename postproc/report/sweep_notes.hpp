// What a sweep's answer rests on, in words: which constraints the infeasible points break, and
// whether the chosen point sits on the edge of the swept range.
#pragma once

#include <string>
#include <vector>

#include "solver/studies/sweep.hpp"

namespace oxystrat {

//! Terminal lines (empty when there is nothing to say).
std::string sweep_honesty_text(const SweepPlan& plan, const std::vector<PointResult>& results, int chosen);

//! The same as HTML paragraphs for the report.
std::string sweep_honesty_html(const SweepPlan& plan, const std::vector<PointResult>& results, int chosen);

}  // namespace oxystrat
