// oxystrat lifelines CASE --cells N --duration T --out DIR: what cells experience.
#include <fmt/format.h>

#include "input/units.hpp"
#include "solver/oxygen/case_run.hpp"
#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/lifeline_output.hpp"
#include "solver/studies/lifelines.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/oxygen/transient.hpp"

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

double time_text(const std::string& option, const std::string& text) {
  try {
    return units::parse(units::Dimension::time, text);
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
    try {
      lo.duration_s = units::parse(units::Dimension::time, o->duration);
    } catch (const UnitError& e) {
      throw CaseError(fmt::format("--duration '{}': {}", o->duration, e.what()));
    }
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
      try {
        lo.min_excursion_s = units::parse(units::Dimension::time, o->min_excursion);
      } catch (const UnitError& e) {
        throw CaseError(fmt::format("--min-excursion '{}': {}", o->min_excursion, e.what()));
      }
      if (!(lo.min_excursion_s > 0.0 && lo.min_excursion_s < lo.duration_s)) {
        throw CaseError(fmt::format("--min-excursion '{}': allowed more than 0 s and less than --duration ({} s)", o->min_excursion,
                                    lo.duration_s));
      }
    }
    if (!o->substrate_threshold.empty() && o->after.empty()) {
      throw CaseError("--substrate-threshold needs --after (the substrate field comes from a transient run)");
    }
    RunFolder folder(o->out.out_dir, o->out.force);
    // The flow field and the fields the cells see, each with its threshold: the steady state, or a
    // transient frozen at --after (its actuators set the flow, its last frame the fields).
    std::vector<LifelineField> fields;
    std::vector<double> do_field;
    Case at = c;
    if (!o->after.empty()) {
      TransientOptions to;
      to.duration_s = time_text("--after", o->after);
      if (!(to.duration_s > 0.0 && to.duration_s <= 100 * 86400.0)) {
        throw CaseError(fmt::format("--after '{}': allowed more than 0 s and at most 100 d", o->after));
      }
      to.output_interval_s = to.duration_s;
      std::vector<Override> overrides;
      for (const auto& a : o->case_opts.sets) overrides.push_back(parse_override(a));
      const auto tr = run_transient(loaded, overrides, to);
      const auto& last = tr.trace.back();
      at.operation.speed_rps = last.speed_rps;
      at.operation.gas_flow_normal_m3_s = last.gas_normal_m3_s;
      at.operation.oxygen_fraction = last.oxygen_fraction;
      const auto& frame = tr.frames.back();
      do_field = frame.do_mol_m3;
      fmt::print("Frozen at t = {:.4g} h of the transient: speed {:.4g} rpm, gas {:.4g} Nm3/h, O2 {:.1f} %\n",
                 frame.time_s / 3600.0, 60 * at.operation.speed_rps, 3600 * at.operation.gas_flow_normal_m3_s,
                 100 * at.operation.oxygen_fraction);
      fields.push_back(do_lifeline_field(do_field, c.culture.critical_do_mol_m3));
      if (tr.grows) {
        double threshold = c.culture.k_substrate_kg_m3;
        if (!o->substrate_threshold.empty()) {
          try {
            threshold = units::parse(units::Dimension::biomass, o->substrate_threshold);
          } catch (const UnitError& e) {
            throw CaseError(fmt::format("--substrate-threshold '{}': {}", o->substrate_threshold, e.what()));
          }
          if (!(threshold > 0.0 && threshold <= 1000.0)) {
            throw CaseError(fmt::format("--substrate-threshold '{}': allowed more than 0 and at most 1000 g/L",
                                        o->substrate_threshold));
          }
        }
        fields.push_back({"substrate", "substrate threshold", "kg/m3", "g/L", 1.0, frame.substrate_kg_m3, threshold, false});
      } else {
        fmt::print("Note: the culture does not grow (no culture.growth_rate_max): no substrate field\n");
      }
    }
    const auto run = run_case(at, {false, false});
    if (o->after.empty()) {
      if (run.field) {
        do_field = run.field->do_mol_m3;
        fields.push_back(do_lifeline_field(do_field, c.culture.critical_do_mol_m3));
      } else {
        fmt::print("Note: no gas, no DO field: residence statistics only\n");
      }
    }
    const LifelineRegimes regimes = impeller_regimes(run.net);
    const auto r = simulate_lifelines(run.net, run.hydro, fields, regimes, lo);
    fmt::print("{}\n{}", c.title, lifeline_text(r, c.culture.critical_do_mol_m3));
    if (o->after.empty() && c.feed.enabled) {
      fmt::print("  substrate along the paths: add --after T to follow the cells through a fed transient\n");
    }
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
