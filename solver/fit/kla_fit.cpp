#include "solver/fit/kla_fit.hpp"

#include <fmt/format.h>

#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <cctype>
#include <charconv>
#include <cmath>
#include <fstream>
#include <limits>
#include <sstream>

#include "input/csv_table.hpp"
#include "input/numbers.hpp"
#include "solver/fit/bounded_least_squares.hpp"
#include "solver/fit/kla_verdict.hpp"
#include "solver/fit/student_t.hpp"
#include "input/case_reader.hpp"
#include "input/errors.hpp"
#include "input/units.hpp"
#include "physics/solubility.hpp"

namespace oxystrat {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// ---------------------------------------------------------------------------------------------
// Reading the trace


std::string lower_without_spaces(std::string_view s) {
  std::string out;
  for (char c : s) {
    if (!std::isspace(static_cast<unsigned char>(c))) out += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  }
  return out;
}

bool is_percent_saturation(std::string_view unit) {
  const auto u = lower_without_spaces(unit);
  return u == "%" || u == "%airsaturation" || u == "%saturation" || u == "%airsat" || u == "%sat";
}

constexpr const char* kDoUnits = "%, % air saturation, mg/L, mmol/L, mol/m3 (also mM, umol/L, mol/L)";

double time_factor(std::string_view unit) {
  if (unit == "s") return 1.0;
  if (unit == "min") return 60.0;
  if (unit == "h") return 3600.0;
  return kNaN;
}

// SI value (mol/m3) of one DO concentration unit, or nothing.
std::optional<double> do_unit_factor(const std::string& unit) {
  if (unit.empty()) return std::nullopt;
  try {
    return units::to_si(units::Dimension::concentration, {1.0, units::split("1 " + unit).unit}, physics::molar_mass_o2);
  } catch (const UnitError&) {
    return std::nullopt;
  }
}

// The trace from a parsed table: two columns, time and DO, each with its unit.
DoTrace do_trace_from(const CsvTable& table) {
  DoTrace tr;
  tr.file_name = table.file_name;
  const auto where = table.where(table.header_line);
  const auto& cells = table.header;
  if (cells.size() != 2) {
    throw CaseError(fmt::format("{}: the header has {} columns; expected two, time and DO, e.g. 'time [s],DO [%]' "
                                "(separated by ',' or ';')",
                                where, cells.size()));
  }
  // The first reading of each header cell whose unit is one of the column's.
  HeaderCell tc = header_cell_readings(cells[0]).front(), dc = header_cell_readings(cells[1]).front();
  for (const auto& r : header_cell_readings(cells[0])) {
    if (std::isfinite(time_factor(r.unit))) {
      tc = r;
      break;
    }
  }
  for (const auto& r : header_cell_readings(cells[1])) {
    if (is_percent_saturation(r.unit) || do_unit_factor(r.unit)) {
      dc = r;
      break;
    }
  }
  tr.time_header = cells[0];
  tr.do_header = cells[1];
  if (tc.unit.empty()) {
    throw CaseError(fmt::format("{}: column 1 '{}': missing unit; write it in brackets or after a space, "
                                "e.g. 'time [s]' (s, min or h)",
                                where, cells[0]));
  }
  const double time_scale = time_factor(tc.unit);
  if (!std::isfinite(time_scale)) {
    throw CaseError(fmt::format("{}: column 1 '{}': unknown time unit '{}'; expected s, min or h", where, cells[0],
                                tc.unit));
  }
  if (dc.unit.empty()) {
    throw CaseError(fmt::format("{}: column 2 '{}': missing unit; write it in brackets or after a space, "
                                "e.g. 'DO [%]' or 'DO [mg/L]' ({})",
                                where, cells[1], kDoUnits));
  }
  double do_scale = 0.01;
  if (is_percent_saturation(dc.unit)) {
    tr.scale = DoScale::saturation;
  } else {
    tr.scale = DoScale::concentration;
    const auto f = do_unit_factor(dc.unit);
    if (!f) {
      throw CaseError(fmt::format("{}: column 2 '{}': unknown DO unit '{}'; expected {}", where, cells[1], dc.unit,
                                  kDoUnits));
    }
    do_scale = *f;
  }
  tr.time_unit = tc.unit;
  tr.do_unit = dc.unit;
  tr.time_factor = time_scale;
  tr.do_factor = do_scale;
  for (const auto& row : table.rows) {
    const auto at = table.where(row.line);
    const auto tv = table.number(row, 0);
    if (!tv) {
      throw CaseError(fmt::format("{}: column 1 '{}': '{}' is not a number; expected the time in {}", at,
                                  tr.time_header, row.cells[0], tr.time_unit));
    }
    const auto dv = table.number(row, 1);
    if (!dv) {
      throw CaseError(fmt::format("{}: column 2 '{}': '{}' is not a number; expected the DO in {}", at,
                                  tr.do_header, row.cells[1], tr.do_unit));
    }
    const double t_s = *tv * time_scale;
    if (!tr.time_s.empty() && t_s <= tr.time_s.back()) {
      throw CaseError(fmt::format("{}: column 1 '{}': time {} {} is not after the previous row's (line {}); rows must "
                                  "be in increasing time",
                                  at, tr.time_header, row.cells[0], tr.time_unit, tr.line.back()));
    }
    tr.time_s.push_back(t_s);
    tr.value.push_back(*dv * do_scale);
    tr.line.push_back(row.line);
  }
  if (static_cast<int>(tr.time_s.size()) < min_trace_points) {
    throw CaseError(fmt::format("{}: too few points: {} rows of data; the fit needs at least {} (better: dozens "
                                "spread over the whole rise)",
                                table.file_name, tr.time_s.size(), min_trace_points));
  }
  return tr;
}


// ---------------------------------------------------------------------------------------------
// The model

// phi(x) = (1 - e^-x)/x and phi'(x); the power series near 0 avoids the cancellation.
void phi_and_derivative(double x, double& phi, double& dphi) {
  if (std::abs(x) < 0.5) {
    // phi = sum_n c_n x^n, c_n = (-1)^n/(n+1)!; 25 terms leave < 1e-30 for |x| < 0.5.
    phi = 0.0;
    dphi = 0.0;
    double c = 1.0, xn = 1.0, xn_1 = 0.0;
    for (int n = 0; n < 25; ++n) {
      phi += c * xn;
      if (n >= 1) dphi += n * c * xn_1;
      xn_1 = xn;
      xn *= x;
      c *= -1.0 / (n + 2);
    }
    return;
  }
  const double em = std::exp(-x);
  phi = -std::expm1(-x) / x;
  dphi = (em * (1.0 + x) - 1.0) / (x * x);
}

// The unknowns, all in SI; the same layout whether fitted or held.
enum Param { kKla = 0, kCstar, kC0, kTau, kT0, kParams };
using Vec = Eigen::Matrix<double, kParams, 1>;
const std::array<const char*, kParams> kParamNames{"kLa", "C*", "C0", "tau_p", "t0"};

struct Model {
  const std::vector<double>& t;
  const std::vector<double>& y;
  double uptake;

