// oxystrat lifelines CASE --cells N --duration T --out DIR: what cells experience.
#include <fmt/format.h>

#include "case/units.hpp"
#include "case_run.hpp"
#include "common.hpp"
#include "h5_writer.hpp"
#include "lifeline_output.hpp"
#include "lifelines.hpp"
#include "network_output.hpp"
#include "report.hpp"
#include "run_folder.hpp"

namespace oxystrat::cli {
namespace {

struct LifelineCommandOptions {
  CaseOptions case_opts;
  OutputOptions out;
  int cells = 1000;
  std::string duration = "1 h";
  std::string min_excursion;  // empty: every excursion counts
  std::uint64_t seed = 1;
  int threads = 0;
};

}  // namespace

void add_lifelines_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("lifelines", "Follow cells through the zone network: time below critical DO, excursions");
  auto o = std::make_shared<LifelineCommandOptions>();
  add_case_options(*cmd, o->case_opts);
  add_output_options(*cmd, o->out);
  cmd->add_option("--cells", o->cells, "Number of cells")->check(CLI::Range(1, 10'000'000));
  cmd->add_option("--duration", o->duration, "Time followed, with a unit (e.g. \"30 min\", \"2 h\")");
  cmd->add_option("--min-excursion", o->min_excursion,
                  "Also count apart the excursions at least this long, with a unit (e.g. \"1 s\"); default: no minimum");
  cmd->add_option("--seed", o->seed, "Seed (results are reproducible and independent of the thread count)");
  cmd->add_option("--threads", o->threads, "OpenMP threads (default: all cores)")->check(CLI::Range(0, 1024));
  cmd->callback([o] {
    const auto loaded = load_case(o->case_opts);
    const Case& c = loaded.data;
    LifelineOptions lo;
    lo.cells = o->cells;
    lo.seed = o->seed;
    lo.threads = o->threads;
    try {
      lo.duration_s = units::parse(units::Dimension::time, o->duration);
    } catch (const units::UnitError& e) {
      throw CaseError(fmt::format("--duration '{}': {}", o->duration, e.what()));
    }
    if (!(lo.duration_s > 0.0 && lo.duration_s <= 30 * 86400.0)) {
      throw CaseError(fmt::format("--duration '{}': allowed more than 0 s and at most 30 d", o->duration));
    }
    if (!o->min_excursion.empty()) {
      try {
        lo.min_excursion_s = units::parse(units::Dimension::time, o->min_excursion);
      } catch (const units::UnitError& e) {
        throw CaseError(fmt::format("--min-excursion '{}': {}", o->min_excursion, e.what()));
      }
      if (!(lo.min_excursion_s > 0.0 && lo.min_excursion_s < lo.duration_s)) {
        throw CaseError(fmt::format("--min-excursion '{}': allowed more than 0 s and less than --duration ({} s)", o->min_excursion,
                                    lo.duration_s));
      }
    }
    RunFolder folder(o->out.out_dir, o->out.force);
    const auto run = run_case(c, {false, false});
    const std::vector<double> do_field = run.field ? run.field->do_mol_m3 : std::vector<double>{};
    if (!run.field) fmt::print("Note: no gas, no DO field: residence statistics only\n");
    // The fields the cells see, each with its threshold (a substrate field joins here).
    std::vector<LifelineField> fields;
    if (run.field) fields.push_back(do_lifeline_field(do_field, c.culture.critical_do_mol_m3));
    const LifelineRegimes regimes = impeller_regimes(run.net);
    const auto r = simulate_lifelines(run.net, run.hydro, fields, regimes, lo);
    fmt::print("{}\n{}", c.title, lifeline_text(r, c.culture.critical_do_mol_m3));
    fmt::print("  substrate along the paths needs a transient run with a feed (not part of a steady lifeline run)\n");
    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, loaded);
      write_network_h5(h5, run.net);
      write_lifelines_h5(h5, r, lo, regimes);
      h5.close();
    }
    write_lifelines_csv(folder.file("cells.csv").string(), folder.file("trajectories.csv").string(), r, do_field);
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat lifelines: " + c.title, lifeline_html(r, run.net, do_field, c.culture.critical_do_mol_m3)));
    folder.commit();
    fmt::print("Wrote {}/result.h5, cells.csv, trajectories.csv, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
