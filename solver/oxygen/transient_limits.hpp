// What a transient run may ask for, checked before anything is built: a step long enough to make
// progress, and a run whose steps, zone-steps and stored fields fit a workstation. Without these
// `--step "1e-9 s"` ran for ever and `--fixed-step --step "1 ms"` for an hour meant millions of
// Newton solves and a trace of gigabytes.
#pragma once

#include "input/case.hpp"
#include "solver/oxygen/transient.hpp"

namespace oxystrat {

//! Shortest step [s]: far below the fastest time scale of the model (the controller acts every
//! 0.1 s at the least, the liquid in a zone is renewed in tenths of a second at the impeller).
inline constexpr double min_transient_step_s = 1e-3;
//! Most steps: each is a row of the trace kept in memory (some 200 bytes) and of trace.csv.
inline constexpr double max_transient_steps = 1e6;
//! Most zone-steps (steps x zones): about a microsecond each, so some three hours at this limit.
inline constexpr double max_transient_zone_steps = 1e10;
//! Most bytes of stored fields (output times x zones x 8 fields x 8 bytes).
inline constexpr double max_transient_field_bytes = 8.0 * 1024 * 1024 * 1024;

//! Throws CaseError naming the option (--step, --duration, --interval) when the step is shorter
//! than min_transient_step_s, or the run needs more steps (at least duration / step, adaptive or
//! not), zone-steps or field storage than the limits above. Builds the case's zone geometry.
void check_transient_size(const Case& c, const TransientOptions& o);

}  // namespace oxystrat
