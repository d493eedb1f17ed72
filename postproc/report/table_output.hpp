// Tables of summary values: compare.csv / sweep.csv, their HDF5 groups, the terminal table. (The
// sweep journal lives in postproc/io/sweep_journal.hpp, included here for older callers.)
#pragma once

#include <map>
#include <string>
#include <vector>

#include "postproc/io/h5_writer.hpp"
#include "postproc/io/sweep_journal.hpp"
#include "solver/studies/sweep.hpp"

namespace oxystrat {

//! Quantities down, cases across; units in the second column. A value that applies to some cases
//! only has its row, empty where it does not apply. `violated` (optional): per case, the names of
//! the constraints it breaks ("" for none), as the last row.
void write_compare_csv(const std::string& path, const std::vector<std::string>& names,
                       const std::vector<std::vector<SummaryValue>>& values,
                       const std::vector<std::string>& violated = {});
std::string compare_text(const std::vector<std::string>& names, const std::vector<std::vector<SummaryValue>>& values,
                         const std::vector<bool>& feasible, const std::vector<std::string>& violated = {});
void write_compare_h5(H5Writer& h5, const std::vector<std::string>& names,
                      const std::vector<std::vector<SummaryValue>>& values, const std::vector<bool>& feasible,
                      const std::vector<std::string>& violated = {});

//! One row per point: varied keys, status, every summary value (units in the header), the
//! constraints an infeasible point breaks.
void write_sweep_csv(const std::string& path, const SweepPlan& plan, const std::vector<PointResult>& results,
                     const std::vector<bool>& pareto, int chosen);
void write_sweep_h5(H5Writer& h5, const SweepPlan& plan, const std::vector<PointResult>& results,
                    const std::vector<bool>& pareto, int chosen, const std::string& objective,
                    const std::vector<std::string>& chosen_cautions);

}  // namespace oxystrat
