// Whether a kLa fit determines kLa at all. A fit can converge and still say nothing: on the start
// of a rise the DO climbs in a near straight line whose slope is kLa (C* - C0), so with C* fitted
// kLa and C* trade off freely (an 11-point trace ending at 10 % of the rise gave kLa 193 1/h for
// a true 108 1/h, C* somewhere in -394 to 632 %); with a fitted lag near kLa tau_p = 1 the two
// rates cannot be told apart. Such a fit is refused, not reported with a warning.
#pragma once

#include "solver/fit/kla_fit.hpp"

namespace oxystrat {

//! Least share of the rise (from C0 to the level approached) that a trace must cover when C* is
//! fitted: one half-time of the transfer. Below it the curvature that separates kLa from C* is
//! within a few noise widths (our own criterion).
inline constexpr double min_rise_reached_with_fitted_cstar = 0.5;

//! Throws SolveError (naming the trace and what to do) when kLa is not determined: its interval
//! cannot be computed, reaches zero (half-width at least kLa), or C* was fitted on a trace that
//! ends before min_rise_reached_with_fitted_cstar of the rise.
void require_determined_kla(const DoTrace& trace, const KlaFitOptions& options, const KlaFitResult& fit);

}  // namespace oxystrat
