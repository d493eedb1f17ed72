#include "solver/studies/calibrate_exchange.hpp"

#include <fmt/format.h>

#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <cctype>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <numbers>
#include <sstream>

#include "input/units.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/fit/student_t.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "physics/solubility.hpp"
namespace oxystrat {
namespace {

struct MixingRow {
  Case c;
  ZoneNetwork net;
};

double mixing_time_at(const MixingRow& row, double exchange, const MixingCalibrationOptions& o, bool& reached) {
  Case c = row.c;
  c.model.exchange_constant = exchange;
  const auto hydro = compute_hydrodynamics(c, row.net);
  MixingOptions mo = o.mixing;
  mo.snapshots = 1;
  const auto mix = tracer_mixing_time(row.net, hydro, mo);
  reached = reached && mix.reached;
  return o.at_probe ? mix.theta_probe_s : mix.theta_s;
}

}  // namespace

MixingCalibration calibrate_exchange(const LoadedCase& base, const std::vector<Override>& base_overrides,
                                     const CalibrationData& data, const MixingCalibrationOptions& opt) {
  if (data.quantity != CalibrationQuantity::mixing_time) {
    throw CaseError(fmt::format("{}: not mixing-time data", data.file_name));
  }
  MixingCalibration res;
  res.confidence = opt.confidence;
  res.before = base.data.model.exchange_constant > 0.0 ? base.data.model.exchange_constant : default_exchange_constant;
  const auto w = normalised_weights(data);
  const size_t n = data.points.size();
  std::vector<MixingRow> rows;
  for (size_t i = 0; i < n; ++i) {
    const auto& p = data.points[i];
    const Case c = case_at_point(base, base_overrides, data, p).data;
    rows.push_back({c, build_zone_geometry(c)});
    MixingPointResult r;
    r.name = p.name;
    r.line = p.line;
    r.speed_rps = c.operation.speed_rps;
    r.gas_normal_m3_s = c.operation.gas_flow_normal_m3_s;
    r.working_volume_m3 = c.vessel.working_volume_m3;
    r.measured_s = p.value;
    r.weight = w[i];
    res.rows.push_back(r);
  }
  res.points = static_cast<int>(n);
  bool reached = true;
  // Log mixing times at ln c_t = u, every row.
  const auto thetas = [&](double u) {
    std::vector<double> out;
    for (const auto& row : rows) out.push_back(mixing_time_at(row, std::exp(u), opt, reached));
    res.evaluations += static_cast<int>(rows.size());
    return out;
  };
  const auto cost = [&](const std::vector<double>& th) {
    double s = 0.0;
    for (size_t i = 0; i < n; ++i) s += w[i] * std::pow(std::log(th[i] / data.points[i].value), 2);
    return s;
  };
  // The case reader allows 0 < c_t <= 100.
  const double u_lo = std::log(default_exchange_constant / opt.search_factor);
  const double u_hi = std::min(std::log(100.0), std::log(default_exchange_constant * opt.search_factor));
  constexpr int scan = 11;
  std::vector<double> us, costs;
  for (int k = 0; k < scan; ++k) {
    us.push_back(u_lo + (u_hi - u_lo) * k / (scan - 1));
    costs.push_back(cost(thetas(us.back())));
  }
  const auto best = static_cast<int>(std::min_element(costs.begin(), costs.end()) - costs.begin());
  res.at_search_bound = best == 0 || best == scan - 1;
  // Golden section inside the neighbouring scan points, to 1e-3 in ln c_t (0.1 % in c_t).
  double a = us[static_cast<size_t>(std::max(0, best - 1))], d = us[static_cast<size_t>(std::min(scan - 1, best + 1))];
  const double g = (std::sqrt(5.0) - 1.0) / 2.0;
  double b = d - g * (d - a), cc = a + g * (d - a);
  double fb = cost(thetas(b)), fc = cost(thetas(cc));
  while (d - a > 1e-3) {
    if (fb < fc) {
      d = cc, cc = b, fc = fb;
      b = d - g * (d - a);
      fb = cost(thetas(b));
    } else {
      a = b, b = cc, fb = fc;
      cc = a + g * (d - a);
      fc = cost(thetas(cc));
    }
  }
  double u = fb < fc ? b : cc;
  if (costs[static_cast<size_t>(best)] < std::min(fb, fc)) u = us[static_cast<size_t>(best)];
  res.fitted = std::exp(u);
  const auto at_fit = thetas(u);
  const auto at_before = thetas(std::log(res.before));
  // Sensitivities by central differences over +-5 % in c_t.
  constexpr double du = 0.05;
  const auto up = thetas(u + du), down = thetas(u - du);
  double ss = 0.0, jj = 0.0, max_sens = 0.0;
  for (size_t i = 0; i < n; ++i) {
    auto& r = res.rows[i];
    r.fitted_s = at_fit[i];
    r.before_s = at_before[i];
    r.residual_log = std::log(r.fitted_s / r.measured_s);
    r.sensitivity = (std::log(up[i]) - std::log(down[i])) / (2.0 * du);
    ss += w[i] * r.residual_log * r.residual_log;
    jj += w[i] * r.sensitivity * r.sensitivity;
    max_sens = std::max(max_sens, std::abs(r.sensitivity));
  }
  res.rms_log = std::sqrt(ss / static_cast<double>(n));
  res.lo = res.hi = std::numeric_limits<double>::quiet_NaN();
  const int pct = static_cast<int>(std::lround(100.0 * opt.confidence));
  if (n >= 2 && jj > 0.0) {
    res.t_quantile = student_t_quantile(0.5 + 0.5 * opt.confidence, static_cast<double>(n - 1));
    const double se = std::sqrt(ss / static_cast<double>(n - 1) / jj);
    res.lo = std::exp(u - res.t_quantile * se);
    res.hi = std::exp(u + res.t_quantile * se);
  } else if (n < 2) {
    res.warnings.push_back("one mixing time only: c_t matches it exactly, with no scatter to estimate an interval "
                           "from; measure at two or more operating points");
  }
  if (!reached) {
    res.warnings.push_back(fmt::format("the tracer did not mix within {:.3g} s at some point of the search; those mixing "
                                       "times are lower bounds",
                                       opt.mixing.max_time_s));
  }
  if (max_sens < 0.05) {
    res.not_determined = "the computed mixing times hardly depend on it at these points";
    res.warnings.push_back(fmt::format(
        "the computed mixing times hardly depend on the exchange constant at these points (|d ln theta / d ln c_t| "
        "at most {:.3f}): the circulation loops set them, so the measurements cannot determine c_t",
        max_sens));
  } else if (res.at_search_bound) {
    res.not_determined = "its best value lies at the end of the search range";
    res.warnings.push_back(fmt::format(
        "the best exchange constant lies at the end of the search range ({:.3g} to {:.3g}): the measured mixing times "
        "are {} than the network can give by turbulent exchange alone; check the probe and injection positions and "
        "the homogeneity of the measurement",
        std::exp(u_lo), std::exp(u_hi), res.fitted >= std::exp(u_hi) * 0.999 ? "shorter" : "longer"));
  }
  if (n >= 2 && std::isfinite(res.hi) && res.hi / res.lo > 4.0) {
    res.warnings.push_back(fmt::format("c_t is poorly determined: {} % interval {:.3g} to {:.3g}", pct, res.lo, res.hi));
  }
  return res;
}

}  // namespace oxystrat
