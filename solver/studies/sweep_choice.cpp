#include "solver/studies/sweep_choice.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <optional>

#include "input/errors.hpp"

namespace oxystrat {
namespace {

std::optional<double> value_of(const PointResult& r, const std::string& name) {
  for (const auto& v : r.values) {
    if (v.name == name) return v.value;
  }
  return std::nullopt;
}

double finite_or(std::optional<double> v, double fallback) { return v && std::isfinite(*v) ? *v : fallback; }

// The value an objective names; a name of an earlier release is taken in its current spelling.
std::string objective_name(const std::string& objective) {
  const bool maximise = objective.size() > 4 && objective.compare(objective.size() - 4, 4, ":max") == 0;
  return current_summary_name(maximise ? objective.substr(0, objective.size() - 4) : objective);
}

bool is_maximise(const std::string& objective) {
  return objective.size() > 4 && objective.compare(objective.size() - 4, 4, ":max") == 0;
}

}  // namespace

void check_objective_applies(const Case& base, const std::string& objective) {
  const std::string name = objective_name(objective);
  if ((name == "operating_cost" || name == "cost_per_kg_o2") && !base.prices.given) {
    throw CaseError(fmt::format("--objective {}: the case has no [prices] table, so nothing is priced; add one, e.g. "
                                "[prices] currency = \"EUR\", electricity = \"0.12 EUR/kWh\"",
                                objective));
  }
  if ((name == "cooling_available" || name == "cooling_margin" || name == "max_biomass_heat" ||
       name == "max_our_heat") &&
      !base.cooling.given) {
    throw CaseError(fmt::format("--objective {}: the case has no [cooling] table; add one (docs/case-reference.md)",
                                objective));
  }
}

int choose_objective_point(const std::vector<PointResult>& results, const std::string& objective) {
  const bool maximise = is_maximise(objective);
  const std::string name = objective_name(objective);
  const PointResult* any = nullptr;
  for (const auto& r : results) {
    if (!r.ok) continue;
    if (value_of(r, name)) {
      any = nullptr;
      break;
    }
    any = &r;
  }
  if (any != nullptr) {
    std::string names;
    for (const auto& v : any->values) names += (names.empty() ? "" : ", ") + v.name;
    throw CaseError(fmt::format("--objective {}: no point has a value '{}'{}; the names are: {}", objective, name,
                                name == "operating_cost" || name == "cost_per_kg_o2"
                                    ? " (costs need a [prices] table in the case)"
                                    : name.rfind("cooling", 0) == 0 || name.rfind("max_biomass_heat", 0) == 0
                                        ? " (cooling values need a [cooling] table in the case)"
                                        : "",
                                names));
  }
  const double sign = maximise ? -1.0 : 1.0;
  int best = -1;
  double best_v = 0.0, best_do = 0.0, best_power = 0.0;
  for (size_t i = 0; i < results.size(); ++i) {
    const auto& r = results[i];
    if (!r.ok || !r.feasible) continue;
    const auto v = value_of(r, name);
    if (!v || !std::isfinite(*v)) continue;
    const double obj = sign * *v;
    const double dmin = finite_or(value_of(r, "do_min"), -1e300);
    const double power = finite_or(value_of(r, "total_power"), finite_or(value_of(r, "power_gassed"), 1e300));
    bool better = best < 0;
    if (!better) {
      const double tol = 1e-9 * std::max(std::abs(obj), std::abs(best_v));
      if (obj < best_v - tol) {
        better = true;
      } else if (obj <= best_v + tol) {  // a tie on the objective: higher DO min, then less power
        better = dmin > best_do || (dmin == best_do && power < best_power);
      }
    }
    if (better) best = static_cast<int>(i), best_v = obj, best_do = dmin, best_power = power;
  }
  return best;
}

std::string broken_constraints(const std::vector<ConstraintCheck>& checks) {
  std::string s;
  for (const auto& k : checks) {
    if (!k.satisfied) s += (s.empty() ? "" : "; ") + k.name;
  }
  return s;
}

std::vector<std::string> edge_axes(const SweepPlan& plan, size_t point) {
  std::vector<std::string> out;
  for (size_t d = 0; d < plan.axes.size(); ++d) {
    double lo = plan.points.front()[d], hi = lo;
    for (const auto& p : plan.points) lo = std::min(lo, p[d]), hi = std::max(hi, p[d]);
    if (hi <= lo) continue;  // one value: nothing to extend
    const double x = plan.points[point][d];
    if (x <= lo || x >= hi) out.push_back(plan.axes[d].key);
  }
  return out;
}

}  // namespace oxystrat
