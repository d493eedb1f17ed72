#include "postproc/report/table_output.hpp"
#include "postproc/io/file_output.hpp"
#include "input/errors.hpp"

#include <fmt/format.h>

#include <cmath>
#include <cstdio>
#include <fstream>
#include <limits>
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
                       const std::vector<std::vector<SummaryValue>>& values) {
  std::ofstream out(path);
  out << "quantity,unit";
  for (const auto& n : names) out << "," << csv_quote(n);
  out << "\n";
  if (!values.empty()) {
    for (size_t q = 0; q < values.front().size(); ++q) {
      out << values.front()[q].name << "," << values.front()[q].unit;
      for (const auto& v : values) out << "," << cell(v[q].value);
      out << "\n";
    }
  }
  check_stream(out, path);
}

std::string compare_text(const std::vector<std::string>& names, const std::vector<std::vector<SummaryValue>>& values,
                         const std::vector<bool>& feasible) {
  std::string s = fmt::format("{:<28} {:<11}", "", "");
  for (const auto& n : names) s += fmt::format(" {:>16.16}", n);
  s += "\n";
  if (values.empty()) return s;
  for (size_t q = 0; q < values.front().size(); ++q) {
    s += fmt::format("{:<28} {:<11}", values.front()[q].label, values.front()[q].unit);
    for (const auto& v : values) s += fmt::format(" {:>16}", std::isfinite(v[q].value) ? fmt::format("{:.4g}", v[q].value) : "-");
    s += "\n";
  }
  s += fmt::format("{:<28} {:<11}", "constraints", "");
  for (bool f : feasible) s += fmt::format(" {:>16}", f ? "met" : "VIOLATED");
  return s + "\n";
}

void write_compare_h5(H5Writer& h5, const std::vector<std::string>& names,
                      const std::vector<std::vector<SummaryValue>>& values, const std::vector<bool>& feasible) {
  h5.write("/compare/names", names);
  std::vector<int> ok(feasible.begin(), feasible.end());
  h5.write("/compare/feasible", ok, "1");
  if (values.empty()) return;
  for (size_t q = 0; q < values.front().size(); ++q) {
    std::vector<double> row;
    for (const auto& v : values) row.push_back(v[q].value);
    write_column(h5, "/compare/" + values.front()[q].name, row, values.front()[q].unit, values.front()[q].label);
  }
}

void write_sweep_csv(const std::string& path, const SweepPlan& plan, const std::vector<PointResult>& results,
                     const std::vector<bool>& pareto, int chosen) {
  std::ofstream out(path);
  const std::vector<SummaryValue>* header = nullptr;
  for (const auto& r : results) {
    if (r.ok) {
      header = &r.values;
      break;
    }
  }
  out << "point";
  for (const auto& a : plan.axes) out << "," << a.key << " [" << a.unit << "]";
  out << ",ok,feasible,pareto,chosen";
  if (header) {
    for (const auto& v : *header) out << "," << v.name << " [" << v.unit << "]";
  }
  out << ",error\n";
  for (size_t i = 0; i < results.size(); ++i) {
    out << i;
    for (double x : plan.points[i]) out << "," << fmt::format("{:.10g}", x);
    const auto& r = results[i];
    out << "," << (r.ok ? 1 : 0) << "," << (r.ok && r.feasible ? 1 : 0) << "," << (pareto[i] ? 1 : 0) << ","
        << (static_cast<int>(i) == chosen ? 1 : 0);
    if (header) {
      for (size_t q = 0; q < header->size(); ++q) out << "," << (r.ok ? cell(r.values[q].value) : "");
    }
    out << "," << (r.ok ? "" : csv_quote(one_line(r.error))) << "\n";
  }
  check_stream(out, path);
}

void write_sweep_h5(H5Writer& h5, const SweepPlan& plan, const std::vector<PointResult>& results,
                    const std::vector<bool>& pareto, int chosen, const std::string& objective) {
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
  const std::vector<SummaryValue>* header = nullptr;
  for (const auto& r : results) {
    if (r.ok) {
      header = &r.values;
      break;
    }
  }
  if (!header) return;
  for (size_t q = 0; q < header->size(); ++q) {
    std::vector<double> col(n, std::numeric_limits<double>::quiet_NaN());
    for (size_t i = 0; i < n; ++i) {
      if (results[i].ok) col[i] = results[i].values[q].value;
    }
    write_column(h5, "/sweep/" + (*header)[q].name, col, (*header)[q].unit, "");
  }
}

}  // namespace oxystrat
