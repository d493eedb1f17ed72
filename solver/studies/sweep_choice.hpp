// Honest answers from a sweep: which point is chosen and why it cannot be dominated, which
// constraints each infeasible point breaks, and whether the choice sits on the edge of the swept
// range (then the best point may lie outside it).
#pragma once

#include <string>
#include <vector>

#include "solver/studies/sweep.hpp"

namespace oxystrat {

//! The feasible point with the least `objective` (NAME, or NAME:max for the largest); -1 if none.
//! Ties, objective values equal within 1e-9 relative, go to the higher DO min, then to the lower
//! total power, then to the lower index. So no feasible point is at least as good on both the
//! objective and DO min and better on one: the choice is on the feasible Pareto front of (objective,
//! DO min) by construction. Throws CaseError when no solved point carries the value NAME (a
//! misspelt name, or operating_cost without a [prices] table).
int choose_objective_point(const std::vector<PointResult>& results, const std::string& objective);

//! Throws CaseError, before any point runs, when the objective names a value the base case cannot
//! have: a cost without a [prices] table, a cooling value without a [cooling] table.
void check_objective_applies(const Case& base, const std::string& objective);

//! The names of the constraints a solved point breaks, "; "-separated (empty when it breaks none).
std::string broken_constraints(const std::vector<ConstraintCheck>& checks);
inline std::string broken_constraints(const PointResult& r) { return broken_constraints(r.checks); }

//! The varied keys whose smallest or largest swept value the point has (axes with one value
//! excluded): a chosen point there may have a better neighbour outside the range.
std::vector<std::string> edge_axes(const SweepPlan& plan, size_t point);

}  // namespace oxystrat
