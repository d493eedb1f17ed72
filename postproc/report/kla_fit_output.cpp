#include "postproc/report/kla_fit_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <stdexcept>

#include "postproc/report/svg_plot.hpp"
#include "input/errors.hpp"

namespace oxystrat {
namespace {

using svg::escape;

std::string si_do_unit(const DoTrace& tr) { return tr.scale == DoScale::saturation ? "1" : "mol/m3"; }

// SI -> the trace's own DO unit.
double in_unit(const DoTrace& tr, double si) { return si / tr.do_factor; }

std::vector<double> in_unit(const DoTrace& tr, const std::vector<double>& si) {
  std::vector<double> out;
  out.reserve(si.size());
  for (double v : si) out.push_back(in_unit(tr, v));
  return out;
}

std::string lag_mode_text(const KlaFitOptions& o) {
  switch (o.lag_mode) {
    case ProbeLagMode::fitted: return "fitted";
    case ProbeLagMode::fixed: return "given";
    case ProbeLagMode::none: return "none (instantaneous probe)";
  }
  return "";
}

std::string interval(double lo, double hi, double factor, const std::string& unit) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) return "undetermined";
  return fmt::format("{:.4g} to {:.4g} {}", lo * factor, hi * factor, unit);
}

std::string uptake_text(const DoTrace& tr, const KlaFitOptions& o) {
  if (o.uptake == 0.0) return "0 (no uptake)";
  if (tr.scale == DoScale::saturation) return fmt::format("{:.4g} %/h", 100.0 * 3600.0 * o.uptake);
  return fmt::format("{:.4g} mmol/(L h)", 3600.0 * o.uptake);
}

}  // namespace

void write_kla_fit_csv(const std::string& path, const DoTrace& tr, const KlaFitResult& fit) {
  std::ofstream out(path);
  const auto& u = tr.do_unit;
  out << fmt::format("time [s],DO measured [{0}],DO fitted [{0}],residual fitted - measured [{0}]\n", u);
  for (size_t i = 0; i < tr.time_s.size(); ++i) {
    out << fmt::format("{:.10g},{:.8g},{:.8g},{:.6g}\n", tr.time_s[i], in_unit(tr, tr.value[i]),
                       in_unit(tr, fit.fitted[i]), in_unit(tr, fit.residual[i]));
  }
  finish_file(out, path);
}

void write_kla_fit_h5(H5Writer& h5, const DoTrace& tr, const KlaFitOptions& o, const KlaFitResult& fit) {
  const std::string du = si_do_unit(tr);
  h5.write("/kla_fit/kla", fit.kla_1_s, "1/s");
  // An interval that cannot be computed (its parameter cannot be separated from the others) is
  // not written; the probe_lag attribute says so.
  const bool kla_interval = std::isfinite(fit.kla_ci_low_1_s) && std::isfinite(fit.kla_ci_high_1_s);
  const bool lag_interval = std::isfinite(fit.probe_lag_ci_low_s) && std::isfinite(fit.probe_lag_ci_high_s);
  if (kla_interval) {
    h5.write("/kla_fit/kla_ci_low", fit.kla_ci_low_1_s, "1/s");
    h5.write("/kla_fit/kla_ci_high", fit.kla_ci_high_1_s, "1/s");
    h5.attribute("/kla_fit/kla_ci_low", "meaning",
                 fmt::format("{:.0f} % confidence interval from s^2 (J^T J)^-1 and the Student-t quantile {:.6g}",
                             100.0 * o.confidence, fit.t_quantile));
  }
  h5.write("/kla_fit/probe_lag", fit.probe_lag_s, "s");
  h5.attribute("/kla_fit/probe_lag", "mode", lag_mode_text(o));
  if (lag_interval) {
    h5.write("/kla_fit/probe_lag_ci_low", fit.probe_lag_ci_low_s, "s");
    h5.write("/kla_fit/probe_lag_ci_high", fit.probe_lag_ci_high_s, "s");
  } else {
    h5.attribute("/kla_fit/probe_lag", "interval", "undetermined: the trace cannot separate tau_p from the step time");
  }
  h5.write("/kla_fit/cstar", fit.cstar, du);
  h5.attribute("/kla_fit/cstar", "mode", o.saturation ? "given" : "fitted");
  h5.write("/kla_fit/steady", fit.steady, du);
  h5.attribute("/kla_fit/steady", "meaning", "C* - OUR/kLa, the level the trace approaches");
  h5.write("/kla_fit/c0", fit.c0, du);
  h5.write("/kla_fit/step_time", fit.step_time_s, "s");
  h5.write("/kla_fit/uptake", o.uptake, tr.scale == DoScale::saturation ? "1/s" : "mol/(m3 s)");
  h5.write("/kla_fit/residual_rms", fit.rms, du);
  h5.write("/kla_fit/time", tr.time_s, "s");
  h5.write("/kla_fit/measured", tr.value, du);
  h5.write("/kla_fit/fitted", fit.fitted, du);
  h5.write("/kla_fit/residual", fit.residual, du);
  h5.attribute("/kla_fit/residual", "meaning", "fitted - measured");
  if (tr.scale == DoScale::saturation) {
    for (const char* p : {"/kla_fit/cstar", "/kla_fit/measured", "/kla_fit/fitted"}) {
      h5.attribute(p, "quantity", "dissolved O2 as a fraction of air saturation");
    }
  }
  h5.write("/kla_fit/warnings", fit.warnings);
  h5.write("/kla_fit/source", tr.file_name);
}

