#include "postproc/report/sweep_notes.hpp"

#include <fmt/format.h>

#include <map>

#include "postproc/report/svg_plot.hpp"
#include "solver/studies/sweep_choice.hpp"

namespace oxystrat {
namespace {

// Lines without markup: the count of points breaking each constraint, and the edge warning.
std::vector<std::string> honesty_lines(const SweepPlan& plan, const std::vector<PointResult>& results, int chosen) {
  std::vector<std::string> lines;
  std::map<std::string, size_t> broken;
  size_t infeasible = 0;
  for (const auto& r : results) {
    if (!r.ok || r.feasible) continue;
    ++infeasible;
    for (const auto& k : r.checks) broken[k.name] += k.satisfied ? 0 : 1;
  }
  if (infeasible > 0) {
    std::string s = fmt::format("{} infeasible point{}:", infeasible, infeasible == 1 ? " breaks" : "s break");
    for (const auto& [name, n] : broken) {
      if (n > 0) s += fmt::format(" {} ({})", name, n);
    }
    lines.push_back(s + "; sweep.csv names them per point (column violated)");
  }
  if (chosen >= 0) {
    const auto edges = edge_axes(plan, static_cast<size_t>(chosen));
    if (!edges.empty()) {
      std::string keys;
      for (const auto& e : edges) keys += (keys.empty() ? "" : ", ") + e;
      lines.push_back(fmt::format("EDGE: the chosen point has the smallest or largest swept value of {}: a better point "
                                  "may lie outside the range; extend the range (where the key allows) and sweep again",
                                  keys));
    }
  }
  return lines;
}

}  // namespace

std::string sweep_honesty_text(const SweepPlan& plan, const std::vector<PointResult>& results, int chosen) {
  std::string s;
  for (const auto& l : honesty_lines(plan, results, chosen)) s += l + "\n";
  return s;
}

std::string sweep_honesty_html(const SweepPlan& plan, const std::vector<PointResult>& results, int chosen) {
  std::string s;
  for (const auto& l : honesty_lines(plan, results, chosen)) s += "<p>" + svg::escape(l) + "</p>\n";
  return s;
}

}  // namespace oxystrat
