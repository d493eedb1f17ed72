#include "solver/fit/kla_fit_model.hpp"

#include <algorithm>

#include "solver/fit/bounded_least_squares.hpp"
#include "solver/fit/probe_response.hpp"

namespace oxystrat::kla_fit_detail {

void Model::evaluate(const Vec& p, Eigen::VectorXd& r, Eigen::MatrixXd* J) const {
  const size_t n = t.size();
  r.resize(static_cast<Eigen::Index>(n));
  if (J) J->setZero(static_cast<Eigen::Index>(n), kParams);
  const double cinf = steady(p);
  const double amp = cinf - p[kC0];
  for (size_t i = 0; i < n; ++i) {
    const auto k = static_cast<Eigen::Index>(i);
    const double s = t[i] - p[kT0];
    const StepResponse g = probe_step_response_derivatives(s, p[kKla], p[kTau]);
    r[k] = cinf - amp * g.g - y[i];
    if (!J) continue;
    (*J)(k, kKla) = uptake / (p[kKla] * p[kKla]) * (1.0 - g.g) - amp * g.d_kla;
    (*J)(k, kCstar) = 1.0 - g.g;
    (*J)(k, kC0) = g.g;
    (*J)(k, kTau) = -amp * g.d_tau;
    (*J)(k, kT0) = amp * g.d_s;
  }
}

double Model::cost(const Vec& p) const {
  Eigen::VectorXd r;
  evaluate(p, r, nullptr);
  return 0.5 * r.squaredNorm();
}

LmResult levenberg_marquardt(const Model& m, const Vec& start, const std::array<bool, kParams>& free, const Vec& lo,
                             const Vec& hi, int max_iterations) {
  const Residuals f = [&m](const Eigen::VectorXd& p, Eigen::VectorXd& r, Eigen::MatrixXd* J) { m.evaluate(p, r, J); };
  const auto r = bounded_levenberg_marquardt(f, start, std::vector<bool>(free.begin(), free.end()), lo, hi, max_iterations);
  return {r.p, r.cost, r.iterations, r.converged};
}

int free_count(const std::array<bool, kParams>& free) { return static_cast<int>(std::count(free.begin(), free.end(), true)); }

std::string scale_unit(DoScale s) { return s == DoScale::saturation ? "%" : "mmol/L"; }

double shown(DoScale s, double v) { return s == DoScale::saturation ? 100.0 * v : v; }

}  // namespace oxystrat::kla_fit_detail