std::string kla_fit_text(const DoTrace& tr, const KlaFitOptions& o, const KlaFitResult& fit) {
  const int pct = static_cast<int>(std::lround(100.0 * o.confidence));
  const auto& u = tr.do_unit;
  std::string s = fmt::format("kLa fit of {} ({} points, DO in {}, probe lag {})\n", tr.file_name, fit.points, u,
                              lag_mode_text(o));
  s += fmt::format("  kLa           {:.4g} 1/s = {:.4g} 1/h\n", fit.kla_1_s, 3600.0 * fit.kla_1_s);
  s += fmt::format("                {} % interval {} = {}\n", pct, interval(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, 1.0, "1/s"),
                   interval(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, 3600.0, "1/h"));
  if (o.lag_mode == ProbeLagMode::fitted) {
    s += fmt::format("  probe lag     {:.4g} s ({} % interval {})\n", fit.probe_lag_s, pct,
                     interval(fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s, 1.0, "s"));
  } else {
    s += fmt::format("  probe lag     {:.4g} s ({})\n", fit.probe_lag_s, lag_mode_text(o));
  }
  s += fmt::format("  kLa tau_p     {:.3g}\n", fit.kla_tau);
  if (o.saturation) {
    s += fmt::format("  C*            {:.4g} {} (given)\n", in_unit(tr, fit.cstar), u);
  } else {
    s += fmt::format("  C*            {:.4g} {} (fitted; {} % interval {})\n", in_unit(tr, fit.cstar), u, pct,
                     interval(fit.cstar_ci_low / tr.do_factor, fit.cstar_ci_high / tr.do_factor, 1.0, u));
  }
  if (o.uptake > 0.0) {
    s += fmt::format("  OUR           {}; steady level C* - OUR/kLa = {:.4g} {}\n", uptake_text(tr, o),
                     in_unit(tr, fit.steady), u);
  }
  s += fmt::format("  C0            {:.4g} {} at the step, t0 = {:.4g} s{}\n", in_unit(tr, fit.c0), u, fit.step_time_s,
                   fit.step_at_first_row ? " (the first row)" : "");
  s += fmt::format("  residual RMS  {:.3g} {}\n", in_unit(tr, fit.rms), u);
  s += fmt::format("  points        {} ({} unknowns: {}; Student-t {:.4g} on {} degrees of freedom)\n", fit.points,
                   fit.parameters, fmt::join(fit.free_parameters, ", "), fit.t_quantile, fit.points - fit.parameters);
  return s;
}

