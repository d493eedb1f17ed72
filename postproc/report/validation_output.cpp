#include "postproc/report/validation_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>

#include "postproc/report/report.hpp"
#include "postproc/report/svg_plot.hpp"

namespace oxystrat {
namespace {

std::string quote(const std::string& s) {
  std::string out = "\"";
  for (char c : s) out += c == '"' ? std::string("\"\"") : std::string(1, c);
  return out + "\"";
}

std::string band_text(const ValidationCheck& c) {
  return c.relative ? fmt::format("{:g} %", 100 * c.tolerance) : fmt::format("{:g} {}", c.tolerance, c.unit);
}

std::string error_text(const ValidationResult& r) {
  if (!r.computed) return "-";
  return r.check->relative ? fmt::format("{:+.3g} %", 100 * r.error) : fmt::format("{:+.3g} {}", r.error, r.check->unit);
}

std::string model_text(const ValidationResult& r) { return r.computed ? fmt::format("{:.6g}", r.model) : "not computed"; }

bool is_validation(const ValidationResult& r) { return r.check->kind == CheckKind::validation; }

// A verification check that fails is a bug; a validation row outside its band is a finding.
const char* outcome(const ValidationResult& r) {
  if (!r.computed) return "ERROR";
  if (r.passed) return is_validation(r) ? "inside" : "pass";
  return is_validation(r) ? "MISS" : "FAIL";
}

// The relative error of each validation row, one colour per quantity: misses and biases at a glance.
std::string validation_error_chart(const std::vector<ValidationResult>& results) {
  static const std::vector<std::string> colors = {"#1f77b4", "#ff7f0e", "#2ca02c", "#d62728", "#9467bd", "#8c564b"};
  std::vector<std::string> groups;
  std::vector<svg::ScatterPoint> points;
  int row = 0;
  for (const auto& r : results) {
    if (!is_validation(r)) continue;
    ++row;
    if (!r.computed || !r.check->relative) continue;
    auto g = std::find(groups.begin(), groups.end(), r.check->group);
    if (g == groups.end()) g = groups.insert(groups.end(), r.check->group);
    points.push_back({static_cast<double>(row), 100.0 * r.error, static_cast<int>(g - groups.begin())});
  }
  if (points.empty()) return "";
  std::vector<std::string> palette;
  for (size_t i = 0; i < groups.size(); ++i) palette.push_back(colors[i % colors.size()]);
  return svg::scatter_chart("Model error of each validation row", "row of the table above",
                            "(model - measured) / measured [%]", points, groups, palette, 620, 360, false) +
         "\n";
}

}  // namespace

ValidationTally tally(const std::vector<ValidationResult>& results) {
  ValidationTally t;
  for (const auto& r : results) {
    if (is_validation(r)) {
      ++t.validation_rows;
      t.inside_band += r.passed ? 1 : 0;
      t.errors += r.computed ? 0 : 1;
    } else {
      ++t.verification_checks;
      t.verification_failed += r.passed ? 0 : 1;
    }
  }
  return t;
}

void write_validation_csv(const std::string& path, const std::vector<ValidationResult>& results) {
  std::ofstream out(path);
  out << "kind,group,quantity,conditions,source,unit,reference,model,error,band,relative,outcome,why,known_miss\n";
  for (const auto& r : results) {
    const auto& c = *r.check;
    out << kind_name(c.kind) << "," << quote(c.group) << "," << quote(c.quantity) << "," << quote(c.conditions) << ","
        << quote(c.source) << "," << quote(c.unit) << "," << fmt::format("{:.10g}", c.reference) << ","
        << (r.computed ? fmt::format("{:.10g}", r.model) : "") << ","
        << (r.computed ? fmt::format("{:.4g}", r.error) : "") << "," << fmt::format("{:.4g}", c.tolerance) << ","
        << (c.relative ? 1 : 0) << "," << outcome(r) << "," << quote(c.why) << "," << quote(c.known_miss) << "\n";
  }
  finish_file(out, path);
}

void write_validation_h5(H5Writer& h5, const std::vector<ValidationResult>& results) {
  std::vector<std::string> kind, group, quantity, conditions, source, unit, known_miss, outcomes;
  std::vector<double> ref, model, error, band;
  std::vector<int> pass, rel, computed;
  for (const auto& r : results) {
    kind.push_back(kind_name(r.check->kind));
    group.push_back(r.check->group);
    quantity.push_back(r.check->quantity);
    conditions.push_back(r.check->conditions);
    source.push_back(r.check->source);
    unit.push_back(r.check->unit);
    known_miss.push_back(r.check->known_miss);
    outcomes.push_back(outcome(r));
    ref.push_back(r.check->reference);
    model.push_back(r.computed ? r.model : 0.0);
    error.push_back(r.computed ? r.error : 0.0);
    band.push_back(r.check->tolerance);
    pass.push_back(r.passed);
    rel.push_back(r.check->relative);
    computed.push_back(r.computed);
  }
  h5.write("/validation/kind", kind);
  h5.attribute("/validation/kind", "meaning",
               "verification: the code computes its equations; calibration: a point a constant was fitted to; "
               "validation: a measured value or a correlation of measured data");
  h5.write("/validation/group", group);
  h5.write("/validation/quantity", quantity);
  h5.write("/validation/conditions", conditions);
  h5.write("/validation/source", source);
  h5.write("/validation/unit", unit);
  h5.write("/validation/reference", ref, "see /validation/unit");
  h5.write("/validation/model", model, "see /validation/unit");
  h5.attribute("/validation/model", "has_value", computed);
  h5.write("/validation/error", error, "see /validation/unit, or 1 where /validation/relative is 1");
  h5.attribute("/validation/error", "has_value", computed);
  h5.write("/validation/band", band, "as /validation/error");
  h5.write("/validation/relative", rel, "1");
  h5.write("/validation/inside_band", pass, "1");
  h5.write("/validation/outcome", outcomes);
  h5.write("/validation/known_miss", known_miss);
  const auto stats = validation_statistics(results);
  std::vector<std::string> sg;
  std::vector<int> rows, inside;
  std::vector<double> mean, mean_abs, max_abs;
  for (const auto& s : stats) {
    sg.push_back(s.group), rows.push_back(s.rows), inside.push_back(s.inside_band);
    mean.push_back(s.mean_error), mean_abs.push_back(s.mean_abs_error), max_abs.push_back(s.max_abs_error);
  }
  if (stats.empty()) return;
  h5.write("/validation/statistics/group", sg);
  h5.write("/validation/statistics/rows", rows, "1");
  h5.write("/validation/statistics/inside_band", inside, "1");
  h5.write("/validation/statistics/mean_error", mean, "1");
  h5.attribute("/validation/statistics/mean_error", "meaning", "mean of (model - measured) / measured: the bias");
  h5.write("/validation/statistics/mean_abs_error", mean_abs, "1");
  h5.write("/validation/statistics/max_abs_error", max_abs, "1");
}

std::string validation_html(const std::vector<ValidationResult>& results) {
  const auto t = tally(results);
  std::string s = fmt::format(
      "<p class=\"verdict\">Verification: {} of {} checks pass. Validation: {} of {} rows of measured data inside their "
      "acceptance band{}.</p>\n",
      t.verification_checks - t.verification_failed, t.verification_checks, t.inside_band, t.validation_rows,
      t.errors > 0 ? fmt::format(", {} not computed", t.errors) : "");
  s += "<h2>Verification</h2>\n<p>Does the code compute what its equations say? Identities, published check values of "
       "a formula, analytic limits, exact conservation, and the points a constant was fitted to (calibration). "
       "These prove the arithmetic, not the physics. The same list runs in the test suite "
       "(tests/solver/studies/validation_test.cpp).</p>\n";
  s += "<table><tr><th>kind</th><th>group</th><th>quantity</th><th>source</th><th>reference</th><th>model</th>"
       "<th>error</th><th>tolerance</th><th>result</th><th>why this tolerance</th></tr>\n";
  for (const auto& r : results) {
    if (is_validation(r)) continue;
    const auto& c = *r.check;
    s += fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td class=\"num\">{:.6g} {}</td>"
                     "<td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td><td>{}</td><td>{}</td></tr>\n",
                     kind_name(c.kind), svg::escape(c.group), svg::escape(c.quantity), svg::escape(c.source),
                     c.reference, svg::escape(c.unit), svg::escape(model_text(r)), svg::escape(error_text(r)),
                     svg::escape(band_text(c)),
                     r.passed ? "pass" : "<b style=\"color:#d62728\">FAIL</b>", svg::escape(c.why));
  }
  s += "</table>\n";
  s += "<h2>Validation against measured data</h2>\n<p>The model against values measured in published experiments, or "
       "against a correlation fitted to measured data (the source says which). Each band was set from the "
       "measurement's scatter, not from the model's result; rows outside it stay in the table with the reason. "
       "Tags: [pub] read in the source, [sec] read in a secondary source, \"from memory\": not yet checked against "
       "the source.</p>\n";
  s += "<table><tr><th>group</th><th>quantity</th><th>conditions</th><th>source</th><th>measured</th><th>model</th>"
       "<th>error</th><th>band</th><th>result</th><th>note</th></tr>\n";
  for (const auto& r : results) {
    if (!is_validation(r)) continue;
    const auto& c = *r.check;
    const std::string note = !r.computed ? r.failure : !c.known_miss.empty() ? c.known_miss : c.why;
    s += fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td class=\"num\">{:.6g} {}</td>"
                     "<td class=\"num\">{}</td><td class=\"num\">{}</td><td>{}</td><td>{}</td><td>{}</td></tr>\n",
                     svg::escape(c.group), svg::escape(c.quantity), svg::escape(c.conditions), svg::escape(c.source),
                     c.reference, svg::escape(c.unit), svg::escape(model_text(r)), svg::escape(error_text(r)),
                     svg::escape(band_text(c)), r.passed ? "inside" : "<b style=\"color:#d62728\">outside</b>",
                     svg::escape(note));
  }
  s += "</table>\n" + validation_error_chart(results);
  s += "<h3>Error of the model per quantity</h3>\n<p>Relative error (model - measured) / measured over the "
       "rows of each group; the mean is the bias.</p>\n<table><tr><th>group</th><th>rows</th><th>inside band</th>"
       "<th>mean error</th><th>mean |error|</th><th>largest |error|</th></tr>\n";
  for (const auto& st : validation_statistics(results)) {
    s += fmt::format("<tr><td>{}</td><td class=\"num\">{}</td><td class=\"num\">{}</td><td class=\"num\">{:+.1f} %</td>"
                     "<td class=\"num\">{:.1f} %</td><td class=\"num\">{:.1f} %</td></tr>\n",
                     svg::escape(st.group), st.rows, st.inside_band, 100 * st.mean_error, 100 * st.mean_abs_error,
                     100 * st.max_abs_error);
  }
  return s + "</table>\n";
}

