#include "solver/studies/limit_constraints.hpp"

#include <fmt/format.h>

namespace oxystrat {

void append_limit_checks(const Case& c, const CaseRun& run, std::vector<ConstraintCheck>& out) {
  const auto& k = c.constraints;
  const auto& q = run.limits.heat;
  const auto& s = run.limits.shear;
  if (k.max_heat_w) {
    out.push_back({"heat", q.required_w <= *k.max_heat_w,
                   fmt::format("cooling duty {:.4g} kW (limit {:.4g} kW)", q.required_w / 1e3, *k.max_heat_w / 1e3)});
  }
  if (k.min_cooling_margin && q.available_w) {
    const double needed = q.required_w * (1.0 + *k.min_cooling_margin);
    out.push_back({"cooling", *q.available_w >= needed,
                   fmt::format("cooling available {:.4g} kW for a duty of {:.4g} kW (needed with {:.0f} % margin: "
                               "{:.4g} kW)",
                               *q.available_w / 1e3, q.required_w / 1e3, 100 * *k.min_cooling_margin, needed / 1e3)});
  }
  const std::string where = s.worst_impeller >= 0 ? fmt::format(" (discharge of impeller {})", s.worst_impeller) : "";
  if (k.min_kolmogorov_length_m) {
    out.push_back({"kolmogorov_length", s.kolmogorov_min_m >= *k.min_kolmogorov_length_m,
                   fmt::format("smallest Kolmogorov length {:.3g} um{} (limit {:.3g} um)", 1e6 * s.kolmogorov_min_m,
                               where, 1e6 * *k.min_kolmogorov_length_m)});
  }
  if (k.max_dissipation_w_kg) {
    out.push_back({"dissipation", s.epsilon_max_w_kg <= *k.max_dissipation_w_kg,
                   fmt::format("largest dissipation {:.3g} W/kg{} (limit {:.3g} W/kg)", s.epsilon_max_w_kg, where,
                               *k.max_dissipation_w_kg)});
  }
}

}  // namespace oxystrat
