// Several cases side by side (`oxystrat compare`): each through the whole chain, with its mixing
// time, summary values, uncertainty quantiles and constraint checks. The cases are independent and
// run in parallel; results are in case order and the same for any thread count.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/oxygen/summary_values.hpp"
#include "solver/studies/constraints.hpp"

namespace oxystrat {

struct CaseComparisonOptions {
  bool with_mixing = true;       //!< compute the tracer mixing time theta95 of each case
  int uncertainty_samples = 0;   //!< > 0: P10/P50/P90 of each case from this many samples
  std::uint64_t seed = 1;        //!< of the uncertainty samples
  int threads = 0;               //!< cases run at once; 0: OpenMP default
  //! Called, one call at a time, as each case's run is done (a progress display).
  std::function<void()> on_case_done;
};

struct ComparedRun {
  CaseRun run;
  std::optional<double> theta95_s;   //!< tracer mixing time [s]; empty without mixing
  std::vector<SummaryValue> values;  //!< the summary values, then the uncertainty quantiles
  std::vector<ConstraintCheck> checks;
  bool feasible = false;
};

//! Runs every case of `cases` (each with its own overrides already applied) and evaluates it.
std::vector<ComparedRun> compare_cases(const std::vector<LoadedCase>& cases, const CaseComparisonOptions& opts);

}  // namespace oxystrat
