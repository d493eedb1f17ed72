#include "postproc/report/calibrate_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <stdexcept>

#include "postproc/report/svg_plot.hpp"
#include "input/errors.hpp"

namespace oxystrat {
namespace {

using svg::escape;

double vvm(double normal_m3_s, double volume_m3) { return normal_m3_s * 60.0 / volume_m3; }
double rpm(double rps) { return 60.0 * rps; }
double per_h(double per_s) { return 3600.0 * per_s; }
double pct(double confidence) { return std::round(100.0 * confidence); }

std::string interval(double lo, double hi, const char* fmt_spec = "{:.4g}") {
  if (!std::isfinite(lo) || !std::isfinite(hi)) return "undetermined";
  return fmt::format(fmt::runtime(std::string(fmt_spec) + " to " + fmt_spec), lo, hi);
}

// "R^2 (ln kLa) 0.986, " or nothing when the measured values have no spread.
std::string r_squared(const KlaCalibration& k, const char* format) {
  return k.r_squared ? fmt::format(fmt::runtime(format), *k.r_squared) : std::string();
}

std::string held_or_interval(bool fitted, double lo, double hi) {
  return fitted ? interval(lo, hi, "{:.3g}") : "held (not identifiable)";
}

void check_stream(std::ofstream& out, const std::string& path) { finish_file(out, path); }

}  // namespace

std::string calibration_toml(const CalibrationSources& src, const KlaCalibration* kla, const MixingCalibration* mix) {
  std::string s = "# Fitted by oxystrat calibrate: constants of the case's own pilot measurements.\n";
  s += fmt::format("# Case {}, {}.\n", src.case_file, src.date_utc);
  if (kla) {
    const int p = static_cast<int>(pct(kla->confidence));
    s += fmt::format("# kLa: {} ({} points), kLa = a (Pg/V)^alpha vs^beta (SI: 1/s, W/m3, m/s), weighted least\n",
                     src.kla_data, kla->points);
    s += "#   squares on ln kLa, Pg/V and vs (mid-height) from oxystrat's own power and gas model.\n";
    s += fmt::format("#   a = {:.4g} ({} % interval {}), alpha = {:.3g} ({}), beta = {:.3g} ({})\n",
                     kla->fitted.prefactor, p, interval(kla->prefactor_lo, kla->prefactor_hi), kla->fitted.power_exponent,
                     held_or_interval(kla->power_exponent_fitted, kla->power_exponent_lo, kla->power_exponent_hi),
                     kla->fitted.gas_exponent,
                     held_or_interval(kla->gas_exponent_fitted, kla->gas_exponent_lo, kla->gas_exponent_hi));
    s += fmt::format("#   {}scatter {:.1f} % (RMS of ln fitted/measured); before: a = {:.4g}, alpha = "
                     "{:.3g}, beta = {:.3g}\n",
                     r_squared(*kla, "R^2 (ln kLa) {:.3f}, "), 100.0 * kla->rms_log, kla->before.prefactor,
                     kla->before.power_exponent, kla->before.gas_exponent);
    s += fmt::format("#   Covered: speed {:.4g}-{:.4g} rpm, gas {:.3g}-{:.3g} vvm, Pg/V {:.3g}-{:.3g} kW/m3, vs {:.3g}-{:.3g} "
                     "mm/s.\n",
                     rpm(kla->speed_min_rps), rpm(kla->speed_max_rps), kla->vvm_min, kla->vvm_max, kla->pv_min / 1e3,
                     kla->pv_max / 1e3, kla->vs_min * 1e3, kla->vs_max * 1e3);
    s += "#   Outside that range of Pg/V and vs the correlation is an extrapolation.\n";
    for (const auto& w : kla->warnings) s += "#   warning: " + w + "\n";
  }
  if (mix) {
    s += fmt::format("# Mixing: {} ({} points), exchange constant c_t = {:.4g} ({} % interval {}), scatter {:.1f} %;\n",
                     src.mixing_data, mix->points, mix->fitted, static_cast<int>(pct(mix->confidence)),
                     interval(mix->lo, mix->hi), 100.0 * mix->rms_log);
    s += fmt::format("#   before: {:.4g}.\n", mix->before);
    for (const auto& w : mix->warnings) s += "#   warning: " + w + "\n";
  }
  s += "# Use it from a case file (path relative to that file), as defaults the case and --set override:\n";
  s += "#   include = [\"calibration.toml\"]\n";
  s += "[model]\n";
  if (kla) {
    s += fmt::format("kla_prefactor = {:.6g}\n", kla->fitted.prefactor);
    s += fmt::format("kla_power_exponent = {:.6g}\n", kla->fitted.power_exponent);
    s += fmt::format("kla_gas_exponent = {:.6g}\n", kla->fitted.gas_exponent);
  }
  if (mix && mix->not_determined.empty()) s += fmt::format("exchange_constant = {:.6g}\n", mix->fitted);
  if (mix && !mix->not_determined.empty()) {
    s += fmt::format("# exchange_constant = {:.6g} is not set: {} (see the warnings above)\n", mix->fitted,
                     mix->not_determined);
  }
  return s;
}

void write_kla_calibration_csv(const std::string& path, const KlaCalibration& kla) {
  std::ofstream out(path);
  out << "name,line,speed [rpm],gas flow [vvm],Pg/V [W/m3],vs [m/s],kLa measured [1/h],kLa fitted [1/h],"
         "kLa before [1/h],kLa zone-model mean [1/h],residual ln(fitted/measured) [-],weight [-]\n";
  for (const auto& r : kla.rows) {
    const std::string zone = r.zone_mean_1_s >= 0.0 ? fmt::format("{:.8g}", per_h(r.zone_mean_1_s)) : "";
    std::string name = r.name;
    std::replace(name.begin(), name.end(), ',', ' ');
    out << fmt::format("{},{},{:.8g},{:.6g},{:.8g},{:.8g},{:.8g},{:.8g},{:.8g},{},{:.6g},{:.6g}\n", name, r.line,
                       rpm(r.speed_rps), vvm(r.gas_normal_m3_s, r.working_volume_m3), r.inputs.power_per_volume_w_m3,
                       r.inputs.superficial_gas_m_s, per_h(r.measured_1_s), per_h(r.fitted_1_s), per_h(r.before_1_s),
                       zone, r.residual_log, r.weight);
  }
  check_stream(out, path);
}

void write_mixing_calibration_csv(const std::string& path, const MixingCalibration& mix) {
  std::ofstream out(path);
  out << "name,line,speed [rpm],gas flow [vvm],mixing time measured [s],mixing time fitted [s],mixing time before [s],"
         "residual ln(fitted/measured) [-],d ln theta / d ln c_t [-],weight [-]\n";
  for (const auto& r : mix.rows) {
    std::string name = r.name;
    std::replace(name.begin(), name.end(), ',', ' ');
    out << fmt::format("{},{},{:.8g},{:.6g},{:.8g},{:.8g},{:.8g},{:.6g},{:.6g},{:.6g}\n", name, r.line, rpm(r.speed_rps),
                       vvm(r.gas_normal_m3_s, r.working_volume_m3), r.measured_s, r.fitted_s, r.before_s,
                       r.residual_log, r.sensitivity, r.weight);
  }
  check_stream(out, path);
}

void write_calibration_h5(H5Writer& h5, const CalibrationSources& src, const KlaCalibration* kla,
                          const MixingCalibration* mix) {
  h5.write("/calibration/case_file", src.case_file);
  h5.write("/calibration/date", src.date_utc);
  if (kla) {
    const std::string g = "/calibration/kla/";
    h5.write(g + "source", src.kla_data);
    h5.write(g + "prefactor", kla->fitted.prefactor, "1/s per (W/m3)^alpha (m/s)^beta");
    h5.write(g + "prefactor_ci_low", kla->prefactor_lo, "1/s per (W/m3)^alpha (m/s)^beta");
    h5.write(g + "prefactor_ci_high", kla->prefactor_hi, "1/s per (W/m3)^alpha (m/s)^beta");
    h5.write(g + "power_exponent", kla->fitted.power_exponent, "1");
    h5.write(g + "power_exponent_ci_low", kla->power_exponent_lo, "1");
    h5.write(g + "power_exponent_ci_high", kla->power_exponent_hi, "1");
    h5.write(g + "gas_exponent", kla->fitted.gas_exponent, "1");
    h5.write(g + "gas_exponent_ci_low", kla->gas_exponent_lo, "1");
    h5.write(g + "gas_exponent_ci_high", kla->gas_exponent_hi, "1");
    h5.attribute(g + "power_exponent", "fitted", kla->power_exponent_fitted ? "true" : "false (held at the case's value)");
    h5.attribute(g + "gas_exponent", "fitted", kla->gas_exponent_fitted ? "true" : "false (held at the case's value)");
    h5.attribute(g + "prefactor_ci_low", "meaning",
                 fmt::format("{:.0f} % confidence interval, Student-t quantile {:.6g}", pct(kla->confidence), kla->t_quantile));
    h5.write(g + "prefactor_before", kla->before.prefactor, "1/s per (W/m3)^alpha (m/s)^beta");
    h5.write(g + "power_exponent_before", kla->before.power_exponent, "1");
    h5.write(g + "gas_exponent_before", kla->before.gas_exponent, "1");
    if (kla->r_squared) h5.write(g + "r_squared", *kla->r_squared, "1");
    h5.write(g + "rms_log_residual", kla->rms_log, "1");
    h5.write(g + "exponent_correlation", kla->exponent_correlation, "1");
    std::vector<double> pv, vs, speed, gas, meas, fit, before, zone, res, weight, tf;
    std::vector<int> line;
    std::vector<std::string> names;
    for (const auto& r : kla->rows) {
      pv.push_back(r.inputs.power_per_volume_w_m3);
      vs.push_back(r.inputs.superficial_gas_m_s);
      speed.push_back(r.speed_rps);
      gas.push_back(r.gas_normal_m3_s);
      meas.push_back(r.measured_1_s);
      fit.push_back(r.fitted_1_s);
      before.push_back(r.before_1_s);
      if (r.zone_mean_1_s >= 0.0) zone.push_back(r.zone_mean_1_s);
      res.push_back(r.residual_log);
      weight.push_back(r.weight);
      tf.push_back(r.inputs.temperature_factor * r.inputs.kla_factor);
      line.push_back(r.line);
      names.push_back(r.name);
    }
    h5.write(g + "name", names);
    h5.write(g + "line", line, "1");
    h5.write(g + "power_per_volume", pv, "W/m3");
    h5.write(g + "superficial_gas_velocity", vs, "m/s");
    h5.write(g + "speed", speed, "1/s");
    h5.write(g + "gas_flow_normal", gas, "m3/s");
    h5.write(g + "measured", meas, "1/s");
    h5.write(g + "fitted", fit, "1/s");
    h5.write(g + "before", before, "1/s");
    if (zone.size() == kla->rows.size()) h5.write(g + "zone_model_mean", zone, "1/s");  // not with --no-zone-check
    h5.write(g + "residual_log", res, "1");
    h5.attribute(g + "residual_log", "meaning", "ln(fitted / measured)");
    h5.write(g + "weight", weight, "1");
    h5.write(g + "temperature_and_kla_factor", tf, "1");
    h5.write(g + "warnings", kla->warnings);
  }
  if (mix) {
    const std::string g = "/calibration/mixing/";
    h5.write(g + "source", src.mixing_data);
    h5.write(g + "exchange_constant", mix->fitted, "1");
    if (std::isfinite(mix->lo) && std::isfinite(mix->hi)) {  // none from one mixing time
      h5.write(g + "exchange_constant_ci_low", mix->lo, "1");
      h5.write(g + "exchange_constant_ci_high", mix->hi, "1");
    }
    h5.write(g + "exchange_constant_before", mix->before, "1");
    h5.write(g + "exchange_constant_set", std::vector<int>{mix->not_determined.empty() ? 1 : 0}, "1");
    h5.attribute(g + "exchange_constant_set", "meaning",
                 "1 when calibration.toml sets the fitted c_t; 0 when the fit did not determine it (see warnings)");
    h5.write(g + "rms_log_residual", mix->rms_log, "1");
    std::vector<double> speed, gas, meas, fit, before, res, sens, weight;
    std::vector<std::string> names;
    for (const auto& r : mix->rows) {
      speed.push_back(r.speed_rps);
      gas.push_back(r.gas_normal_m3_s);
      meas.push_back(r.measured_s);
      fit.push_back(r.fitted_s);
      before.push_back(r.before_s);
      res.push_back(r.residual_log);
      sens.push_back(r.sensitivity);
      weight.push_back(r.weight);
      names.push_back(r.name);
    }
    h5.write(g + "name", names);
    h5.write(g + "speed", speed, "1/s");
    h5.write(g + "gas_flow_normal", gas, "m3/s");
    h5.write(g + "measured", meas, "s");
    h5.write(g + "fitted", fit, "s");
    h5.write(g + "before", before, "s");
    h5.write(g + "residual_log", res, "1");
    h5.write(g + "sensitivity", sens, "1");
    h5.attribute(g + "sensitivity", "meaning", "d ln theta / d ln c_t at the fit");
    h5.write(g + "weight", weight, "1");
    h5.write(g + "warnings", mix->warnings);
  }
}

std::string calibration_text(const CalibrationSources& src, const KlaCalibration* kla, const MixingCalibration* mix) {
  std::string s;
  if (kla) {
    const int p = static_cast<int>(pct(kla->confidence));
    s += fmt::format("kLa calibration of {} to {} ({} points)\n", src.case_file, src.kla_data, kla->points);
    s += "  kLa = a (Pg/V)^alpha vs^beta (SI), weighted least squares on ln kLa\n";
    s += fmt::format("  {:<8} {:>10}  {:<26} {:>10}\n", "", "fitted", fmt::format("{} % interval", p), "before");
    s += fmt::format("  {:<8} {:>10.4g}  {:<26} {:>10.4g}\n", "a", kla->fitted.prefactor,
                     interval(kla->prefactor_lo, kla->prefactor_hi), kla->before.prefactor);
    s += fmt::format("  {:<8} {:>10.3g}  {:<26} {:>10.3g}\n", "alpha", kla->fitted.power_exponent,
                     held_or_interval(kla->power_exponent_fitted, kla->power_exponent_lo, kla->power_exponent_hi),
                     kla->before.power_exponent);
    s += fmt::format("  {:<8} {:>10.3g}  {:<26} {:>10.3g}\n", "beta", kla->fitted.gas_exponent,
                     held_or_interval(kla->gas_exponent_fitted, kla->gas_exponent_lo, kla->gas_exponent_hi),
                     kla->before.gas_exponent);
    s += fmt::format("  {}scatter {:.1f} % (RMS of ln fitted/measured), {} unknowns\n",
                     r_squared(*kla, "R^2 {:.3f} (ln kLa), "), 100.0 * kla->rms_log, kla->parameters);
    s += fmt::format("  covered: speed {:.4g}-{:.4g} rpm, gas {:.3g}-{:.3g} vvm, Pg/V {:.3g}-{:.3g} kW/m3, vs {:.3g}-{:.3g} mm/s "
                     "(beyond: extrapolation)\n",
                     rpm(kla->speed_min_rps), rpm(kla->speed_max_rps), kla->vvm_min, kla->vvm_max, kla->pv_min / 1e3,
                     kla->pv_max / 1e3, kla->vs_min * 1e3, kla->vs_max * 1e3);
    if (kla->zone_check_max_deviation >= 0.0 && kla->zone_check_max_deviation < 1e-9) {
      s += "  zone model (steady field, fitted constants): volume-mean kLa equal to the fit (kla_normalise)\n";
    } else if (kla->zone_check_max_deviation >= 0.0) {
      s += fmt::format("  zone model (steady field, fitted constants): volume-mean kLa within {:.2g} % of the fit\n",
                       100.0 * kla->zone_check_max_deviation);
    }
    s += fmt::format("  {:<14} {:>7} {:>6} {:>8} {:>6} {:>9} {:>9} {:>9} {:>7}\n", "point", "speed", "gas", "Pg/V",
                     "vs", "kLa meas", "fitted", "zone", "resid.");
    s += fmt::format("  {:<14} {:>7} {:>6} {:>8} {:>6} {:>9} {:>9} {:>9} {:>7}\n", "", "[rpm]", "[vvm]", "[kW/m3]",
                     "[mm/s]", "[1/h]", "[1/h]", "[1/h]", "[%]");
    for (const auto& r : kla->rows) {
      s += fmt::format("  {:<14} {:>7.4g} {:>6.3g} {:>8.3g} {:>6.3g} {:>9.4g} {:>9.4g} {:>9} {:>+7.1f}\n",
                       r.name.substr(0, 14), rpm(r.speed_rps), vvm(r.gas_normal_m3_s, r.working_volume_m3),
                       r.inputs.power_per_volume_w_m3 / 1e3, r.inputs.superficial_gas_m_s * 1e3, per_h(r.measured_1_s),
                       per_h(r.fitted_1_s), r.zone_mean_1_s >= 0.0 ? fmt::format("{:.4g}", per_h(r.zone_mean_1_s)) : "-",
                       100.0 * std::expm1(r.residual_log));
    }
  }
  if (mix) {
    const int p = static_cast<int>(pct(mix->confidence));
    s += fmt::format("Exchange-constant calibration of {} to {} ({} points, {} mixing-time computations)\n",
                     src.case_file, src.mixing_data, mix->points, mix->evaluations);
    s += fmt::format("  c_t {:.4g} ({} % interval {}), before {:.4g}; scatter {:.1f} %\n", mix->fitted, p,
                     interval(mix->lo, mix->hi), mix->before, 100.0 * mix->rms_log);
    s += fmt::format("  {:<14} {:>7} {:>6} {:>9} {:>9} {:>9} {:>7} {:>8}\n", "point", "speed", "gas", "theta",
                     "fitted", "before", "resid.", "dln/dln");
    s += fmt::format("  {:<14} {:>7} {:>6} {:>9} {:>9} {:>9} {:>7} {:>8}\n", "", "[rpm]", "[vvm]", "[s]", "[s]", "[s]",
                     "[%]", "c_t");
    for (const auto& r : mix->rows) {
      s += fmt::format("  {:<14} {:>7.4g} {:>6.3g} {:>9.4g} {:>9.4g} {:>9.4g} {:>+7.1f} {:>8.3f}\n", r.name.substr(0, 14),
                       rpm(r.speed_rps), vvm(r.gas_normal_m3_s, r.working_volume_m3), r.measured_s, r.fitted_s,
                       r.before_s, 100.0 * std::expm1(r.residual_log), r.sensitivity);
    }
  }
  return s;
}

std::string calibration_report_body(const CalibrationSources& src, const KlaCalibration* kla,
                                    const MixingCalibration* mix) {
  std::string s = "<h2>Calibration of " + escape(src.case_file) + "</h2>\n";
  auto table_row = [&s](const std::string& q, const std::string& v, const std::string& i, const std::string& b) {
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{}</td><td>{}</td><td class=\"num\">{}</td></tr>\n", escape(q),
                     escape(v), escape(i), escape(b));
  };
  auto warnings = [&s](const std::vector<std::string>& ws) {
    s += "<h3>Warnings</h3>\n";
    if (ws.empty()) {
      s += "<p>None.</p>\n";
      return;
    }
    s += "<ul>\n";
    for (const auto& w : ws) s += "<li>" + escape(w) + "</li>\n";
    s += "</ul>\n";
  };
  if (kla) {
    const int p = static_cast<int>(pct(kla->confidence));
    s += "<h3>kLa correlation from " + escape(src.kla_data) + "</h3>\n<div class=\"row\"><div>\n";
    s += fmt::format("<table><tr><th>constant</th><th>fitted</th><th>{} % interval</th><th>before</th></tr>\n", p);
    table_row("a (SI)", fmt::format("{:.4g}", kla->fitted.prefactor), interval(kla->prefactor_lo, kla->prefactor_hi),
              fmt::format("{:.4g}", kla->before.prefactor));
    table_row("alpha (on Pg/V)", fmt::format("{:.3g}", kla->fitted.power_exponent),
              held_or_interval(kla->power_exponent_fitted, kla->power_exponent_lo, kla->power_exponent_hi),
              fmt::format("{:.3g}", kla->before.power_exponent));
    table_row("beta (on vs)", fmt::format("{:.3g}", kla->fitted.gas_exponent),
              held_or_interval(kla->gas_exponent_fitted, kla->gas_exponent_lo, kla->gas_exponent_hi),
              fmt::format("{:.3g}", kla->before.gas_exponent));
    s += "</table>\n";
    s += fmt::format("<p>{} points, {} unknowns; {}scatter {:.1f} % (RMS of ln fitted/measured). "
                     "Covered: Pg/V {:.3g}&ndash;{:.3g} kW/m&sup3;, vs {:.3g}&ndash;{:.3g} mm/s; beyond that range the "
                     "correlation is an extrapolation.</p>\n",
                     kla->points, kla->parameters, r_squared(*kla, "R&sup2; (ln kLa) {:.3f}; "), 100.0 * kla->rms_log,
                     kla->pv_min / 1e3,
                     kla->pv_max / 1e3, kla->vs_min * 1e3, kla->vs_max * 1e3);
    s += "</div><div>\n";
    warnings(kla->warnings);
    s += "</div></div>\n<div class=\"row\">\n";
    std::vector<svg::ScatterPoint> parity;
    double lo = 1e300, hi = 0.0;
    for (const auto& r : kla->rows) {
      for (double v : {r.measured_1_s, r.fitted_1_s, r.before_1_s}) lo = std::min(lo, per_h(v)), hi = std::max(hi, per_h(v));
    }
    for (int k = 0; k <= 40; ++k) parity.push_back({lo + (hi - lo) * k / 40.0, lo + (hi - lo) * k / 40.0, 0});
    for (const auto& r : kla->rows) parity.push_back({per_h(r.measured_1_s), per_h(r.before_1_s), 1});
    for (const auto& r : kla->rows) parity.push_back({per_h(r.measured_1_s), per_h(r.fitted_1_s), 2});
    s += svg::scatter_chart("kLa: predicted against measured", "measured kLa [1/h]", "predicted kLa [1/h]", parity,
                            {"measured = predicted", "before the fit", "fitted"}, {"#c7c7c7", "#7f7f7f", "#ff7f0e"});
    std::vector<svg::ScatterPoint> resid;
    for (const auto& r : kla->rows) {
      resid.push_back({r.inputs.power_per_volume_w_m3 / 1e3, 100.0 * std::expm1(r.residual_log), 0});
    }
    s += svg::scatter_chart("kLa residuals (fitted / measured - 1)", "Pg/V [kW/m3]", "residual [%]", resid, {"points"},
                            {"#1f77b4"});
    s += "</div>\n";
    s += "<table><tr><th>point</th><th>speed [rpm]</th><th>gas [vvm]</th><th>Pg/V [kW/m3]</th><th>vs [mm/s]</th>"
         "<th>kLa measured [1/h]</th><th>fitted [1/h]</th><th>zone model [1/h]</th><th>residual [%]</th></tr>\n";
    for (const auto& r : kla->rows) {
      s += fmt::format("<tr><td>{}</td><td class=\"num\">{:.4g}</td><td class=\"num\">{:.3g}</td><td class=\"num\">{:.3g}"
                       "</td><td class=\"num\">{:.3g}</td><td class=\"num\">{:.4g}</td><td class=\"num\">{:.4g}</td>"
                       "<td class=\"num\">{}</td><td class=\"num\">{:+.1f}</td></tr>\n",
                       escape(r.name), rpm(r.speed_rps), vvm(r.gas_normal_m3_s, r.working_volume_m3),
                       r.inputs.power_per_volume_w_m3 / 1e3, r.inputs.superficial_gas_m_s * 1e3, per_h(r.measured_1_s),
                       per_h(r.fitted_1_s), r.zone_mean_1_s >= 0.0 ? fmt::format("{:.4g}", per_h(r.zone_mean_1_s)) : "-",
                       100.0 * std::expm1(r.residual_log));
    }
    s += "</table>\n";
  }
  if (mix) {
    const int p = static_cast<int>(pct(mix->confidence));
    s += "<h3>Exchange constant from " + escape(src.mixing_data) + "</h3>\n<div class=\"row\"><div>\n";
    s += fmt::format("<table><tr><th>constant</th><th>fitted</th><th>{} % interval</th><th>before</th></tr>\n", p);
    table_row("exchange constant c_t", fmt::format("{:.4g}", mix->fitted), interval(mix->lo, mix->hi),
              fmt::format("{:.4g}", mix->before));
    s += "</table>\n";
    s += fmt::format("<p>{} points; scatter {:.1f} % (RMS of ln fitted/measured); {} mixing-time computations.</p>\n",
                     mix->points, 100.0 * mix->rms_log, mix->evaluations);
    if (!mix->not_determined.empty()) {
      s += "<p><strong>Not set in calibration.toml:</strong> " + escape(mix->not_determined) + ".</p>\n";
    }
    s += "</div><div>\n";
    warnings(mix->warnings);
    s += "</div></div>\n<div class=\"row\">\n";
    std::vector<svg::ScatterPoint> parity;
    double lo = 1e300, hi = 0.0;
    for (const auto& r : mix->rows) {
      for (double v : {r.measured_s, r.fitted_s, r.before_s}) lo = std::min(lo, v), hi = std::max(hi, v);
    }
    for (int k = 0; k <= 40; ++k) parity.push_back({lo + (hi - lo) * k / 40.0, lo + (hi - lo) * k / 40.0, 0});
    for (const auto& r : mix->rows) parity.push_back({r.measured_s, r.before_s, 1});
    for (const auto& r : mix->rows) parity.push_back({r.measured_s, r.fitted_s, 2});
    s += svg::scatter_chart("Mixing time: computed against measured", "measured mixing time [s]",
                            "computed mixing time [s]", parity, {"measured = computed", "before the fit", "fitted"},
                            {"#c7c7c7", "#7f7f7f", "#ff7f0e"});
    s += "</div>\n";
  }
  s += R"html(<h3>Method</h3>
<p>Each measured operating point is run through the case: its speed and gas flow (and head
pressure and temperature when given) set as overrides, the impeller power, gassed power and gas
flow computed by the same hydrodynamics the prediction uses. The kLa correlation of van 't Riet
(1979), kLa = a (Pg/V)<sup>&alpha;</sup> v<sub>s</sub><sup>&beta;</sup> &times;
1.024<sup>T&minus;20&nbsp;&deg;C</sup> &times; kla_factor, with Pg/V the gassed power per working
volume and v<sub>s</sub> the superficial gas velocity at mid-height, is fitted by weighted least
squares on ln kLa; intervals from s&sup2;(X<sup>T</sup>WX)<sup>&minus;1</sup> and the Student-t
quantile, assuming the model holds and the scatter is independent. An exponent whose regressor
hardly varies over the data, or the gas exponent when P/V and v<sub>s</sub> move together, is held
at the case's value. The exchange constant c<sub>t</sub> of D<sub>t</sub> = c<sub>t</sub>
&epsilon;<sup>1/3</sup> T<sup>4/3</sup> is fitted so the network's tracer mixing times match the
measured ones on the log scale (a scan over ln c<sub>t</sub>, then golden-section refinement); its
interval follows from the residual scatter and the sensitivities d ln &theta; / d ln c<sub>t</sub>.
The fitted constants describe this vessel over the range measured; at another scale they are as
good as the correlation's form.</p>
)html";
  return s;
}

}  // namespace oxystrat
