// Inside the kLa fit (solver/fit/kla_fit.hpp): which unknowns are free, their bounds, and the
// start values, derived from a log-linear fit of the 10-90 % part of the rise. Not a public
// interface.
#pragma once

#include <array>
#include <vector>

#include "solver/fit/do_trace.hpp"
#include "solver/fit/kla_fit.hpp"
#include "solver/fit/kla_fit_model.hpp"

namespace oxystrat::kla_fit_detail {

struct Setup {
  std::array<bool, kParams> free{};
  Vec lo, hi;
  std::vector<Vec> starts;
};

// Checks the trace rises and derives bounds and start values from a log-linear fit of the rise.
// Throws CaseError for a trace that is too short or does not rise.
Setup prepare(const DoTrace& tr, const KlaFitOptions& o);

}  // namespace oxystrat::kla_fit_detail
