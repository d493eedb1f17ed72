#include "solver/fit/kla_fit.hpp"

#include <fmt/format.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <exception>

#include "input/errors.hpp"
#include "solver/fit/kla_fit_model.hpp"
#include "solver/fit/kla_fit_start.hpp"
#include "solver/fit/kla_verdict.hpp"
#include "solver/fit/probe_response.hpp"
#include "solver/fit/student_t.hpp"

namespace oxystrat {

using namespace kla_fit_detail;

namespace {

std::string format_interval(double lo, double hi, const char* unit) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) return "undetermined";
  return fmt::format("{:.3g} to {:.3g} {}", lo, hi, unit);
}

// Variances of the parameters in `use` (indices) at p: the diagonal of s^2 (J^T J)^-1, through
// the SVD of the column-scaled Jacobian. Directions with singular values below 1e-8 of the
// largest are numerically undetermined (a short lag sampled coarsely is a dead time, the same
// column as the step time): parameters with a share in them get an infinite variance, the others
// keep theirs.
Eigen::VectorXd variances(const Model& m, const Vec& p, const std::vector<int>& use, double s2) {
  Eigen::VectorXd r;
  Eigen::MatrixXd Jfull;
  m.evaluate(p, r, &Jfull);
  const auto k = static_cast<Eigen::Index>(use.size());
  Eigen::MatrixXd J(Jfull.rows(), k);
  Eigen::VectorXd scale(k);
  for (Eigen::Index j = 0; j < k; ++j) {
    J.col(j) = Jfull.col(use[static_cast<size_t>(j)]);
    scale[j] = J.col(j).norm() > 0.0 ? J.col(j).norm() : 1.0;
    J.col(j) /= scale[j];
  }
  Eigen::VectorXd var = Eigen::VectorXd::Zero(k);
  if (k == 0) return var;
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(J, Eigen::ComputeThinV);
  const auto& sv = svd.singularValues();
  const Eigen::MatrixXd V = svd.matrixV();
  for (Eigen::Index j = 0; j < k; ++j) {
    double in_null = 0.0;
    for (Eigen::Index i = 0; i < k; ++i) {
      if (sv[i] > 1e-8 * sv[0]) {
        var[j] += V(j, i) * V(j, i) / (sv[i] * sv[i]);
      } else {
        in_null += V(j, i) * V(j, i);
      }
    }
    var[j] = in_null > 1e-6 ? kInf : var[j] * s2 / (scale[j] * scale[j]);
  }
  return var;
}

}  // namespace

std::vector<double> kla_model_values(const KlaFitResult& r, const std::vector<double>& time_s) {
  std::vector<double> out;
  out.reserve(time_s.size());
  for (double t : time_s) {
    out.push_back(r.steady - (r.steady - r.c0) * probe_step_response(t - r.step_time_s, r.kla_1_s, r.probe_lag_s));
  }
  return out;
}

