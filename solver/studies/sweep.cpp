#include "solver/studies/sweep.hpp"

#include <fmt/format.h>
#include <omp.h>

#include <algorithm>
#include <cmath>
#include <numeric>
#include <exception>
#include <stdexcept>

#include "input/numbers.hpp"
#include "input/units.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/mixing_time.hpp"
#include "solver/oxygen/limit_values.hpp"
#include "solver/studies/uncertainty.hpp"
#include "solver/random/latin_hypercube.hpp"

namespace oxystrat {

SweepAxis parse_vary(const std::string& argument, const LoadedCase& base) {
  const auto eq = argument.find('=');
  if (eq == std::string::npos) {
    throw CaseError(fmt::format("--vary '{}': expected KEY=START:STOP:COUNT[:UNIT], e.g. operation.speed=80:140:4:rpm", argument));
  }
  SweepAxis a;
  a.key = argument.substr(0, eq);
  std::vector<std::string> parts;
  std::string rest = argument.substr(eq + 1), part;
  for (char ch : rest) {
    if (ch == ':') {
      parts.push_back(part);
      part.clear();
    } else {
      part += ch;
    }
  }
  parts.push_back(part);
  if (parts.size() < 3 || parts.size() > 4) {
    throw CaseError(fmt::format("--vary '{}': expected START:STOP:COUNT[:UNIT]", argument));
  }
  a.argument = argument;
  const auto start = parse_number(parts[0]), stop = parse_number(parts[1]);
  const auto count = parse_integer(parts[2]);
  if (!start || !stop || !count) {
    throw CaseError(fmt::format("--vary '{}': START and STOP must be finite numbers and COUNT a whole number, e.g. "
                                "operation.speed=80:140:4:rpm",
                                argument));
  }
  a.start = *start;
  a.stop = *stop;
  if (*count < 1 || *count > 10000) throw CaseError(fmt::format("--vary '{}': COUNT must be 1 to 10000", argument));
  a.count = static_cast<int>(*count);
  if (parts.size() == 4) {
    a.unit = parts[3];
  } else if (const auto raw = raw_value(base, a.key)) {
    try {
      a.unit = units::split(*raw).unit;
    } catch (const UnitError&) {
      throw CaseError(fmt::format("--vary '{}': the case's value '{}' is not a number", argument, *raw));
    }
  } else {
    a.plain_assumed = true;  // e.g. operation.oxygen_fraction=0.21:1:5
  }
  return a;
}

void check_sweep_size(const std::vector<SweepAxis>& axes, long sample_points) {
  double points = 1.0;
  std::string counts;
  for (const auto& a : axes) {
    points *= a.count;
    counts += (counts.empty() ? "" : " x ") + std::to_string(a.count);
  }
  if (sample_points > 0) points = static_cast<double>(sample_points), counts = "--sample lhs:" + std::to_string(sample_points);
  if (points > max_sweep_points) {
    // About 3 kB per point: its values with names and units, kept until the tables are written.
    throw CaseError(fmt::format("the sweep has {:.0f} points ({}), about {:.2g} GB of results and {:.2g} pairs for the "
                                "Pareto front; at most {:.0f} points are supported: use fewer COUNTs, or --sample "
                                "lhs:N for a Latin hypercube",
                                points, counts, points * 3e3 / 1e9, 0.5 * points * points, max_sweep_points));
  }
}

void check_sweep_axes(const LoadedCase& base, const std::vector<Override>& base_overrides,
                      const std::vector<SweepAxis>& axes) {
  const SweepPlan starts{axes, {std::vector<double>(axes.size())}};
  for (size_t d = 0; d < axes.size(); ++d) {
    for (const double end : {axes[d].start, axes[d].stop}) {
      SweepPlan at = starts;
      for (size_t k = 0; k < axes.size(); ++k) at.points[0][k] = axes[k].start;
      at.points[0][d] = end;
      auto overrides = base_overrides;
      const auto point = point_overrides(at, 0);
      overrides.insert(overrides.end(), point.begin(), point.end());
      try {
        (void)read_case_text(base.source_text, base.file_name, overrides);
      } catch (const CaseError& e) {
        // The reader names the override as a --set; here it is the value of a --vary argument,
        // the one at its end (axis d) or another axis at its start: the one the reader names.
        std::string why = e.what();
        size_t bad = d;
        for (size_t k = 0; k < axes.size(); ++k) {
          if (why.rfind("--set '" + point[k].raw + "': ", 0) == 0) bad = k;
        }
        if (const std::string set = "--set '" + point[bad].raw + "': "; why.rfind(set, 0) == 0) why.erase(0, set.size());
        if (axes[bad].plain_assumed) {
          why += fmt::format(" (the case does not write {}, so its values were taken as plain numbers; give the unit: "
                             "{}=START:STOP:COUNT:UNIT)",
                             axes[bad].key, axes[bad].key);
        }
        throw CaseError(fmt::format("--vary '{}' at {}: {}", axes[bad].argument.empty() ? axes[bad].key : axes[bad].argument,
                                    point[bad].raw, why));
      }
    }
  }
}

SweepPlan full_factorial(const std::vector<SweepAxis>& axes) {
  SweepPlan plan{axes, {}};
  size_t total = 1;
  for (const auto& a : axes) total *= static_cast<size_t>(a.count);
  for (size_t i = 0; i < total; ++i) {
    std::vector<double> p;
    size_t rest = i;
    std::vector<size_t> idx(axes.size());  // the first axis varies slowest
    for (size_t d = axes.size(); d-- > 0;) {
      idx[d] = rest % axes[d].count;
      rest /= axes[d].count;
    }
    for (size_t d = 0; d < axes.size(); ++d) {
      const auto& a = axes[d];
      p.push_back(a.count == 1 ? a.start : a.start + (a.stop - a.start) * static_cast<double>(idx[d]) / (a.count - 1));
    }
    plan.points.push_back(p);
  }
  return plan;
}

SweepPlan latin_hypercube(const std::vector<SweepAxis>& axes, int n, std::uint64_t seed) {
  SweepPlan plan{axes, std::vector<std::vector<double>>(static_cast<size_t>(n), std::vector<double>(axes.size()))};
  const auto unit = latin_hypercube_unit(n, static_cast<int>(axes.size()), seed);
  for (size_t d = 0; d < axes.size(); ++d) {
    for (int i = 0; i < n; ++i) plan.points[i][d] = axes[d].start + (axes[d].stop - axes[d].start) * unit[i][d];
  }
  return plan;
}

std::vector<Override> point_overrides(const SweepPlan& plan, size_t i) {
  std::vector<Override> out;
  for (size_t d = 0; d < plan.axes.size(); ++d) {
    const auto& a = plan.axes[d];
    const std::string value = a.unit.empty() ? fmt::format("{:.12g}", plan.points[i][d])
                                             : fmt::format("{:.12g} {}", plan.points[i][d], a.unit);
    out.push_back(Override{a.key, value, a.key + "=" + value});
  }
  return out;
}

void append_uncertainty_values(const Case& c, int samples, std::uint64_t seed, bool with_mixing,
                               std::vector<SummaryValue>& values) {
  UncertaintyOptions o;
  o.samples = samples;
  o.seed = seed;
  o.with_mixing = with_mixing;
  const auto u = run_uncertainty(c, o);
  for (const auto& out : u.outputs) {
    if (out.name == "theta95" && !with_mixing) continue;
    for (const auto& [suffix, v] : {std::pair{"_p10", out.q.p10}, std::pair{"_p50", out.q.p50}, std::pair{"_p90", out.q.p90}}) {
      values.push_back(summary_entry(out.name + suffix, v, out.unit, out.display_unit, out.label + " P" + std::string(suffix + 2)));
    }
  }
}

PointResult evaluate_point(const LoadedCase& loaded, bool with_mixing, bool supportable_biomass, int uncertainty_samples,
                           std::uint64_t seed, NewtonWorkspace* workspace) {
  PointResult r;
  const Case& c = loaded.data;
  try {
    const auto run = run_case(c, {supportable_biomass}, workspace);
    std::optional<double> theta;
    if (with_mixing) theta = tracer_mixing_time(run.net, run.hydro, {}).theta_s;
    r.values = summary_values(c, run, theta);
    if (uncertainty_samples > 0) append_uncertainty_values(c, uncertainty_samples, seed, with_mixing, r.values);
    r.checks = check_constraints(c, run);
    r.feasible = feasible(r.checks);
    r.ok = true;
  } catch (const std::exception& e) {
    r.error = e.what();
  }
  return r;
}

std::vector<std::string> point_cautions(const LoadedCase& base, const std::vector<Override>& base_overrides,
                                        const SweepPlan& plan, size_t i, const SweepOptions& opts) {
  auto overrides = base_overrides;
  for (auto& o : point_overrides(plan, i)) overrides.push_back(o);
  try {
    const auto loaded = read_case_text(base.source_text, base.file_name, overrides);
    return run_case(loaded.data, {opts.supportable_biomass}).cautions;
  } catch (const std::exception&) {
    return {};  // the sweep's own result already says why the point failed
  }
}

std::vector<std::string> sweep_value_names(const Case& base, const SweepOptions& opts) {
  auto names = summary_value_names(opts.with_mixing);
  for (auto& n : limit_value_names(base)) names.push_back(std::move(n));
  if (opts.uncertainty_samples > 0) {
    for (const auto& q : uncertainty_output_names()) {
      if (q == "theta95" && !opts.with_mixing) continue;
      for (const char* suffix : {"_p10", "_p50", "_p90"}) names.push_back(q + suffix);
    }
  }
  return names;
}

void check_objective(const Case& base, const std::string& objective, const SweepOptions& opts) {
  const bool maximise = objective.size() > 4 && objective.compare(objective.size() - 4, 4, ":max") == 0;
  // A name of an earlier release (volume_below_critical) still names its value.
  const std::string name = current_summary_name(maximise ? objective.substr(0, objective.size() - 4) : objective);
  if (!opts.supportable_biomass && (name == "max_biomass" || name == "max_biomass_single_zone")) {
    throw CaseError(fmt::format("--objective '{}': {} is not searched for with --no-biomass (every point would have no "
                                "value); drop --no-biomass",
                                objective, name));
  }
  const auto names = sweep_value_names(base, opts);
  if (std::find(names.begin(), names.end(), name) != names.end()) return;
  std::string list;
  for (const auto& n : names) list += (list.empty() ? "" : ", ") + n;
  const bool needs_mixing = name == "theta95" || name.rfind("theta95_", 0) == 0;
  throw CaseError(fmt::format("--objective '{}': no value named {} in this sweep{}; expected NAME or NAME:max with NAME "
                              "one of {}",
                              objective, name, needs_mixing ? " (theta95 needs --with-mixing)" : "", list));
}

PointShare share_points(const std::vector<bool>& done, long max_points, int rank, int ranks) {
  PointShare s;
  s.skip.assign(done.size(), true);
  size_t k = 0;  // index among the points not done
  for (size_t i = 0; i < done.size(); ++i) {
    if (done[i]) continue;
    if (max_points >= 0 && static_cast<long>(k) >= max_points) {
      ++s.later;
      continue;
    }
    if (static_cast<int>(k % static_cast<size_t>(ranks)) == rank) s.skip[i] = false, ++s.here;
    ++s.now;
    ++k;
  }
  return s;
}

void run_sweep(const LoadedCase& base, const std::vector<Override>& base_overrides, const SweepPlan& plan,
               const SweepOptions& opts, const std::vector<bool>& done,
               const std::function<void(size_t, const PointResult&)>& on_done) {
  const auto n = static_cast<long>(plan.points.size());
  const int threads = opts.threads > 0 ? opts.threads : omp_get_max_threads();
  // An exception may not leave an OpenMP region: the first one is kept and rethrown after it.
  std::exception_ptr failure;
  bool stop = false;
#pragma omp parallel num_threads(threads)
  {
    NewtonWorkspace workspace;  // per thread: the points share the grid, so the symbolic work is kept
#pragma omp for schedule(dynamic, 1)
    for (long i = 0; i < n; ++i) {
      if (done[static_cast<size_t>(i)]) continue;
      bool stopped = false;
#pragma omp atomic read
      stopped = stop;
      if (stopped) continue;
      auto overrides = base_overrides;
      for (auto& o : point_overrides(plan, static_cast<size_t>(i))) overrides.push_back(o);
      PointResult r;
      try {
        const auto loaded = read_case_text(base.source_text, base.file_name, overrides);
        r = evaluate_point(loaded, opts.with_mixing, opts.supportable_biomass, opts.uncertainty_samples, opts.seed,
                           &workspace);
      } catch (const std::exception& e) {
        r.error = e.what();
      }
#pragma omp critical(oxystrat_sweep_done)
      {
        if (!failure) {
          try {
            on_done(static_cast<size_t>(i), r);
          } catch (...) {
            failure = std::current_exception();
#pragma omp atomic write
            stop = true;
          }
        }
      }
    }
  }
  if (failure) std::rethrow_exception(failure);
}

std::vector<bool> pareto_front(const std::vector<PointResult>& results) {
  std::vector<bool> front(results.size(), false);
  const auto get = [](const PointResult& r, const char* name) { return summary_value(r.values, name); };
  for (size_t i = 0; i < results.size(); ++i) {
    if (!results[i].ok) continue;
    const double pi = get(results[i], "power_gassed"), di = get(results[i], "do_min");
    if (std::isnan(di)) continue;
    bool dominated = false;
    for (size_t j = 0; j < results.size() && !dominated; ++j) {
      if (j == i || !results[j].ok) continue;
      const double pj = get(results[j], "power_gassed"), dj = get(results[j], "do_min");
      dominated = pj <= pi && dj >= di && (pj < pi || dj > di);
    }
    front[i] = !dominated;
  }
  return front;
}

}  // namespace oxystrat
