#include "solver/fit/kla_fit_start.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstddef>

#include "input/errors.hpp"

namespace oxystrat::kla_fit_detail {
namespace {

double median(std::vector<double> v) {
  if (v.empty()) return kNaN;
  const auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
  std::nth_element(v.begin(), mid, v.end());
  if (v.size() % 2 == 1) return *mid;
  const double upper = *mid;
  return 0.5 * (upper + *std::max_element(v.begin(), mid));
}

// Noise standard deviation from second differences, robust to the trend and to outliers:
// y[i+1] - 2 y[i] + y[i-1] has variance 6 sigma^2 for white noise; 1.4826 MAD -> sigma.
double noise_estimate(const std::vector<double>& y) {
  std::vector<double> d2;
  for (size_t i = 1; i + 1 < y.size(); ++i) d2.push_back(std::abs(y[i + 1] - 2.0 * y[i] + y[i - 1]));
  return 1.4826 * median(d2) / std::sqrt(6.0);
}

}  // namespace

Setup prepare(const DoTrace& tr, const KlaFitOptions& o) {
  const auto& t = tr.time_s;
  const auto& y = tr.value;
  const size_t n = t.size();
  if (static_cast<int>(n) < min_trace_points || y.size() != n) {
    throw CaseError(fmt::format("{}: too few points: {} row{} of data; the fit needs at least {}", tr.file_name, n,
                                n == 1 ? "" : "s", min_trace_points));
  }
  const size_t edge = std::max<size_t>(3, n / 20);
  const double head = median(std::vector<double>(y.begin(), y.begin() + static_cast<std::ptrdiff_t>(edge)));
  const double tail = median(std::vector<double>(y.end() - static_cast<std::ptrdiff_t>(edge), y.end()));
  const double sigma = noise_estimate(y);
  const auto unit = scale_unit(tr.scale);
  if (head - tail > 10.0 * sigma) {
    throw CaseError(fmt::format("{}: the DO falls, from {:.4g} {} at the start to {:.4g} {} at the end (medians of the "
                                "first and last {} rows): that is the stripping (nitrogen or gas-off) part of a "
                                "gassing-out run; give the trace from where aeration resumes and the DO rises",
                                tr.file_name, shown(tr.scale, head), unit, shown(tr.scale, tail), unit, edge));
  }
  if (!(tail - head > 10.0 * sigma) || !(tail > head)) {
    throw CaseError(fmt::format("{}: the DO does not rise: {:.4g} {} at the start, {:.4g} {} at the end (noise about "
                                "{:.2g} {}); the gassing-out method needs the rise after aeration resumes",
                                tr.file_name, shown(tr.scale, head), unit, shown(tr.scale, tail), unit,
                                shown(tr.scale, sigma), unit));
  }
  // Level approached: the given C* when there is no uptake, else the end of the trace.
  double cinf = tail;
  if (o.saturation && o.uptake == 0.0) cinf = *o.saturation;
  if (!(cinf > head)) {
    throw CaseError(fmt::format("{}: the given saturation {:.4g} {} is not above the start of the trace ({:.4g} {})",
                                tr.file_name, shown(tr.scale, cinf), unit, shown(tr.scale, head), unit));
  }
  const double rise = cinf - head;
  // The 10-90 % window of the first pass through the rise.
  size_t first10 = n, first90 = n, depart = n;
  for (size_t i = 0; i < n; ++i) {
    const double f = (y[i] - head) / rise;
    if (depart == n && f > std::max(0.05, 4.0 * sigma / rise)) depart = i;
    if (first10 == n && f >= 0.1) first10 = i;
    if (first90 == n && f >= 0.9) first90 = i;
  }
  if (first90 == n) first90 = n - 1;
  double sx = 0, sy = 0, sxx = 0, sxy = 0;
  int m = 0;
  for (size_t i = first10; i <= first90 && i < n; ++i) {
    const double f = (y[i] - head) / rise;
    if (f < 0.1 || f > 0.9) continue;
    const double v = std::log(1.0 - f);
    sx += t[i], sy += v, sxx += t[i] * t[i], sxy += t[i] * v, ++m;
  }
  if (m < 3) {
    throw CaseError(fmt::format("{}: too few points in the rise: {} rows between 10 % and 90 % of it; at least 3 are "
                                "needed (sample more often, or the trace does not contain the rise)",
                                tr.file_name, m));
  }
  const double slope = (m * sxy - sx * sy) / (m * sxx - sx * sx);
  const double intercept = (sy - slope * sx) / m;
  if (!(slope < 0.0)) {
    throw CaseError(fmt::format("{}: the DO does not rise between 10 % and 90 % of its range; the gassing-out method "
                                "needs the rise after aeration resumes",
                                tr.file_name));
  }
  const double k0 = -slope;
  const double t_cross = intercept / k0;  // where the log-linear line starts from C0
  const double span = t.back() - t.front();
  double t_half = t.back();
  for (size_t i = 0; i < n; ++i) {
    if ((y[i] - head) / rise >= 0.5) {
      t_half = t[i];
      break;
    }
  }

  Setup s;
  s.free[kKla] = true;
  s.free[kCstar] = !o.saturation.has_value();
  s.free[kC0] = true;
  s.free[kTau] = o.lag_mode == ProbeLagMode::fitted;
  s.free[kT0] = true;
  const bool lagged = o.lag_mode != ProbeLagMode::none;
  // The level at the step is no lower than the lowest reading (a probe rises from it) nor than 0
  // unless the probe reads below 0 (an offset): left free, a lagged fit of a trace that starts
  // at its minimum ran C0 to -107 % with t0 before the data.
  const double c0_lowest = std::min(0.0, *std::min_element(y.begin(), y.end()));
  s.lo << 1e-6 * k0, -kInf, c0_lowest, 0.0, lagged ? t.front() - span : t.front();
  s.hi << kInf, kInf, kInf, span, t_half;

  const double cstar0 = o.saturation ? *o.saturation : tail + o.uptake / k0;
  std::vector<double> t0s{t.front()};
  if (depart != n && depart > 0 && t[depart - 1] > t.front() && t[depart - 1] < t_half) t0s.push_back(t[depart - 1]);
  for (double t0 : t0s) {
    std::vector<double> taus;
    if (o.lag_mode == ProbeLagMode::fixed) {
      taus = {o.probe_lag_s};
    } else if (o.lag_mode == ProbeLagMode::none) {
      taus = {0.0};
    } else {
      // The tail of the lagged response is exp(-kLa (t - t0 - delta)), delta = -ln(1 - kLa tau)/kLa.
      const double delta = t_cross - t0;
      double tau = delta > 0.0 ? -std::expm1(-k0 * delta) / k0 : 0.05 / k0;
      tau = std::clamp(tau, 0.02 / k0, 0.8 / k0);
      taus = {tau, 0.25 * tau, std::min(3.0 * tau, 0.9 / k0)};
    }
    for (double tau : taus) {
      Vec p;
      p << k0, cstar0, head, tau, t0;
      s.starts.push_back(p);
    }
  }
  return s;
}

}  // namespace oxystrat::kla_fit_detail
