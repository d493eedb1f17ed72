#include "solver/studies/validation.hpp"

#include <algorithm>
#include <cmath>
#include <exception>

namespace oxystrat {

const std::vector<ValidationCheck>& validation_checks() {
  static const std::vector<ValidationCheck> checks = [] {
    auto v = detail::verification_checks();
    auto m = detail::measured_checks();
    v.insert(v.end(), std::make_move_iterator(m.begin()), std::make_move_iterator(m.end()));
    // Verification and calibration first, validation after: the report's two sections.
    std::stable_partition(v.begin(), v.end(), [](const ValidationCheck& c) { return c.kind != CheckKind::validation; });
    return v;
  }();
  return checks;
}

ValidationResult run_check(const ValidationCheck& c) {
  ValidationResult r;
  r.check = &c;
  try {
    r.model = c.model();
    r.computed = std::isfinite(r.model);
    if (!r.computed) r.failure = "the model gave no finite value";
  } catch (const std::exception& e) {
    r.failure = e.what();
  }
  if (!r.computed) return r;
  r.error = c.relative ? (r.model - c.reference) / c.reference : r.model - c.reference;
  r.passed = std::abs(r.error) <= c.tolerance;
  return r;
}

std::vector<ValidationStatistics> validation_statistics(const std::vector<ValidationResult>& results) {
  std::vector<ValidationStatistics> stats;
  for (const auto& r : results) {
    if (r.check->kind != CheckKind::validation || !r.check->relative || !r.computed) continue;
    auto it = std::find_if(stats.begin(), stats.end(), [&](const auto& s) { return s.group == r.check->group; });
    if (it == stats.end()) it = stats.insert(stats.end(), ValidationStatistics{r.check->group});
    it->rows += 1;
    it->inside_band += r.passed ? 1 : 0;
    it->mean_error += r.error;
    it->mean_abs_error += std::abs(r.error);
    it->max_abs_error = std::max(it->max_abs_error, std::abs(r.error));
  }
  for (auto& s : stats) {
    s.mean_error /= s.rows;
    s.mean_abs_error /= s.rows;
  }
  return stats;
}

namespace detail {

ValidationCheck make_check(CheckKind kind, std::string group, std::string quantity, std::string source,
                           std::string unit, double reference, double tolerance, bool relative, std::string why,
                           std::function<double()> model) {
  ValidationCheck c;
  c.kind = kind;
  c.group = std::move(group);
  c.quantity = std::move(quantity);
  c.source = std::move(source);
  c.unit = std::move(unit);
  c.reference = reference;
  c.tolerance = tolerance;
  c.relative = relative;
  c.why = std::move(why);
  c.model = std::move(model);
  return c;
}

}  // namespace detail

const char* kind_name(CheckKind k) {
  switch (k) {
    case CheckKind::verification: return "verification";
    case CheckKind::calibration: return "calibration";
    case CheckKind::validation: return "validation";
  }
  return "?";
}

}  // namespace oxystrat
