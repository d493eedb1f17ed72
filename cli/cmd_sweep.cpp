// oxystrat sweep CASE --vary KEY=START:STOP:COUNT[:UNIT] ... --out DIR: the operating window.
#include <fmt/format.h>

#include <optional>

#include "cli/common.hpp"
#include "cli/ranks.hpp"
#include "input/numbers.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/io/progress.hpp"
#include "postproc/io/run_folder.hpp"
#include "postproc/io/sweep_session.hpp"
#include "postproc/report/report.hpp"
#include "postproc/report/sweep_notes.hpp"
#include "postproc/report/table_output.hpp"
#include "solver/studies/sweep.hpp"
#include "solver/studies/sweep_choice.hpp"

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

// N of --sample lhs:N; 0 for a full-factorial grid.
long sample_size(const std::string& sample) {
  if (sample.empty()) return 0;
  if (sample.rfind("lhs:", 0) != 0) throw CaseError("--sample '" + sample + "': expected lhs:N, e.g. --sample lhs:50");
  const long long n = parse_integer(sample.substr(4)).value_or(0);
  if (n < 1 || n > 100000) throw CaseError("--sample '" + sample + "': N must be a whole number from 1 to 100000");
  return static_cast<long>(n);
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
  cmd->add_flag("--resume", o->resume, "Continue an interrupted sweep from its journal (DIR.journal*.csv)");
  cmd->add_option("--threads", o->threads, "OpenMP threads (default: all cores)")->check(CLI::Range(0, 1024));
  cmd->add_option("--max-points", o->max_points,
                  "Run at most this many new points, then stop: the journal keeps them for --resume (a time budget)")
      ->check(CLI::Range(0L, 100000000L));
  cmd->callback([o] {
    // Every check before any point runs.
    const auto base = load_case(o->case_opts);
    check_objective_applies(base.data, o->objective);
    const auto base_overrides = case_overrides(o->case_opts);
    const SweepOptions so{o->with_mixing, !o->no_biomass, o->uncertainty, o->seed, o->threads};
    std::vector<SweepAxis> axes;
    for (const auto& v : o->vary) axes.push_back(parse_vary(v, base));
    const long lhs = sample_size(o->sample);
    check_sweep_size(axes, lhs);
    check_sweep_axes(base, base_overrides, axes);
    check_objective(base.data, o->objective, so);
    SweepPlan plan = lhs > 0 ? latin_hypercube(axes, static_cast<int>(lhs), o->seed) : full_factorial(axes);

    // Under mpirun the points are dealt to the ranks; rank 0 writes the result.
    const auto rk = ranks();
    const bool lead = rk.rank == 0;
    std::optional<RunFolder> folder;
    if (lead) folder.emplace(o->out.out_dir, o->out.force);
    SweepSession session(base, base_overrides, std::move(plan), so,
                         SweepJournal(output_folder_path(o->out.out_dir).string(),
                                      sweep_signature(base, o->case_opts.sets, o->vary, o->sample, so), rk.rank),
                         {o->resume, o->max_points}, {rk.rank, rk.size, share_lines});
    const auto& share = session.share();
    const size_t total = session.plan().points.size();
    if (lead) {
      fmt::print("{}: {} points ({} to run{}{})\n", base.data.title, total, share.now,
                 session.from_journal() > 0 ? fmt::format(", {} from the journal", session.from_journal()) : "",
                 rk.size > 1 ? fmt::format(", {} of them on rank 0 of {}", share.here, rk.size) : "");
    }
    std::vector<PointResult> results;
    {
      Progress progress(lead ? share.here : 0, "points");
      results = session.run([&] {
        if (lead) progress.step();
      });
    }
    if (!lead) return;
    if (!session.completes()) {
      fmt::print("Stopped after {} new point{} as asked; {} of {} are in the journal {}. Run again with --resume.\n",
                 share.now, share.now == 1 ? "" : "s", total - share.later, total,
                 rk.size > 1 ? output_folder_path(o->out.out_dir).string() + ".journal*.csv" : session.journal_path());
      return;  // no result folder: the sweep is not complete
    }
    const auto& p = session.plan();
    const auto pareto = pareto_front(results);
    const int chosen = choose_objective_point(results, o->objective);
    size_t feasible_count = 0, failed = 0;
    for (const auto& r : results) feasible_count += r.ok && r.feasible, failed += !r.ok;
    fmt::print("{} feasible, {} failed", feasible_count, failed);
    if (chosen >= 0) {
      fmt::print("; chosen point {} (least {}):", chosen, o->objective);
      // Four figures, as an operating point is set (sweep.csv keeps every digit).
      for (size_t d = 0; d < p.axes.size(); ++d) {
        const auto& a = p.axes[d];
        fmt::print(" {}={:.4g}{}{}", a.key, p.points[static_cast<size_t>(chosen)][d], a.unit.empty() ? "" : " ", a.unit);
      }
      fmt::print(", P gassed {:.4g} kW, DO min {:.4g} mmol/L", summary_display(results[chosen].values, "power_gassed"),
                 summary_display(results[chosen].values, "do_min"));
    }
    fmt::print("\n");
    const auto cautions = chosen >= 0 ? point_cautions(base, base_overrides, p, static_cast<size_t>(chosen), so)
                                      : std::vector<std::string>{};
    if (!cautions.empty()) {
      fmt::print("Cautions at the chosen point (defer to local codes, the vessel's certification and licensed "
                 "practice)\n");
      for (const auto& w : cautions) fmt::print("  - {}\n", w);
    }
    fmt::print("{}", sweep_honesty_text(p, results, chosen));
    write_sweep_csv(folder->file("sweep.csv").string(), p, results, pareto, chosen);
    {
      H5Writer h5(folder->file("result.h5").string());
      write_case_h5(h5, base);
      write_sweep_h5(h5, p, results, pareto, chosen, o->objective, cautions);
      h5.close();
    }
    write_text_file(folder->file("report.html").string(),
                    report_page("oxystrat sweep: " + base.data.title,
                                sweep_report_body(p, results, pareto, chosen, o->objective, cautions)));
    folder->commit();
    session.finish();
    fmt::print("Wrote {}/sweep.csv, result.h5, report.html\n", folder->target().string());
  });
}

}  // namespace oxystrat::cli
