// oxystrat sweep CASE --vary KEY=START:STOP:COUNT[:UNIT] ... --out DIR: the operating window.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <optional>

#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/io/progress.hpp"
#include "cli/ranks.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/studies/sweep.hpp"
#include "solver/studies/sweep_choice.hpp"
#include "postproc/report/sweep_notes.hpp"
#include "postproc/report/table_output.hpp"

namespace oxystrat::cli {
namespace {

struct SweepCommandOptions {
  CaseOptions case_opts;
  OutputOptions out;
  std::vector<std::string> vary;
  std::string sample;
  std::uint64_t seed = 1;
  std::string objective = "power_gassed";
  bool with_mixing = false;
  bool no_biomass = false;
  bool resume = false;
  int threads = 0;
  long max_points = -1;
  int uncertainty = 0;
};

SweepPlan make_plan(const SweepCommandOptions& o, const LoadedCase& base) {
  std::vector<SweepAxis> axes;
  for (const auto& v : o.vary) axes.push_back(parse_vary(v, base));
  if (o.sample.empty()) return full_factorial(axes);
  if (o.sample.rfind("lhs:", 0) != 0) throw CaseError("--sample '" + o.sample + "': expected lhs:N, e.g. --sample lhs:50");
  int n = 0;
  try {
    n = std::stoi(o.sample.substr(4));
  } catch (const std::exception&) {
    n = 0;
  }
  if (n < 1 || n > 100000) throw CaseError("--sample '" + o.sample + "': N must be 1 to 100000");
  return latin_hypercube(axes, n, o.seed);
}

// Least objective among feasible points (":max" asks for the largest); ties go to the higher DO
// min, so the choice is never dominated (solver/studies/sweep_choice.hpp).
int choose(const std::vector<PointResult>& results, const std::string& objective) {
  return choose_objective_point(results, objective);
}

}  // namespace

void add_sweep_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("sweep", "Run a grid or Latin hypercube of operating points; find the feasible window");
  auto o = std::make_shared<SweepCommandOptions>();
  add_case_options(*cmd, o->case_opts);
  add_output_options(*cmd, o->out);
  cmd->add_option("--vary", o->vary,
                  "KEY=START:STOP:COUNT[:UNIT], e.g. operation.speed=80:140:4:rpm; without a unit, the unit the case "
                  "writes the key in (repeatable)")
      ->required()
      ->take_all()
      ->allow_extra_args(false);
  cmd->add_option("--sample", o->sample, "lhs:N for a Latin hypercube of N points (COUNT is then ignored)");
  cmd->add_option("--seed", o->seed, "Seed of the Latin hypercube (and of --uncertainty)");
  cmd->add_option("--uncertainty", o->uncertainty, "Monte Carlo samples per point: P10/P50/P90 columns (N times the cost)")
      ->check(CLI::Range(0, 100000));
  cmd->add_option("--objective", o->objective,
                  "Summary value the chosen point minimises (NAME:max to maximise); names as in sweep.csv");
  cmd->add_flag("--with-mixing", o->with_mixing, "Also compute theta95 at every point");
  cmd->add_flag("--no-biomass", o->no_biomass, "Skip the supportable-biomass search (faster)");
  cmd->add_flag("--resume", o->resume, "Continue an interrupted sweep from DIR.journal.csv");
  cmd->add_option("--threads", o->threads, "OpenMP threads (default: all cores)")->check(CLI::Range(0, 1024));
  cmd->add_option("--max-points", o->max_points,
                  "Run at most this many new points, then stop: the journal keeps them for --resume (a time budget)");
  cmd->callback([o] {
    const auto base = load_case(o->case_opts);
    check_objective_applies(base.data, o->objective);
    std::vector<Override> base_overrides;
    for (const auto& s : o->case_opts.sets) base_overrides.push_back(parse_override(s));
    const SweepPlan plan = make_plan(*o, base);
    // Under mpirun, rank r runs the points i with i % size == r; rank 0 gathers and writes.
    const auto rk = ranks();
    const bool lead = rk.rank == 0;
    if (rk.size > 1 && (o->resume || o->max_points >= 0)) {
      throw CaseError("--resume and --max-points work in a single process, not under mpirun");
    }
    std::optional<RunFolder> folder_slot;
    if (lead) folder_slot.emplace(o->out.out_dir, o->out.force);
    const std::string target = lead ? folder_slot->target().string() : std::string();
    // The journal beside DIR keeps finished points, so an interrupted sweep loses nothing.
    std::string signature = fmt::format("{:x}", std::hash<std::string>{}(base.source_text));
    for (const auto& s : o->case_opts.sets) signature += " --set " + s;
    for (const auto& v : o->vary) signature += " --vary " + v;
    signature += " --sample " + o->sample + " --seed " + std::to_string(o->seed) +
                 (o->with_mixing ? " mixing" : "") + (o->no_biomass ? " no-biomass" : "") +
                 (o->uncertainty > 0 ? " uncertainty " + std::to_string(o->uncertainty) : "");
    SweepJournal journal(target + ".journal.csv", signature);
    std::vector<PointResult> results(plan.points.size());
    std::vector<bool> done(plan.points.size(), false);
    if (o->resume) {
      for (auto& [i, r] : journal.load()) {
        if (i < results.size()) results[i] = r, done[i] = true;
      }
    }
    if (lead) journal.open(o->resume);
    // Points to run now: not in the journal, and within --max-points.
    std::vector<bool> skip = done;
    size_t remaining = 0;
    for (size_t i = 0; i < skip.size(); ++i) {
      if (skip[i]) continue;
      if (static_cast<int>(i % static_cast<size_t>(rk.size)) != rk.rank) {
        skip[i] = true;  // another rank's point
        continue;
      }
      if (o->max_points >= 0 && static_cast<long>(remaining) >= o->max_points) {
        skip[i] = true;  // left for a later --resume
      } else {
        ++remaining;
      }
    }
    const size_t left_over = rk.size > 1 ? 0
                                         : static_cast<size_t>(std::count(skip.begin(), skip.end(), true)) -
                                               static_cast<size_t>(std::count(done.begin(), done.end(), true));
    if (lead) {
      fmt::print("{}: {} points ({} to run{}{})\n", base.data.title, plan.points.size(), remaining,
                 o->resume ? ", the rest from the journal" : "", rk.size > 1 ? fmt::format(" on rank 0 of {}", rk.size) : "");
    }
    std::vector<std::string> mine;
    {
      Progress progress(lead ? remaining : 0, "points");
      run_sweep(base, base_overrides, plan, {o->with_mixing, !o->no_biomass, o->uncertainty, o->seed, o->threads}, skip,
                [&](size_t i, const PointResult& r) {
                  results[i] = r;
                  if (rk.size > 1) {
                    mine.push_back(encode_point(i, r));
                  } else {
                    journal.record(i, r);
                  }
                  if (lead) progress.step();
                });
    }
    if (rk.size > 1) {
      for (const auto& line : gather_lines(mine)) {
        size_t i = 0;
        PointResult r;
        if (decode_point(line, i, r) && i < results.size()) results[i] = r;
      }
      if (!lead) return;
    }
    RunFolder& folder = *folder_slot;
    if (left_over > 0) {
      fmt::print("Stopped after {} new points as asked; {} of {} are in {}. Run again with --resume.\n", remaining,
                 plan.points.size() - left_over, plan.points.size(), target + ".journal.csv");
      return;  // no result folder: the sweep is not complete
    }
    const auto pareto = pareto_front(results);
    const int chosen = choose(results, o->objective);
    size_t feasible_count = 0, failed = 0;
    for (const auto& r : results) feasible_count += r.ok && r.feasible, failed += !r.ok;
    fmt::print("{} feasible, {} failed", feasible_count, failed);
    if (chosen >= 0) {
      fmt::print("; chosen point {} (least {}):", chosen, o->objective);
      for (const auto& ov : point_overrides(plan, static_cast<size_t>(chosen))) fmt::print(" {}", ov.raw);
      fmt::print(", P gassed {:.4g} kW, DO min {:.4g} mmol/L", summary_value(results[chosen].values, "power_gassed"),
                 summary_value(results[chosen].values, "do_min"));
    }
    fmt::print("\n");
    fmt::print("{}", sweep_honesty_text(plan, results, chosen));
    write_sweep_csv(folder.file("sweep.csv").string(), plan, results, pareto, chosen);
    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, base);
      write_sweep_h5(h5, plan, results, pareto, chosen, o->objective);
      h5.close();
    }
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat sweep: " + base.data.title, sweep_report_body(plan, results, pareto, chosen, o->objective)));
    folder.commit();
    journal.remove();
    fmt::print("Wrote {}/sweep.csv, result.h5, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