  double steady(const Vec& p) const { return p[kCstar] - uptake / p[kKla]; }

  // Residuals (model - measured) and, when J is given, d r / d p for all parameters.
  void evaluate(const Vec& p, Eigen::VectorXd& r, Eigen::MatrixXd* J) const {
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
  double cost(const Vec& p) const {
    Eigen::VectorXd r;
    evaluate(p, r, nullptr);
    return 0.5 * r.squaredNorm();
  }
};

// The fit of the model by bounded Levenberg-Marquardt (solver/fit/bounded_least_squares.hpp).
struct LmResult {
  Vec p;
  double cost = kInf;
  int iterations = 0;
  bool converged = false;
};

LmResult levenberg_marquardt(const Model& m, const Vec& start, const std::array<bool, kParams>& free, const Vec& lo,
                             const Vec& hi, int max_iterations) {
  const Residuals f = [&m](const Eigen::VectorXd& p, Eigen::VectorXd& r, Eigen::MatrixXd* J) { m.evaluate(p, r, J); };
  const auto r = bounded_levenberg_marquardt(f, start, std::vector<bool>(free.begin(), free.end()), lo, hi, max_iterations);
  return {r.p, r.cost, r.iterations, r.converged};
}

int free_count(const std::array<bool, kParams>& free) { return static_cast<int>(std::count(free.begin(), free.end(), true)); }

// ---------------------------------------------------------------------------------------------
// Start values and statistics

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

std::string scale_unit(DoScale s) { return s == DoScale::saturation ? "%" : "mmol/L"; }
// SI value of the trace scale -> the number printed with scale_unit.
double shown(DoScale s, double v) { return s == DoScale::saturation ? 100.0 * v : v; }

std::string format_interval(double lo, double hi, const char* unit) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) return "undetermined";
  return fmt::format("{:.3g} to {:.3g} {}", lo, hi, unit);
}

}  // namespace

