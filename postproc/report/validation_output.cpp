#include "postproc/report/validation_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <fstream>
#include <stdexcept>

#include "postproc/report/report.hpp"
#include "postproc/report/svg_plot.hpp"
#include "input/errors.hpp"

namespace oxystrat {
namespace {

std::string quote(const std::string& s) {
  std::string out = "\"";
  for (char c : s) out += c == '"' ? std::string("\"\"") : std::string(1, c);
  return out + "\"";
}

std::string tolerance_text(const ValidationCheck& c) {
  return c.relative ? fmt::format("{:g} %", 100 * c.tolerance) : fmt::format("{:g} {}", c.tolerance, c.unit);
}

std::string error_text(const ValidationResult& r) {
  return r.check->relative ? fmt::format("{:+.3g} %", 100 * r.error) : fmt::format("{:+.3g} {}", r.error, r.check->unit);
}

}  // namespace

void write_validation_csv(const std::string& path, const std::vector<ValidationResult>& results) {
  std::ofstream out(path);
  out << "group,quantity,source,unit,published,model,error,tolerance,relative,pass,why\n";
  for (const auto& r : results) {
    const auto& c = *r.check;
    out << quote(c.group) << "," << quote(c.quantity) << "," << quote(c.source) << "," << quote(c.unit) << ","
        << fmt::format("{:.10g},{:.10g},{:.4g},{:.4g}", c.reference, r.model, r.error, c.tolerance) << ","
        << (c.relative ? 1 : 0) << "," << (r.passed ? "pass" : "FAIL") << "," << quote(c.why) << "\n";
  }
  finish_file(out, path);
}

void write_validation_h5(H5Writer& h5, const std::vector<ValidationResult>& results) {
  std::vector<std::string> group, quantity, source, unit;
  std::vector<double> ref, model, error, tol;
  std::vector<int> pass, rel;
  for (const auto& r : results) {
    group.push_back(r.check->group);
    quantity.push_back(r.check->quantity);
    source.push_back(r.check->source);
    unit.push_back(r.check->unit);
    ref.push_back(r.check->reference);
    model.push_back(r.model);
    error.push_back(r.error);
    tol.push_back(r.check->tolerance);
    pass.push_back(r.passed);
    rel.push_back(r.check->relative);
  }
  h5.write("/validation/group", group);
  h5.write("/validation/quantity", quantity);
  h5.write("/validation/source", source);
  h5.write("/validation/unit", unit);
  h5.write("/validation/published", ref, "see /validation/unit");
  h5.write("/validation/model", model, "see /validation/unit");
  h5.write("/validation/error", error, "see /validation/unit, or 1 where /validation/relative is 1");
  h5.write("/validation/tolerance", tol, "as /validation/error");
  h5.write("/validation/relative", rel, "1");
  h5.write("/validation/pass", pass, "1");
}

std::string validation_html(const std::vector<ValidationResult>& results) {
  size_t passed = 0;
  for (const auto& r : results) passed += r.passed;
  std::string s = fmt::format("<h2>Validation</h2>\n<p>{} of {} checks pass. Each compares the model with a published "
                              "value, an analytic limit or an exact conservation law; the same list runs in the test "
                              "suite (tests/solver/validation_test.cpp).</p>\n",
                              passed, results.size());
  s += "<table><tr><th>group</th><th>quantity</th><th>source</th><th>published</th><th>model</th><th>error</th>"
       "<th>tolerance</th><th>result</th><th>why this tolerance</th></tr>\n";
  for (const auto& r : results) {
    const auto& c = *r.check;
    s += fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td><td class=\"num\">{:.6g} {}</td><td class=\"num\">{:.6g}</td>"
                     "<td class=\"num\">{}</td><td>{}</td><td>{}</td><td>{}</td></tr>\n",
                     svg::escape(c.group), svg::escape(c.quantity), svg::escape(c.source), c.reference, svg::escape(c.unit),
                     r.model, svg::escape(error_text(r)), svg::escape(tolerance_text(c)),
                     r.passed ? "pass" : "<b style=\"color:#d62728\">FAIL</b>", svg::escape(c.why));
  }
  return s + "</table>\n";
}

std::string validation_text(const std::vector<ValidationResult>& results) {
  std::string s;
  for (const auto& r : results) {
    s += fmt::format("{:<5} {:<13} {:<70.70} ref {:<11.6g} model {:<11.6g} err {:<10} (tol {})\n",
                     r.passed ? "pass" : "FAIL", r.check->group, r.check->quantity, r.check->reference, r.model,
                     error_text(r), tolerance_text(*r.check));
  }
  return s;
}

}  // namespace oxystrat
