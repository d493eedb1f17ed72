#include "postproc/report/table_output.hpp"
#include "postproc/io/file_output.hpp"
#include "input/errors.hpp"
#include "solver/studies/sweep_choice.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <cstdio>
#include <fstream>
#include <sstream>
#include <stdexcept>

namespace oxystrat {
namespace {

std::string cell(double v) { return std::isfinite(v) ? fmt::format("{:.6g}", v) : ""; }

std::string one_line(std::string s) {
  for (auto& c : s) {
    if (c == '\t' || c == '\n' || c == '\r') c = ' ';
  }
  return s;
}

std::string csv_quote(const std::string& s) {
  std::string out = "\"";
  for (char c : s) out += c == '"' ? std::string("\"\"") : std::string(1, c);
  return out + "\"";
}

void check_stream(std::ofstream& out, const std::string& path) { finish_file(out, path); }

// The rows of a table of several value lists: every name in the order first seen. A value that
// applies to one case only (say operating_cost with a [prices] table) still gets its row.
std::vector<const SummaryValue*> row_names(const std::vector<std::vector<SummaryValue>>& values) {
  std::vector<const SummaryValue*> rows;
  for (const auto& list : values) {
    for (const auto& v : list) {
      if (std::none_of(rows.begin(), rows.end(), [&](const SummaryValue* r) { return r->name == v.name; })) rows.push_back(&v);
    }
  }
  return rows;
}

// The value named `name` in `list`, SI (files for programs) or in its display unit (tables for
// people); NaN when it does not apply there.
double value_named(const std::vector<SummaryValue>& list, const std::string& name, bool display) {
  for (const auto& v : list) {
    if (v.name == name) return display ? v.display() : v.value;
  }
  return std::numeric_limits<double>::quiet_NaN();
}

std::vector<std::vector<SummaryValue>> ok_values(const std::vector<PointResult>& results) {
  std::vector<std::vector<SummaryValue>> v;
  for (const auto& r : results) {
    if (r.ok) v.push_back(r.values);
  }
  return v;
}

// One value per case or point. A value that does not apply (no gas) or a failed point has no
// entry: such entries hold 0 and the attribute has_value (1/0 per entry) marks them; a column with
// no value at all is not written (docs/outputs.md). NaN is never written.
void write_column(H5Writer& h5, const std::string& path, const std::vector<double>& values, const std::string& unit,
                  const std::string& label) {
  std::vector<int> has(values.size());
  std::vector<double> written(values.size(), 0.0);
  size_t count = 0;
  for (size_t i = 0; i < values.size(); ++i) {
    has[i] = std::isfinite(values[i]) ? 1 : 0;
    if (has[i]) written[i] = values[i], ++count;
  }
  if (count == 0) return;
  h5.write(path, written, unit);
  if (!label.empty()) h5.attribute(path, "label", label);
  if (count < values.size()) h5.attribute(path, "has_value", has);
}

}  // namespace

void write_compare_csv(const std::string& path, const std::vector<std::string>& names,
                       const std::vector<std::vector<SummaryValue>>& values, const std::vector<std::string>& violated) {
  std::ofstream out(path);
  out << "quantity,unit";
  for (const auto& n : names) out << "," << csv_quote(n);
  out << "\n";
  for (const auto* row : row_names(values)) {
    out << row->name << "," << row->shown_unit();
    for (const auto& v : values) out << "," << cell(value_named(v, row->name, true));
    out << "\n";
  }
  if (!violated.empty()) {
    out << "violated,text";
    for (const auto& v : violated) out << "," << csv_quote(v);
    out << "\n";
  }
  check_stream(out, path);
}

std::string compare_text(const std::vector<std::string>& names, const std::vector<std::vector<SummaryValue>>& values,
                         const std::vector<bool>& feasible, const std::vector<std::string>& violated) {
  std::string s = fmt::format("{:<28} {:<11}", "", "");
  for (const auto& n : names) s += fmt::format(" {:>16.16}", n);
  s += "\n";
  if (values.empty()) return s;
  for (const auto* row : row_names(values)) {
    s += fmt::format("{:<28} {:<11}", row->label, row->shown_unit());
    for (const auto& v : values) {
      const double x = value_named(v, row->name, true);
      s += fmt::format(" {:>16}", std::isfinite(x) ? fmt::format("{:.4g}", x) : "-");
    }
    s += "\n";
  }
  s += fmt::format("{:<28} {:<11}", "constraints", "");
  for (bool f : feasible) s += fmt::format(" {:>16}", f ? "met" : "VIOLATED");
  s += "\n";
  if (std::all_of(violated.begin(), violated.end(), [](const std::string& v) { return v.empty(); })) return s;
  s += fmt::format("{:<28} {:<11}", "  broken", "");
  for (const auto& v : violated) s += fmt::format(" {:>16}", v.empty() ? "-" : v);
  return s + "\n";
}

void write_compare_h5(H5Writer& h5, const std::vector<std::string>& names,
                      const std::vector<std::vector<SummaryValue>>& values, const std::vector<bool>& feasible,
                      const std::vector<std::string>& violated) {
  h5.write("/compare/names", names);
  std::vector<int> ok(feasible.begin(), feasible.end());
  h5.write("/compare/feasible", ok, "1");
  if (!violated.empty()) {
    h5.write("/compare/violated", violated);
    h5.attribute("/compare/violated", "meaning", "the constraints each case breaks, '; '-separated; empty: none");
  }
  for (const auto* r : row_names(values)) {
    std::vector<double> row;
    for (const auto& v : values) row.push_back(value_named(v, r->name, false));
    write_column(h5, "/compare/" + r->name, row, r->unit, r->label);  // SI, as /summary
  }
}

void write_sweep_csv(const std::string& path, const SweepPlan& plan, const std::vector<PointResult>& results,
                     const std::vector<bool>& pareto, int chosen) {
  std::ofstream out(path);
  const auto values = ok_values(results);
  const auto rows = row_names(values);
  out << "point";
  for (const auto& a : plan.axes) out << "," << a.key << " [" << a.unit << "]";
  out << ",ok,feasible,pareto,chosen";
  for (const auto* v : rows) out << "," << v->name << " [" << v->shown_unit() << "]";
  out << ",violated,error\n";
  for (size_t i = 0; i < results.size(); ++i) {
    out << i;
    for (double x : plan.points[i]) out << "," << fmt::format("{:.10g}", x);
    const auto& r = results[i];
    out << "," << (r.ok ? 1 : 0) << "," << (r.ok && r.feasible ? 1 : 0) << "," << (pareto[i] ? 1 : 0) << ","
        << (static_cast<int>(i) == chosen ? 1 : 0);
    for (const auto* v : rows) out << "," << (r.ok ? cell(value_named(r.values, v->name, true)) : "");
    out << "," << (r.ok ? csv_quote(broken_constraints(r)) : "\"\"");
    out << "," << (r.ok ? "" : csv_quote(one_line(r.error))) << "\n";
  }
  check_stream(out, path);
}

void write_sweep_h5(H5Writer& h5, const SweepPlan& plan, const std::vector<PointResult>& results,
                    const std::vector<bool>& pareto, int chosen, const std::string& objective,
                    const std::vector<std::string>& chosen_cautions) {
  const size_t n = results.size();
  for (size_t d = 0; d < plan.axes.size(); ++d) {
    std::vector<double> col(n);
    for (size_t i = 0; i < n; ++i) col[i] = plan.points[i][d];
    const std::string path = "/sweep/axes/" + plan.axes[d].key;
    h5.write(path, col, plan.axes[d].unit.empty() ? "1" : plan.axes[d].unit);
  }
  std::vector<int> ok(n), feas(n), par(n);
  std::vector<std::string> errors(n);
  for (size_t i = 0; i < n; ++i) {
    ok[i] = results[i].ok;
    feas[i] = results[i].ok && results[i].feasible;
    par[i] = pareto[i];
    errors[i] = results[i].error;
  }
  h5.write("/sweep/ok", ok, "1");
  h5.write("/sweep/feasible", feas, "1");
  h5.write("/sweep/pareto", par, "1");
  h5.write("/sweep/errors", errors);
  h5.write("/sweep/chosen", std::vector<int>{chosen}, "1");
  h5.attribute("/sweep/chosen", "meaning", "index of the feasible point with the least objective, -1 if none");
  h5.write("/sweep/objective", objective);
  std::vector<std::string> violated(n);
  for (size_t i = 0; i < n; ++i) violated[i] = results[i].ok ? broken_constraints(results[i]) : "";
  h5.write("/sweep/violated", violated);
  h5.attribute("/sweep/violated", "meaning", "the constraints each solved point breaks, '; '-separated; empty: none");
  const auto edges = chosen >= 0 ? edge_axes(plan, static_cast<size_t>(chosen)) : std::vector<std::string>{};
  h5.write("/sweep/chosen_on_edge", std::vector<int>{edges.empty() ? 0 : 1}, "1");
  h5.attribute("/sweep/chosen_on_edge", "meaning",
               "1 when the chosen point has the smallest or largest swept value of a varied key: extend the range");
  h5.write("/sweep/chosen_edge_axes", edges);
  h5.write("/sweep/chosen_cautions", chosen_cautions);
  h5.attribute("/sweep/chosen_cautions", "meaning",
               "the cautions `run` gives at the chosen point; empty: none or no point chosen");
  const auto values = ok_values(results);
  for (const auto* row : row_names(values)) {
    std::vector<double> col(n, std::numeric_limits<double>::quiet_NaN());
    for (size_t i = 0; i < n; ++i) {
      if (results[i].ok) col[i] = value_named(results[i].values, row->name, false);
    }
    write_column(h5, "/sweep/" + row->name, col, row->unit, "");  // SI, as /summary
  }
}

}  // namespace oxystrat