KlaFitResult fit_kla(const DoTrace& tr, const KlaFitOptions& o) {
  if (o.lag_mode == ProbeLagMode::fixed && !(o.probe_lag_s >= 0.0)) {
    throw CaseError(fmt::format("probe lag {} s: must be zero or positive", o.probe_lag_s));
  }
  if (!(o.uptake >= 0.0)) throw CaseError("the oxygen uptake rate must be zero or positive");
  Setup setup = prepare(tr, o);
  const Model model{tr.time_s, tr.value, o.uptake};

  int total_iterations = 0;
  auto best_of_starts = [&](const Setup& su) {
    LmResult best;
    for (const auto& start : su.starts) {
      const auto r = levenberg_marquardt(model, start, su.free, su.lo, su.hi, o.max_iterations);
      total_iterations += r.iterations;
      if (r.converged && std::isfinite(r.cost) && (!best.converged || r.cost < best.cost)) best = r;
    }
    return best;
  };
  LmResult best = best_of_starts(setup);
  // Without a lag a step before the second row is the same curve as a step on the first row
  // with another C0, except that the first row alone would then set C0: hold t0 on the first row.
  bool step_held = false;
  if (o.lag_mode == ProbeLagMode::none && best.converged && best.p[kT0] < tr.time_s[1]) {
    setup.free[kT0] = false;
    setup.starts = {best.p};
    setup.starts.front()[kT0] = tr.time_s.front();
    best = best_of_starts(setup);
    step_held = true;
  }
  const auto unit = scale_unit(tr.scale);
  const size_t n = tr.time_s.size();
  if (!best.converged) {
    throw SolveError(fmt::format("{}: the kLa fit did not converge from {} start values ({} iterations); the trace "
                                 "may not be a single gassing-out rise: trim it to the rise after aeration resumes, "
                                 "or give --probe-lag and --saturation to reduce the unknowns",
                                 tr.file_name, setup.starts.size(), total_iterations));
  }
  Vec p = best.p;
  const bool symmetric = o.uptake == 0.0 || setup.free[kCstar];
  // kLa and 1/tau_p enter the response symmetrically: take the probe as the faster process.
  if (o.lag_mode == ProbeLagMode::fitted && symmetric && p[kTau] * p[kKla] > 1.0) {
    const double cinf = model.steady(p);
    const double a = 1.0 / p[kTau];
    p[kTau] = 1.0 / p[kKla];
    p[kKla] = a;
    if (setup.free[kCstar]) p[kCstar] = cinf + o.uptake / a;
  }
  const double cinf = model.steady(p);
  if (!(p[kKla] > 1e-5 * setup.starts.front()[kKla]) || !(cinf > p[kC0])) {
    throw SolveError(fmt::format("{}: the kLa fit ended at kLa = {:.3g} 1/s with the DO heading from {:.4g} to "
                                 "{:.4g} {}: not a gassing-out rise; trim the trace to the rise after aeration resumes",
                                 tr.file_name, p[kKla], shown(tr.scale, p[kC0]), shown(tr.scale, cinf), unit));
  }

  KlaFitResult res;
  res.points = static_cast<int>(n);
  res.iterations = total_iterations;
  res.kla_1_s = p[kKla];
  res.probe_lag_s = o.lag_mode == ProbeLagMode::none ? 0.0 : p[kTau];
  res.cstar = p[kCstar];
  res.c0 = p[kC0];
  res.steady = cinf;
  res.step_time_s = p[kT0];
  res.kla_tau = res.kla_1_s * res.probe_lag_s;
  Eigen::VectorXd r;
  model.evaluate(p, r, nullptr);
  res.residual.assign(r.data(), r.data() + r.size());
  res.fitted.resize(n);
  for (size_t i = 0; i < n; ++i) res.fitted[i] = tr.value[i] + res.residual[i];
  res.rms = std::sqrt(r.squaredNorm() / static_cast<double>(n));

  // Without a lag a step time on the first row is exactly interchangeable with C0: held there.
  res.step_at_first_row = step_held || (o.lag_mode == ProbeLagMode::none && p[kT0] <= setup.lo[kT0]);
  std::vector<int> use;
  for (int j = 0; j < kParams; ++j) {
    if (!setup.free[static_cast<size_t>(j)]) continue;
    if (j == kT0 && res.step_at_first_row) continue;
    use.push_back(j);
    res.free_parameters.push_back(kParamNames[static_cast<size_t>(j)]);
  }
  res.parameters = static_cast<int>(use.size());
  const int dof = res.points - res.parameters;
  if (dof < 1) {
    throw CaseError(fmt::format("{}: too few points: {} rows for {} unknowns", tr.file_name, n, res.parameters));
  }
  const double s2 = r.squaredNorm() / dof;
  res.t_quantile = student_t_quantile(0.5 + 0.5 * o.confidence, dof);
  const Eigen::VectorXd var = variances(model, p, use, s2);
  auto half_width = [&](int param) {
    for (size_t j = 0; j < use.size(); ++j) {
      if (use[j] == param) {
        const double v = var[static_cast<Eigen::Index>(j)];
        return std::isfinite(v) ? res.t_quantile * std::sqrt(std::max(0.0, v)) : kInf;
      }
    }
    return 0.0;  // held, not fitted
  };
  const double hk = half_width(kKla), ht = half_width(kTau), hc = half_width(kCstar);
  res.kla_ci_low_1_s = std::isfinite(hk) ? std::max(0.0, res.kla_1_s - hk) : -kInf;
  res.kla_ci_high_1_s = res.kla_1_s + hk;
  res.probe_lag_ci_low_s = std::isfinite(ht) ? std::max(0.0, res.probe_lag_s - ht) : -kInf;
  res.probe_lag_ci_high_s = res.probe_lag_s + ht;
  res.cstar_ci_low = res.cstar - hc;
  res.cstar_ci_high = res.cstar + hc;
  if (!std::isfinite(hk)) res.kla_ci_low_1_s = kNaN, res.kla_ci_high_1_s = kNaN;
  if (!std::isfinite(ht)) res.probe_lag_ci_low_s = kNaN, res.probe_lag_ci_high_s = kNaN;
  if (!std::isfinite(hc)) res.cstar_ci_low = kNaN, res.cstar_ci_high = kNaN;

  // Warnings.
  const int pct = static_cast<int>(std::lround(100.0 * o.confidence));
  if (o.lag_mode == ProbeLagMode::none) {
    // Is there a lag the user did not allow for? Fit one to find out.
    KlaFitOptions with_lag = o;
    with_lag.lag_mode = ProbeLagMode::fitted;
    try {
      const Setup s_lag = prepare(tr, with_lag);
      LmResult b;
      for (const auto& start : s_lag.starts) {
        const auto rl = levenberg_marquardt(model, start, s_lag.free, s_lag.lo, s_lag.hi, o.max_iterations);
        if (rl.converged && (!b.converged || rl.cost < b.cost)) b = rl;
      }
      const int dof_lag = res.points - free_count(s_lag.free);
      if (b.converged && dof_lag >= 1) {
        double ka = b.p[kKla], tau = b.p[kTau];
        if (ka * tau > 1.0) {  // the same response with the roles swapped (see above)
          const double a_swapped = 1.0 / tau;
          tau = 1.0 / ka;
          ka = a_swapped;
        }
        // Significant when the lag model lowers the residual sum of squares by more than an
        // F-test at the same confidence allows for the extra unknowns (F(1, dof) = t^2).
        const double f_stat = (best.cost - b.cost) / (b.cost / dof_lag);
        const double f_crit = std::pow(student_t_quantile(0.5 + 0.5 * o.confidence, dof_lag), 2);
        if (ka * tau > 0.1 && f_stat > f_crit) {
          res.warnings.push_back(fmt::format(
              "no probe lag was fitted or given, but the trace shows one: a lag fit gives tau_p = {:.3g} s and kLa "
              "= {:.4g} 1/s, so kLa tau_p = {:.2f} > 0.1 and the no-lag kLa is biased low; use --probe-lag auto or "
              "give the measured lag",
              tau, ka, ka * tau));
        }
      }
    } catch (const std::exception&) {
      // The diagnostic is optional; the main fit stands.
    }
  }
  if (o.lag_mode == ProbeLagMode::fitted) {
    const bool poor = !std::isfinite(ht) || ht > 0.5 * res.probe_lag_s;
    if (poor) {
      res.warnings.push_back(fmt::format(
          "tau_p = {:.3g} s is poorly determined ({} % interval {}){}; measure the probe's response to a step "
          "between two solutions of known O2 and give it with --probe-lag",
          res.probe_lag_s, pct, format_interval(res.probe_lag_ci_low_s, res.probe_lag_ci_high_s, "s"),
          res.kla_tau > 0.1 ? ", and with kLa tau_p above 0.1 kLa depends on it" : ""));
    }
    if (res.kla_tau > 1.0) {
      // Only when C* and OUR are both given (otherwise the roles were swapped above).
      res.warnings.push_back(fmt::format(
          "kLa tau_p = {:.2f} > 1: the fitted probe is slower than the transfer it measures; check that the given "
          "C* and OUR fit the trace (C* - OUR/kLa is the level it approaches), or give the measured lag with "
          "--probe-lag",
          res.kla_tau));
    } else if (res.kla_tau > 0.5) {
      res.warnings.push_back(fmt::format(
          "kLa tau_p = {:.2f}: the probe is nearly as slow as the transfer; the step response is symmetric in kLa "
          "and 1/tau_p, so the fit cannot tell them apart near kLa tau_p = 1 (the linearised intervals then "
          "understate the uncertainty) and takes the probe as the faster; give the measured lag with --probe-lag",
          res.kla_tau));
    }
  }
  if (o.lag_mode == ProbeLagMode::fixed && res.kla_tau > 1.0) {
    res.warnings.push_back(fmt::format(
        "kLa tau_p = {:.2f} > 1: the given probe is slower than the transfer it measures; kLa rests wholly on the "
        "given lag",
        res.kla_tau));
  }
  if (std::isfinite(hk) && hk > 0.5 * res.kla_1_s) {
    res.warnings.push_back(fmt::format("kLa is poorly determined: {} % interval {}", pct,
                                       format_interval(res.kla_ci_low_1_s, res.kla_ci_high_1_s, "1/s")));
  }  // an undetermined kLa is refused below (require_determined_kla)
  if (setup.free[kCstar]) {
    const double reached = (tr.value.back() - res.c0) / (res.steady - res.c0);
    if (reached < 0.9) {
      res.warnings.push_back(fmt::format("the trace ends at {:.0f} % of the rise, so C* rests on extrapolation; "
                                         "record until the DO levels off or give --saturation",
                                         100.0 * reached));
    }
  }
  require_determined_kla(tr, o, res);
  return res;
}

}  // namespace oxystrat
