#include "solver/studies/calibrate_kla.hpp"

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
#include "physics/constants.hpp"
namespace oxystrat {
VesselKlaInputs vessel_kla_inputs(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h) {
  // As OxygenSetup (solver/oxygen_field.cpp): total gassed power per working volume, and the
  // wet inlet gas at the pressure of mid-height in the ungassed liquid over the vessel's section.
  VesselKlaInputs in;
  const double t = c.vessel.temperature_k;
  const double pw = physics::water_vapour_pressure(t);
  const double p_mid = c.vessel.head_pressure_pa + 0.5 * c.broth.density_kg_m3 * kG * c.vessel.liquid_height_m;
  in.power_per_volume_w_m3 = h.power_gassed_w / c.vessel.working_volume_m3;
  in.superficial_gas_m_s =
      h.gas_molar_flow_mol_s * kR * t / (p_mid - pw) / (std::numbers::pi * std::pow(net.shape.radius(), 2));
  in.temperature_factor = kla_temperature_factor(t);
  in.kla_factor = c.model.kla_factor;
  return in;
}

double vessel_kla(const VantRietConstants& k, const VesselKlaInputs& in) {
  return vant_riet_kla(k, in.power_per_volume_w_m3, in.superficial_gas_m_s) * in.temperature_factor * in.kla_factor;
}

namespace {

double weighted_correlation(const std::vector<double>& x, const std::vector<double>& y, const std::vector<double>& w) {
  double sw = 0, mx = 0, my = 0;
  for (size_t i = 0; i < x.size(); ++i) sw += w[i], mx += w[i] * x[i], my += w[i] * y[i];
  mx /= sw, my /= sw;
  double sxx = 0, syy = 0, sxy = 0;
  for (size_t i = 0; i < x.size(); ++i) {
    sxx += w[i] * (x[i] - mx) * (x[i] - mx);
    syy += w[i] * (y[i] - my) * (y[i] - my);
    sxy += w[i] * (x[i] - mx) * (y[i] - my);
  }
  return sxx > 0.0 && syy > 0.0 ? sxy / std::sqrt(sxx * syy) : 0.0;
}

double spread(const std::vector<double>& v) {
  const auto [lo, hi] = std::minmax_element(v.begin(), v.end());
  return *hi - *lo;
}

// ln spread below which a regressor counts as not varied: 10 %, against measured kLa scatter of
// +-20-40 % (van 't Riet 1979) such a lever cannot pin an exponent (our modelling choice).
constexpr double kMinLogSpread = 0.1;
// |correlation| of ln(P/V) and ln(vs) above which the two exponents cannot be told apart.
constexpr double kMaxCorrelation = 0.98;

}  // namespace

KlaCalibration calibrate_kla(const LoadedCase& base, const std::vector<Override>& base_overrides,
                             const CalibrationData& data, const KlaCalibrationOptions& opt) {
  if (data.quantity != CalibrationQuantity::kla) throw CaseError(fmt::format("{}: not kLa data", data.file_name));
  const Case& c0 = base.data;
  if (c0.model.kla_model != KlaModel::local_correlation) {
    throw CaseError(fmt::format("{}: model.kla_model = \"mechanistic\": calibrate fits the constants of the van 't Riet "
                                "correlation, which only model.kla_model = \"local-correlation\" uses",
                                base.file_name));
  }
  KlaCalibration res;
  res.confidence = opt.confidence;
  res.before = vant_riet_constants(c0.broth.coalescence, c0.model);
  const auto w = normalised_weights(data);
  const size_t n = data.points.size();
  std::vector<double> x1, x2, y;
  for (size_t i = 0; i < n; ++i) {
    const auto& p = data.points[i];
    const Case c = case_at_point(base, base_overrides, data, p).data;
    if (c.operation.gas_flow_normal_m3_s <= 0.0) {
      throw CaseError(fmt::format("{}:{}: operating point '{}': gas flow {}: a kLa needs sparged gas", data.file_name,
                                  p.line, p.name, p.gas_text));
    }
    const auto net = build_zone_geometry(c);
    const auto hydro = compute_hydrodynamics(c, net);
    KlaPointResult r;
    r.name = p.name;
    r.line = p.line;
    r.speed_rps = c.operation.speed_rps;
    r.gas_normal_m3_s = c.operation.gas_flow_normal_m3_s;
    r.working_volume_m3 = c.vessel.working_volume_m3;
    r.inputs = vessel_kla_inputs(c, net, hydro);
    if (!(r.inputs.power_per_volume_w_m3 > 0.0)) {
      throw CaseError(fmt::format("{}:{}: operating point '{}': no power input at speed {}", data.file_name, p.line,
                                  p.name, p.speed_text));
    }
    r.measured_1_s = p.value;
    r.before_1_s = vessel_kla(res.before, r.inputs);
    r.weight = w[i];
    x1.push_back(std::log(r.inputs.power_per_volume_w_m3));
    x2.push_back(std::log(r.inputs.superficial_gas_m_s));
    y.push_back(std::log(p.value / (r.inputs.temperature_factor * r.inputs.kla_factor)));
    res.rows.push_back(r);
  }
  res.points = static_cast<int>(n);
  const auto range = [&](auto get, double& lo, double& hi) {
    lo = get(res.rows.front()), hi = lo;
    for (const auto& r : res.rows) lo = std::min(lo, get(r)), hi = std::max(hi, get(r));
  };
  range([](const KlaPointResult& r) { return r.inputs.power_per_volume_w_m3; }, res.pv_min, res.pv_max);
  range([](const KlaPointResult& r) { return r.inputs.superficial_gas_m_s; }, res.vs_min, res.vs_max);
  range([](const KlaPointResult& r) { return r.speed_rps; }, res.speed_min_rps, res.speed_max_rps);
  range([](const KlaPointResult& r) { return r.gas_normal_m3_s * 60.0 / r.working_volume_m3; }, res.vvm_min, res.vvm_max);

  // Which exponents the design can identify.
  // At one speed P/V still moves with the gas flow (the gassed power falls), but only in step
  // with vs: the speed itself must have been varied to fit alpha.
  std::vector<double> ln_speed;
  for (const auto& r : res.rows) ln_speed.push_back(std::log(r.speed_rps));
  const bool speed_varied = spread(ln_speed) >= 0.5 * kMinLogSpread;
  res.power_exponent_fitted = speed_varied && spread(x1) >= kMinLogSpread;
  res.gas_exponent_fitted = spread(x2) >= kMinLogSpread;
  res.exponent_correlation = n > 1 ? weighted_correlation(x1, x2, w) : 0.0;
  if (!res.gas_exponent_fitted && !res.power_exponent_fitted) {
    // Only the prefactor would move: a calibration of nothing but the level, which
    // model.kla_factor states honestly, with no claim about how kLa scales.
    // The level alone is what the data do give: the factor on the case's correlation they imply.
    double ln_ratio = 0.0, weights = 0.0;
    for (const auto& r : res.rows) ln_ratio += r.weight * std::log(r.measured_1_s / r.before_1_s), weights += r.weight;
    const double factor = res.rows.front().inputs.kla_factor * std::exp(ln_ratio / weights);
    const std::string what =
        n == 1 ? std::string("one operating point cannot fit an exponent")
               : fmt::format("the {} operating points have no spread: the speed varies by {:.1f} % and the superficial "
                             "gas velocity by {:.1f} % (at least 10 % each is needed to fit an exponent)",
                             n, 100.0 * std::expm1(spread(ln_speed)), 100.0 * std::expm1(spread(x2)));
    throw CaseError(fmt::format(
        "{}: {}, so the correlation cannot be calibrated; measure at two or more speeds and two or more gas flows, or "
        "keep the correlation's form and set model.kla_factor = {:.3g} (measured / predicted kLa{})",
        data.file_name, what, factor, n == 1 ? "" : ", geometric mean over the points"));
  }
  if (!res.gas_exponent_fitted) {
    res.warnings.push_back(fmt::format(
        "the superficial gas velocity varies by only {:.1f} % over the data (the gas flow was hardly changed), so the "
        "gas exponent beta cannot be fitted: it is held at the case's value {:.3g}; measure at two or more gas flows "
        "to fit it",
        100.0 * std::expm1(spread(x2)), res.before.gas_exponent));
  }
  if (!res.power_exponent_fitted) {
    res.warnings.push_back(fmt::format(
        "the speed varies by only {:.1f} % over the data (P/V by {:.1f} %, and then mostly through the gassed power, "
        "in step with the gas flow), so the power exponent alpha cannot be fitted: it is held at the case's value "
        "{:.3g}; measure at two or more speeds to fit it",
        100.0 * std::expm1(spread(ln_speed)), 100.0 * std::expm1(spread(x1)), res.before.power_exponent));
  }
  if (res.power_exponent_fitted && res.gas_exponent_fitted && std::abs(res.exponent_correlation) > kMaxCorrelation) {
    res.gas_exponent_fitted = false;
    res.warnings.push_back(fmt::format(
        "ln(P/V) and ln(vs) move together over the data (correlation {:.3f}): speed and gas flow were changed in step, "
        "so the two exponents cannot be told apart; beta is held at the case's value {:.3g} and only a and alpha are "
        "fitted; vary speed at a fixed gas flow and gas flow at a fixed speed",
        res.exponent_correlation, res.before.gas_exponent));
  }
  res.parameters = 1 + static_cast<int>(res.power_exponent_fitted) + static_cast<int>(res.gas_exponent_fitted);
  const int dof = res.points - res.parameters;
  if (dof < 1) {
    throw CaseError(fmt::format("{}: {} operating point{} for {} unknown{} ({}): too few to fit and to estimate the "
                                "scatter; measure at least {}, better {}, varying speed and gas flow independently",
                                data.file_name, res.points, res.points == 1 ? "" : "s", res.parameters,
                                res.parameters == 1 ? "" : "s",
                                res.parameters == 1 ? "a" : res.parameters == 2 ? (res.power_exponent_fitted ? "a, alpha" : "a, beta") : "a, alpha, beta",
                                res.parameters + 1, 2 * res.parameters + 2));
  }

  // Weighted least squares on the log scale; the held exponents move to the left-hand side.
  Eigen::MatrixXd A(static_cast<Eigen::Index>(n), res.parameters);
  Eigen::VectorXd b(static_cast<Eigen::Index>(n));
  for (size_t i = 0; i < n; ++i) {
    const auto k = static_cast<Eigen::Index>(i);
    const double sw = std::sqrt(w[i]);
    double lhs = y[i];
    Eigen::Index j = 0;
    A(k, j++) = sw;
    if (res.power_exponent_fitted) A(k, j++) = sw * x1[i]; else lhs -= res.before.power_exponent * x1[i];
    if (res.gas_exponent_fitted) A(k, j++) = sw * x2[i]; else lhs -= res.before.gas_exponent * x2[i];
    b[k] = sw * lhs;
  }
  const Eigen::VectorXd coef = A.colPivHouseholderQr().solve(b);
  const Eigen::VectorXd r = b - A * coef;  // sqrt(w) (measured - fitted) on the log scale
  const double ss_res = r.squaredNorm();
  const double s2 = ss_res / dof;
  const Eigen::MatrixXd cov = s2 * (A.transpose() * A).inverse();
  res.t_quantile = student_t_quantile(0.5 + 0.5 * opt.confidence, dof);
  Eigen::Index j = 0;
  const double ln_a = coef[j], se_a = std::sqrt(std::max(0.0, cov(j, j)));
  ++j;
  res.fitted.prefactor = std::exp(ln_a);
  res.prefactor_lo = std::exp(ln_a - res.t_quantile * se_a);
  res.prefactor_hi = std::exp(ln_a + res.t_quantile * se_a);
  const auto exponent = [&](bool fitted, double held, double& value, double& lo, double& hi) {
    if (!fitted) {
      value = lo = hi = held;
      return;
    }
    const double se = std::sqrt(std::max(0.0, cov(j, j)));
    value = coef[j];
    lo = value - res.t_quantile * se;
    hi = value + res.t_quantile * se;
    ++j;
  };
  exponent(res.power_exponent_fitted, res.before.power_exponent, res.fitted.power_exponent, res.power_exponent_lo,
           res.power_exponent_hi);
  exponent(res.gas_exponent_fitted, res.before.gas_exponent, res.fitted.gas_exponent, res.gas_exponent_lo,
           res.gas_exponent_hi);

  double sw = 0.0, ybar = 0.0;
  for (size_t i = 0; i < n; ++i) sw += w[i], ybar += w[i] * y[i];
  ybar /= sw;
  double ss_tot = 0.0;
  for (size_t i = 0; i < n; ++i) ss_tot += w[i] * (y[i] - ybar) * (y[i] - ybar);
  if (ss_tot > 0.0) res.r_squared = 1.0 - ss_res / ss_tot;
  res.rms_log = std::sqrt(ss_res / sw);
  for (auto& row : res.rows) {
    row.fitted_1_s = vessel_kla(res.fitted, row.inputs);
    row.residual_log = std::log(row.fitted_1_s / row.measured_1_s);
  }

  // What the fragment can hold (the case reader's ranges), then the honest warnings.
  if (!(res.fitted.power_exponent > 0.0 && res.fitted.power_exponent <= 1.5) ||
      !(res.fitted.gas_exponent > 0.0 && res.fitted.gas_exponent <= 1.5) ||
      !(res.fitted.prefactor > 0.0 && res.fitted.prefactor <= 10.0)) {
    throw CaseError(fmt::format(
        "{}: the fit gives a = {:.4g}, alpha = {:.4g}, beta = {:.4g}, outside what the correlation can mean (a more "
        "than 0 and at most 10, exponents more than 0 and at most 1.5): kLa does not rise with P/V and vs over these "
        "data; check the units of the kLa and gas-flow columns and the rows",
        data.file_name, res.fitted.prefactor, res.fitted.power_exponent, res.fitted.gas_exponent));
  }
  const int pct = static_cast<int>(std::lround(100.0 * opt.confidence));
  if (res.power_exponent_fitted &&
      (res.fitted.power_exponent < published_power_exponent_lo || res.fitted.power_exponent > published_power_exponent_hi)) {
    res.warnings.push_back(fmt::format(
        "the fitted power exponent alpha = {:.3g} ({} % interval {:.3g} to {:.3g}) lies outside {:g}-{:g}, the span of "
        "van 't Riet's (1979) two forms; the data may cover too narrow a range or hold another effect (flooding, "
        "foam, antifoam, a probe lag); scaled up, the fitted exponent carries its error to every P/V",
        res.fitted.power_exponent, pct, res.power_exponent_lo, res.power_exponent_hi, published_power_exponent_lo,
        published_power_exponent_hi));
  }
  if (res.gas_exponent_fitted &&
      (res.fitted.gas_exponent < published_gas_exponent_lo || res.fitted.gas_exponent > published_gas_exponent_hi)) {
    res.warnings.push_back(fmt::format(
        "the fitted gas exponent beta = {:.3g} ({} % interval {:.3g} to {:.3g}) lies outside {:g}-{:g}, the span of "
        "van 't Riet's (1979) two forms; check the gas-flow column (normal or actual volumes) and the range covered",
        res.fitted.gas_exponent, pct, res.gas_exponent_lo, res.gas_exponent_hi, published_gas_exponent_lo,
        published_gas_exponent_hi));
  }
  if (res.power_exponent_fitted && res.gas_exponent_fitted && std::abs(res.exponent_correlation) > 0.9) {
    res.warnings.push_back(fmt::format(
        "ln(P/V) and ln(vs) are strongly correlated over the data ({:.3f}): the two exponents trade off against each "
        "other and their intervals are wide; more points with speed and gas flow varied independently would help",
        res.exponent_correlation));
  }
  if (dof < 3) {
    res.warnings.push_back(fmt::format("only {} point{} for {} unknowns ({} degree{} of freedom): the intervals are "
                                       "wide (Student-t {:.3g}) and one bad point decides the fit",
                                       res.points, res.points == 1 ? "" : "s", res.parameters, dof, dof == 1 ? "" : "s",
                                       res.t_quantile));
  }
  if (res.rms_log > 0.25) {
    res.warnings.push_back(fmt::format("the points scatter by {:.0f} % (RMS of ln(fitted/measured)) about the fit, more "
                                       "than repeat kLa measurements usually do; look for outliers or a missing effect",
                                       100.0 * res.rms_log));
  }
  if (dof >= 3 && s2 > 0.0) {
    for (size_t i = 0; i < n; ++i) {
      const double z = std::abs(r[static_cast<Eigen::Index>(i)]) / std::sqrt(s2);
      if (z > 2.5) {
        res.warnings.push_back(fmt::format("{}:{}: point '{}' lies {:.1f} standard deviations from the fit (measured "
                                           "{:.4g} 1/h, fitted {:.4g} 1/h): check it",
                                           data.file_name, res.rows[i].line, res.rows[i].name,
                                           z, 3600.0 * res.rows[i].measured_1_s, 3600.0 * res.rows[i].fitted_1_s));
      }
    }
  }

  // The full zone model at every point with the fitted constants: its volume-mean kLa.
  if (opt.zone_model_check) {
    const std::vector<Override> fitted_keys{
        parse_override(fmt::format("model.kla_prefactor={:.17g}", res.fitted.prefactor)),
        parse_override(fmt::format("model.kla_power_exponent={:.17g}", res.fitted.power_exponent)),
        parse_override(fmt::format("model.kla_gas_exponent={:.17g}", res.fitted.gas_exponent))};
    double worst = 0.0;
    bool all = true;
    for (size_t i = 0; i < n; ++i) {
      const Case c = case_at_point(base, base_overrides, data, data.points[i], fitted_keys).data;
      const auto net = build_zone_geometry(c);
      const auto hydro = compute_hydrodynamics(c, net);
      const auto routing = route_gas(c, net, hydro);
      try {
        // No culture: kLa is a property of the vessel and its operation (as in a gassing-out test).
        const auto field = solve_oxygen_field(OxygenContext{c, net, hydro, routing}, 0.0);
        res.rows[i].zone_mean_1_s = field.kla_mean_1_s;
        worst = std::max(worst, std::abs(field.kla_mean_1_s / res.rows[i].fitted_1_s - 1.0));
      } catch (const SolveError& e) {
        all = false;
        res.warnings.push_back(fmt::format("{}:{}: the zone-model check failed at point '{}': {}", data.file_name,
                                           res.rows[i].line, res.rows[i].name, e.what()));
      }
    }
    if (all) res.zone_check_max_deviation = worst;
    if (worst > 0.05) {
      res.warnings.push_back(fmt::format(
          "the zone model's volume-mean kLa differs from the fitted vessel correlation by up to {:.0f} % (the case has "
          "model.kla_normalise = {}): the fit calibrates the vessel-level correlation; with kla_normalise = true the "
          "zone model reproduces it exactly",
          100.0 * worst, c0.model.kla_normalise ? "true" : "false"));
    }
  }
  return res;
}

}  // namespace oxystrat
