// oxystrat lifelines CASE --cells N --duration T --out DIR: what cells experience.
#include <fmt/format.h>

#include "input/units.hpp"
#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/lifeline_output.hpp"
#include "solver/studies/lifelines_study.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"

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
  std::string after;                // empty: the steady field; else the transient state at this time
  std::string substrate_threshold;  // empty: the culture's K_S
};

// SI value of an option's quantity; the message names the option and the text as given.
double option_quantity(const std::string& option, const std::string& text, units::Dimension dim) {
  try {
    return units::parse(dim, text);
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", option, text, e.what()));
  }
}

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
  cmd->add_option("--after", o->after,
                  "Freeze the transient state at this time (\"2 h\"): its operating point, DO and substrate fields "
                  "(the case's control, events, growth and feed run up to it)");
  cmd->add_option("--substrate-threshold", o->substrate_threshold,
                  "With --after and a fed culture: count the time cells spend above this substrate (\"0.5 g/L\"); "
                  "default: K_S");
  cmd->add_option("--seed", o->seed, "Seed (results are reproducible and independent of the thread count)");
  cmd->add_option("--threads", o->threads, "OpenMP threads (default: all cores)")->check(CLI::Range(0, 1024));
  cmd->callback([o] {
    const auto loaded = load_case(o->case_opts);
    const Case& c = loaded.data;
    LifelineOptions lo;
    lo.cells = o->cells;
    lo.seed = o->seed;
    lo.threads = o->threads;
    lo.duration_s = option_quantity("--duration", o->duration, units::Dimension::time);
    if (!(lo.duration_s > 0.0 && lo.duration_s <= 30 * 86400.0)) {
      throw CaseError(fmt::format("--duration '{}': allowed more than 0 s and at most 30 d", o->duration));
    }
    // Every excursion and interval is kept: ~440 MB per 1e5 cell-hours on the 60 m3 demo
    // (docs/lifelines-speed.md). Refuse what would not fit before anything is allocated.
    const double cell_hours = lo.cells * lo.duration_s / 3600.0;
    constexpr double kBytesPerCellHour = 4.4e3, kLimitBytes = 8.0 * 1024 * 1024 * 1024;
    if (cell_hours * kBytesPerCellHour > kLimitBytes) {
      throw CaseError(fmt::format("--cells {} over --duration '{}' is {:.3g} cell-hours, about {:.0f} GB of excursion "
                                  "records (at most {:.0f} GB); follow fewer cells or a shorter time",
                                  lo.cells, o->duration, cell_hours, cell_hours * kBytesPerCellHour / 1e9,
                                  kLimitBytes / 1e9));
    }
    if (!o->min_excursion.empty()) {
      lo.min_excursion_s = option_quantity("--min-excursion", o->min_excursion, units::Dimension::time);
      if (!(lo.min_excursion_s > 0.0 && lo.min_excursion_s < lo.duration_s)) {
        throw CaseError(fmt::format("--min-excursion '{}': allowed more than 0 s and less than --duration ({} s)", o->min_excursion,
                                    lo.duration_s));
      }
    }
    if (!o->substrate_threshold.empty() && o->after.empty()) {
      throw CaseError("--substrate-threshold needs --after (the substrate field comes from a transient run)");
    }
    RunFolder folder(o->out.out_dir, o->out.force);
    LifelineStudyOptions so;
    so.cells = lo;
    if (!o->after.empty()) {
      so.after_s = option_quantity("--after", o->after, units::Dimension::time);
      if (!(*so.after_s > 0.0 && *so.after_s <= 100 * 86400.0)) {
        throw CaseError(fmt::format("--after '{}': allowed more than 0 s and at most 100 d", o->after));
      }
      so.overrides = case_overrides(o->case_opts);
      // Read only where the transient has a substrate field: a growing culture.
      if (!o->substrate_threshold.empty() && c.culture.grows()) {
        const double threshold = option_quantity("--substrate-threshold", o->substrate_threshold, units::Dimension::biomass);
        if (!(threshold > 0.0 && threshold <= 1000.0)) {
          throw CaseError(fmt::format("--substrate-threshold '{}': allowed more than 0 and at most 1000 g/L",
                                      o->substrate_threshold));
        }
        so.substrate_threshold_kg_m3 = threshold;
      }
    }
    const LifelineStudy study = run_lifeline_study(loaded, so);
    const auto& r = study.result;
    fmt::print("{}", lifeline_study_text(c, study));
    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, loaded);
      write_network_h5(h5, study.run.net);
      write_lifelines_h5(h5, r, lo, study.regimes);
      h5.write("/cautions", study.cautions);
      h5.close();
    }
    write_lifelines_csv(folder.file("cells.csv").string(), folder.file("trajectories.csv").string(), r, study.do_mol_m3);
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat lifelines: " + c.title,
                                lifeline_html(r, study.run.net, study.do_mol_m3, c.culture.critical_do_mol_m3, study.cautions)));
    folder.commit();
    fmt::print("Wrote {}/result.h5, cells.csv, trajectories.csv, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
