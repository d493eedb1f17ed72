#include "solver/oxygen/transient_limits.hpp"

#include <fmt/format.h>

#include <cmath>

#include "input/errors.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

void check_transient_size(const Case& c, const TransientOptions& o) {
  if (!(o.step_s >= min_transient_step_s)) {
    throw CaseError(fmt::format("--step {:g} s: the step must be at least {:g} s (1 ms)", o.step_s, min_transient_step_s));
  }
  if (!(o.duration_s > 0.0) || !(o.output_interval_s > 0.0)) {
    throw CaseError(fmt::format("--duration {:g} s, --interval {:g} s: both must be more than 0 s", o.duration_s,
                                o.output_interval_s));
  }
  const double steps = std::ceil(o.duration_s / o.step_s);
  const double zones = build_zone_geometry(c).size();
  const char* advice = o.adaptive ? "a longer --step (the largest step; the error control shortens it where needed)"
                                  : "a longer --step, or drop --fixed-step and let the error control choose the steps";
  if (steps > max_transient_steps) {
    throw CaseError(fmt::format("--step {:g} s over --duration {:g} s needs at least {:.3g} steps; at most {:.0f} are "
                                "supported (each is a row of the trace); choose {}",
                                o.step_s, o.duration_s, steps, max_transient_steps, advice));
  }
  if (steps * zones > max_transient_zone_steps) {
    throw CaseError(fmt::format("--step {:g} s over --duration {:g} s on {:.0f} zones needs at least {:.3g} "
                                "zone-steps, some {:.1f} h; at most {:.0e} are supported; choose {} or a coarser grid",
                                o.step_s, o.duration_s, zones, steps * zones, steps * zones * 1e-6 / 3600.0,
                                max_transient_zone_steps, advice));
  }
  const double frames = std::floor(o.duration_s / o.output_interval_s) + 1.0;
  const double bytes = frames * zones * 8.0 * 8.0;
  if (bytes > max_transient_field_bytes) {
    throw CaseError(fmt::format("--interval {:g} s over --duration {:g} s stores {:.0f} field outputs of {:.0f} zones, "
                                "about {:.3g} GB; at most {:.3g} GB; choose a longer --interval or a coarser grid",
                                o.output_interval_s, o.duration_s, frames, zones, bytes / 1e9,
                                max_transient_field_bytes / 1e9));
  }
}

}  // namespace oxystrat
