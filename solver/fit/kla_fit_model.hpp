// Inside the kLa fit (solver/fit/kla_fit.hpp): its unknowns, the model of the probe reading with
// its residuals and analytic Jacobian, and one bounded Levenberg-Marquardt run from a start.
// Shared by the start values (kla_fit_start) and the fit itself; not a public interface.
#pragma once

#include <Eigen/Dense>
#include <array>
#include <limits>
#include <string>
#include <vector>

#include "solver/fit/do_trace.hpp"

namespace oxystrat::kla_fit_detail {

inline constexpr double kInf = std::numeric_limits<double>::infinity();
inline constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The unknowns, all in SI; the same layout whether fitted or held.
enum Param { kKla = 0, kCstar, kC0, kTau, kT0, kParams };
using Vec = Eigen::Matrix<double, kParams, 1>;
inline const std::array<const char*, kParams> kParamNames{"kLa", "C*", "C0", "tau_p", "t0"};

// The probe reads C0 until t0, then C_inf - (C_inf - C0) g(t - t0), C_inf = C* - OUR/kLa.
struct Model {
  const std::vector<double>& t;
  const std::vector<double>& y;
  double uptake;

  double steady(const Vec& p) const { return p[kCstar] - uptake / p[kKla]; }

  // Residuals (model - measured) and, when J is given, d r / d p for all parameters.
  void evaluate(const Vec& p, Eigen::VectorXd& r, Eigen::MatrixXd* J) const;
  double cost(const Vec& p) const;
};

// The fit of the model by bounded Levenberg-Marquardt (solver/fit/bounded_least_squares.hpp).
struct LmResult {
  Vec p;
  double cost = kInf;
  int iterations = 0;
  bool converged = false;
};

LmResult levenberg_marquardt(const Model& m, const Vec& start, const std::array<bool, kParams>& free, const Vec& lo,
                             const Vec& hi, int max_iterations);

int free_count(const std::array<bool, kParams>& free);

// Messages print DO in the unit of the trace's kind.
std::string scale_unit(DoScale s);
// SI value of the trace scale -> the number printed with scale_unit.
double shown(DoScale s, double v);

}  // namespace oxystrat::kla_fit_detail
