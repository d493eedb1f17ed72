#include "solver/studies/compare.hpp"

#include <omp.h>

#include "solver/flow/mixing_time.hpp"
#include "solver/studies/sweep.hpp"

namespace oxystrat {

std::vector<ComparedRun> compare_cases(const std::vector<LoadedCase>& cases, const CaseComparisonOptions& opts) {
  std::vector<ComparedRun> out(cases.size());
  const int threads = opts.threads > 0 ? opts.threads : omp_get_max_threads();
  // Cases are independent: run them in parallel; results land by index.
#pragma omp parallel for schedule(dynamic, 1) num_threads(threads)
  for (long i = 0; i < static_cast<long>(cases.size()); ++i) {
    ComparedRun& r = out[static_cast<size_t>(i)];
    r.run = run_case(cases[static_cast<size_t>(i)].data);
    if (opts.with_mixing) r.theta95_s = tracer_mixing_time(r.run.net, r.run.hydro, {}).theta_s;
    if (opts.on_case_done) {
#pragma omp critical(oxystrat_compare_done)
      opts.on_case_done();
    }
  }
  // The uncertainty samples run their own parallel loops: one case after the other.
  for (size_t i = 0; i < cases.size(); ++i) {
    const Case& c = cases[i].data;
    ComparedRun& r = out[i];
    r.values = summary_values(c, r.run, r.theta95_s);
    if (opts.uncertainty_samples > 0) append_uncertainty_values(c, opts.uncertainty_samples, opts.seed, opts.with_mixing, r.values);
    r.checks = check_constraints(c, r.run);
    r.feasible = feasible(r.checks);
  }
  return out;
}

}  // namespace oxystrat
