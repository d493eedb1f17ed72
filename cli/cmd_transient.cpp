// oxystrat transient CASE --duration T --out DIR: the oxygen field in time, with DO control, events,
// and a growing, fed culture.
#include <fmt/format.h>

#include "input/units.hpp"
#include "cli/common.hpp"
#include "postproc/io/progress.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/oxygen/transient.hpp"
#include "solver/oxygen/transient_limits.hpp"
#include "postproc/report/transient_output.hpp"
#include "solver/oxygen/transient_cautions.hpp"

namespace oxystrat::cli {
namespace {

struct TransientCommandOptions {
  CaseOptions case_opts;
  OutputOptions out;
  std::string duration = "1 h", step = "30 s", interval = "1 min";
  double tolerance = 1e-3;
  bool fixed_step = false;
};

double time_option(const std::string& name, const std::string& text) {
  try {
    const double t = units::parse(units::Dimension::time, text);
    if (t > 0.0 && t <= 100 * 86400.0) return t;
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", name, text, e.what()));
  }
  throw CaseError(fmt::format("{} '{}': allowed more than 0 s and at most 100 d", name, text));
}

}  // namespace

void add_transient_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "transient", "The oxygen field in time, with the case's DO control, step events, culture growth and feed");
  auto o = std::make_shared<TransientCommandOptions>();
  add_case_options(*cmd, o->case_opts);
  add_output_options(*cmd, o->out);
  cmd->add_option("--duration", o->duration, "Time simulated, with a unit (\"12 h\")");
  cmd->add_option("--step", o->step, "Largest implicit Euler step (\"30 s\"); the step itself with --fixed-step");
  cmd->add_option("--interval", o->interval, "Output interval of the fields (\"1 min\")");
  cmd->add_option("--tolerance", o->tolerance, "Local error allowed per step, relative (1e-3)")
      ->check(CLI::Range(1e-8, 0.5));
  cmd->add_flag("--fixed-step", o->fixed_step, "Constant steps of --step, no error control");
  cmd->callback([o] {
    const auto loaded = load_case(o->case_opts);
    const auto overrides = case_overrides(o->case_opts);
    TransientOptions to;
    to.duration_s = time_option("--duration", o->duration);
    to.step_s = time_option("--step", o->step);
    to.output_interval_s = time_option("--interval", o->interval);
    to.adaptive = !o->fixed_step;
    to.tolerance = o->tolerance;
    check_transient_size(loaded.data, to);  // before anything is built
    if (to.duration_s / to.output_interval_s > 100000) {
      throw CaseError(fmt::format("--interval '{}' gives more than 100,000 field outputs over --duration '{}'; choose "
                                  "a longer interval",
                                  o->interval, o->duration));
    }
    RunFolder folder(o->out.out_dir, o->out.force);
    const auto percent = [&](double t) { return static_cast<size_t>(100.0 * t / to.duration_s); };
    Progress bar(100, "% of the simulated time");
    size_t shown = 0;
    to.progress = [&](double t) {
      for (; shown < std::min<size_t>(percent(t), 100); ++shown) bar.step();
    };
    const auto r = run_transient(loaded, overrides, to);
    const auto cautions = transient_cautions(loaded.data, r);
    fmt::print("{}", transient_text(loaded.data, r, cautions));
    write_transient_outputs(folder, loaded, build_zone_geometry(loaded.data), r, cautions);
    folder.commit();
    fmt::print("Wrote {}/trace.csv, probe.csv, controller.csv, result.h5, transient.pvd, report.html\n",
               folder.target().string());
  });
}

}  // namespace oxystrat::cli