// -------------------------------------------------------------------------------------------------
// Public: parsing

DoTrace parse_do_trace(const std::string& text, const std::string& file_name) {
  const CsvTable table = parse_csv_table(text, file_name, "'time [s],DO [%]'");
  return do_trace_from(table);
}

DoTrace read_do_trace(const std::string& path) { return do_trace_from(read_csv_table(path, "DO trace", "'time [s],DO [%]'")); }

double parse_do_value(const std::string& text, DoScale scale, const std::string& what) {
  units::Split q;
  try {
    q = units::split(text);
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", what, text, e.what()));
  }
  if (scale == DoScale::saturation) {
    if (!is_percent_saturation(q.unit)) {
      throw CaseError(fmt::format("{} '{}': the trace is in % air saturation, so give this in % too, e.g. '100 %'",
                                  what, text));
    }
    return 0.01 * q.value;
  }
  if (is_percent_saturation(q.unit)) {
    throw CaseError(fmt::format("{} '{}': the trace is a concentration, so give this as one too, e.g. "
                                "'0.21 mmol/L' or '6.8 mg/L'",
                                what, text));
  }
  try {
    return units::to_si(units::Dimension::concentration, q, physics::molar_mass_o2);
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", what, text, e.what()));
  }
}

double parse_uptake_rate(const std::string& text, DoScale scale, const std::string& what) {
  units::Split q;
  try {
    q = units::split(text);
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", what, text, e.what()));
  }
  const std::string u = lower_without_spaces(q.unit);
  constexpr double h = 3600.0;
  const double mg_l = 1e-3 / physics::molar_mass_o2;  // mg/L -> mol/m3
  struct Unit {
    const char* name;
    double factor;
  };
  static const std::vector<Unit> concentration{{"mmol/l/h", 1.0 / h}, {"mmol/(lh)", 1.0 / h}, {"mm/h", 1.0 / h},
                                               {"mol/m3/s", 1.0},     {"mol/(m3s)", 1.0},    {"mol/m3/h", 1.0 / h},
                                               {"mg/l/h", mg_l / h},   {"mg/(lh)", mg_l / h}};
  static const std::vector<Unit> saturation{{"%/h", 0.01 / h}, {"%/min", 0.01 / 60.0}, {"%/s", 0.01}};
  const auto& table = scale == DoScale::saturation ? saturation : concentration;
  const char* expected = scale == DoScale::saturation
                             ? "%/h, %/min or %/s (the trace is in % air saturation)"
                             : "mmol/L/h, mol/m3/s, mol/m3/h or mg/L/h (the trace is a concentration)";
  if (q.unit.empty()) throw CaseError(fmt::format("{} '{}': missing unit; expected {}", what, text, expected));
  for (const auto& e : table) {
    if (u == e.name) {
      if (q.value < 0.0) throw CaseError(fmt::format("{} '{}': an uptake rate cannot be negative", what, text));
      return q.value * e.factor;
    }
  }
  throw CaseError(fmt::format("{} '{}': unknown unit '{}'; expected {}", what, text, q.unit, expected));
}

