#include "solver/fit/kla_verdict.hpp"

#include <fmt/format.h>

#include <cmath>

#include "input/errors.hpp"

namespace oxystrat {

void require_determined_kla(const DoTrace& tr, const KlaFitOptions& o, const KlaFitResult& fit) {
  const int pct = static_cast<int>(std::lround(100.0 * o.confidence));
  const std::string head = fmt::format("{}: kLa is not determined by this trace (fit: {:.4g} 1/h)", tr.file_name,
                                       3600.0 * fit.kla_1_s);
  const bool cstar_fitted = !o.saturation.has_value();
  const char* reduce = cstar_fitted ? "give --saturation (C*) and, if known, --probe-lag"
                                    : "give --probe-lag (the probe's measured time constant)";
  if (!std::isfinite(fit.kla_ci_low_1_s) || !std::isfinite(fit.kla_ci_high_1_s)) {
    throw SolveError(fmt::format("{}: its {} % interval cannot be computed, because the trace cannot separate it from "
                                 "the other unknowns ({}); {}, or record a longer rise",
                                 head, pct, fmt::join(fit.free_parameters, ", "), reduce));
  }
  const double half_width = 0.5 * (fit.kla_ci_high_1_s - fit.kla_ci_low_1_s);
  if (fit.kla_ci_low_1_s <= 0.0 || half_width >= fit.kla_1_s) {
    throw SolveError(fmt::format("{}: its {} % interval {:.4g} to {:.4g} 1/h reaches zero; record more points over "
                                 "the whole rise, or {}",
                                 head, pct, 3600.0 * fit.kla_ci_low_1_s, 3600.0 * fit.kla_ci_high_1_s, reduce));
  }
  if (cstar_fitted && fit.steady != fit.c0) {
    const double reached = (tr.value.back() - fit.c0) / (fit.steady - fit.c0);
    if (reached < min_rise_reached_with_fitted_cstar) {
      throw SolveError(fmt::format(
          "{}: the trace ends at {:.0f} % of the rise, where the DO still climbs almost in a straight line whose slope "
          "fixes only kLa (C* - C0), not kLa and C* apart (at least {:.0f} % is needed with C* fitted); record until "
          "the DO levels off, or give --saturation",
          head, 100.0 * reached, 100.0 * min_rise_reached_with_fitted_cstar));
    }
  }
}

}  // namespace oxystrat
