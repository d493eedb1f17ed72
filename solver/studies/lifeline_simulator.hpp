// Inside the lifelines (solver/studies/lifelines.hpp): the cells followed through the chain, the
// hot loop (docs/lifelines-speed.md). Not a public interface.
#pragma once

#include <vector>

#include "solver/studies/lifeline_chain.hpp"
#include "solver/studies/lifeline_tally.hpp"
#include "solver/studies/lifelines.hpp"

namespace oxystrat::lifelines_detail {

//! Follows `cells` cells for opts.duration_s on `threads` threads, adding up into `out` (sized for
//! the chain's zones, `n_fields` fields, `n_regimes` regimes and the cells) and writing the path of
//! cell c, for c < paths.size(), into paths[c]. Cell c draws from its own generator seeded by
//! (opts.seed, c); blocks of cells are merged in cell order.
void follow_lifelines(const Chain& chain, int n_fields, int n_regimes, const LifelineOptions& opts, int cells,
                      int threads, Totals& out, std::vector<Trajectory>& paths);

}  // namespace oxystrat::lifelines_detail