std::string validation_text(const std::vector<ValidationResult>& results) {
  std::string s = "Verification (the code computes its equations; calibration: fitted points)\n";
  bool in_validation = false;
  for (const auto& r : results) {
    if (is_validation(r) && !in_validation) {
      in_validation = true;
      s += "\nValidation against measured data (band set from the measurement's scatter)\n";
    }
    s += fmt::format("{:<6} {:<15} {:<62.62} ref {:<10.6g} model {:<12} err {:<10} (band {})\n", outcome(r),
                     r.check->group, r.check->quantity, r.check->reference, model_text(r), error_text(r),
                     band_text(*r.check));
  }
  const auto stats = validation_statistics(results);
  if (!stats.empty()) {
    s += fmt::format("\n{:<18} {:>5} {:>7} {:>11} {:>12} {:>14}\n", "model error", "rows", "inside", "mean error",
                     "mean |error|", "largest |error|");
    for (const auto& st : stats) {
      s += fmt::format("{:<18} {:>5} {:>7} {:>10.1f}% {:>11.1f}% {:>13.1f}%\n", st.group, st.rows, st.inside_band,
                       100 * st.mean_error, 100 * st.mean_abs_error, 100 * st.max_abs_error);
    }
  }
  return s;
}

}  // namespace oxystrat