std::string kla_fit_report_body(const DoTrace& tr, const KlaFitOptions& o, const KlaFitResult& fit) {
  const int pct = static_cast<int>(std::lround(100.0 * o.confidence));
  const auto& u = tr.do_unit;
  std::string s = "<h2>kLa from the gassing-out trace " + escape(tr.file_name) + "</h2>\n<div class=\"row\"><div>\n";
  s += "<h3>Result</h3>\n<table><tr><th>quantity</th><th>value</th><th>unit</th></tr>\n";
  auto row = [&s](const std::string& q, const std::string& v, const std::string& unit) {
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{}</td><td>{}</td></tr>\n", escape(q), escape(v), escape(unit));
  };
  row("kLa", fmt::format("{:.4g}", fit.kla_1_s), "1/s");
  row("kLa", fmt::format("{:.4g}", 3600.0 * fit.kla_1_s), "1/h");
  row(fmt::format("kLa, {} % interval", pct), interval(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, 3600.0, ""), "1/h");
  row("probe lag tau_p (" + lag_mode_text(o) + ")", fmt::format("{:.4g}", fit.probe_lag_s), "s");
  if (o.lag_mode == ProbeLagMode::fitted) {
    row(fmt::format("tau_p, {} % interval", pct), interval(fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s, 1.0, ""), "s");
  }
  row("kLa tau_p", fmt::format("{:.3g}", fit.kla_tau), "-");
  row(o.saturation ? "C* (given)" : "C* (fitted)", fmt::format("{:.4g}", in_unit(tr, fit.cstar)), u);
  if (o.uptake > 0.0) {
    row("OUR", uptake_text(tr, o), "");
    row("steady level C* - OUR/kLa", fmt::format("{:.4g}", in_unit(tr, fit.steady)), u);
  }
  row("C0 at the step", fmt::format("{:.4g}", in_unit(tr, fit.c0)), u);
  row("step time t0", fmt::format("{:.4g}", fit.step_time_s), "s");
  row("residual RMS", fmt::format("{:.3g}", in_unit(tr, fit.rms)), u);
  row("points", fmt::format("{}", fit.points), "");
  row("unknowns", fmt::format("{}", fmt::join(fit.free_parameters, ", ")), "");
  s += "</table>\n</div><div>\n<h3>Warnings</h3>\n";
  if (fit.warnings.empty()) {
    s += "<p>None.</p>\n";
  } else {
    s += "<ul>\n";
    for (const auto& w : fit.warnings) s += "<li>" + escape(w) + "</li>\n";
    s += "</ul>\n";
  }
  s += "</div></div>\n<div class=\"row\">\n";
  // The fitted curve on a fine grid, so the probe's slow start shows between the samples.
  std::vector<double> fine_t;
  const double t0 = tr.time_s.front(), t1 = tr.time_s.back();
  for (int i = 0; i <= 400; ++i) fine_t.push_back(t0 + (t1 - t0) * i / 400.0);
  const auto fine_y = in_unit(tr, kla_model_values(fit, fine_t));
  s += svg::line_chart("DO trace and fit", "time [s]", "DO [" + u + "]",
                       {{"measured", tr.time_s, in_unit(tr, tr.value), "#7f7f7f", false, true},
                        {"fit", fine_t, fine_y, "#ff7f0e"}},
                       {{true, fit.step_time_s, "step"}}, 520, 380);
  s += svg::line_chart("Residuals (fit - measured)", "time [s]", "residual [" + u + "]",
                       {{"residual", tr.time_s, in_unit(tr, fit.residual), "#1f77b4", false, true}},
                       {{false, 0.0, ""}}, 520, 380);
  s += "</div>\n";
  s += R"html(<h3>Method</h3>
<p>Dynamic gassing-out: after the dissolved O2 has been lowered and aeration resumes, the liquid
follows dC/dt = kLa (C* &minus; C) &minus; OUR and the probe follows it with a first-order lag,
&tau;<sub>p</sub> dC<sub>p</sub>/dt = C &minus; C<sub>p</sub> (Badino, Facciotti &amp; Schmidell
2000). For a step from C0 at t0 the probe reads C&#8734; &minus; (C&#8734; &minus; C0)
[e<sup>&minus;kLa s</sup> &minus; kLa &tau;<sub>p</sub> e<sup>&minus;s/&tau;<sub>p</sub></sup>] /
(1 &minus; kLa &tau;<sub>p</sub>), s = t &minus; t0, C&#8734; = C* &minus; OUR/kLa. The unknowns are
fitted by Levenberg&ndash;Marquardt with the analytic Jacobian; intervals come from
s&sup2;(J<sup>T</sup>J)<sup>&minus;1</sup> and the Student-t quantile, i.e. they assume the model
is right and the noise independent. The response is symmetric in kLa and 1/&tau;<sub>p</sub>; a
fitted lag is taken as the faster of the two. When kLa &tau;<sub>p</sub> exceeds about 0.1 the lag
matters; measure it separately where it cannot be fitted well.</p>
)html";
  return s;
}

}  // namespace oxystrat
