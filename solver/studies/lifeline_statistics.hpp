// Inside the lifelines (solver/studies/lifelines.hpp): the result from what all cells added up:
// occupancy and residence per zone, per field the time outside, the excursions, their rates and
// histograms, and the passages between regimes. Not a public interface.
#pragma once

#include <vector>

#include "solver/studies/lifeline_tally.hpp"
#include "solver/studies/lifelines.hpp"

namespace oxystrat::lifelines_detail {

//! Fills the statistics of `res`, whose cells and duration_s are set, from the totals of all cells
//! (their lists are moved out). `threads` share the histograms.
void collect_statistics(LifelineResult& res, Totals& totals, const std::vector<LifelineField>& fields,
                        const LifelineRegimes& regimes, const LifelineOptions& opts, int threads);

}  // namespace oxystrat::lifelines_detail