// -------------------------------------------------------------------------------------------------
// Public: the model

StepResponse probe_step_response_derivatives(double s, double kla, double tau) {
  StepResponse g;
  if (s <= 0.0) return g;  // before the step the probe reads C0; the step response starts flat
  const double a = kla;
  if (tau <= 0.0 || a * tau < 1e-12) {
    // No lag (or one too small to matter in double precision): g = exp(-a s).
    const double e = std::exp(-a * s);
    g.g = e;
    g.d_s = -a * e;
    g.d_kla = -s * e;
    g.d_tau = a * e;  // one-sided derivative at tau = 0+, from g ~ exp(-a s) (1 + a tau)
    return g;
  }
  const double b = 1.0 / tau;
  if (std::min(a, b) * s > 600.0) {
    g.g = 0.0;  // both exponentials below 1e-260: the step is complete
    return g;
  }
  const double d = b - a;
  if (std::abs(d) <= 0.1 * std::max(a, b)) {
    // Near kLa tau_p = 1: g = e^{-as} (1 + a s phi(d s)), phi(x) = (1 - e^-x)/x, exact and free of
    // the 0/0 of the textbook form; at d = 0 it is the (1 + kLa t) e^{-kLa t} limit.
    double phi = 0.0, dphi = 0.0;
    phi_and_derivative(d * s, phi, dphi);
    const double e = std::exp(-a * s);
    g.g = e * (1.0 + a * s * phi);
    g.d_s = -a * b * s * e * phi;
    g.d_kla = e * (-s - a * s * s * phi + s * phi - a * s * s * dphi);
    const double d_b = e * a * s * s * dphi;
    g.d_tau = -b * b * d_b;
    return g;
  }
  const double ea = std::exp(-a * s), eb = std::exp(-b * s);
  g.g = (b * ea - a * eb) / d;
  g.d_s = a * b * (eb - ea) / d;
  g.d_kla = b * (ea - eb - s * d * ea) / (d * d);
  const double d_b = a * (eb - ea + s * d * eb) / (d * d);
  g.d_tau = -b * b * d_b;
  return g;
}

double probe_step_response(double s, double kla, double tau) { return probe_step_response_derivatives(s, kla, tau).g; }

std::vector<double> kla_model_values(const KlaFitResult& r, const std::vector<double>& time_s) {
  std::vector<double> out;
  out.reserve(time_s.size());
  for (double t : time_s) {
    out.push_back(r.steady - (r.steady - r.c0) * probe_step_response(t - r.step_time_s, r.kla_1_s, r.probe_lag_s));
  }
  return out;
}

// -------------------------------------------------------------------------------------------------
// Public: the fit

namespace {

struct Setup {
  std::array<bool, kParams> free{};
  Vec lo, hi;
  std::vector<Vec> starts;
};

// Checks the trace rises and derives bounds and start values from a log-linear fit of the rise.
Setup prepare(const DoTrace& tr, const KlaFitOptions& o) {
  const auto& t = tr.time_s;
  const auto& y = tr.value;
  const size_t n = t.size();
  if (static_cast<int>(n) < min_trace_points || y.size() != n) {
    throw CaseError(fmt::format("{}: too few points: {} rows of data; the fit needs at least {}", tr.file_name, n,
                                min_trace_points));
  }
  const size_t edge = std::max<size_t>(3, n / 20);
  const double head = median(std::vector<double>(y.begin(), y.begin() + static_cast<std::ptrdiff_t>(edge)));
  const double tail = median(std::vector<double>(y.end() - static_cast<std::ptrdiff_t>(edge), y.end()));
  const double sigma = noise_estimate(y);
  const auto unit = scale_unit(tr.scale);
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
  s.lo << 1e-6 * k0, -kInf, -kInf, 0.0, lagged ? t.front() - span : t.front();
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
  } else if (!std::isfinite(hk)) {
    res.warnings.push_back("kLa is not determined by this trace: its unknowns cannot be separated (give --probe-lag "
                           "and/or --saturation)");
  }
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
