// oxystrat run CASE --out DIR: the main job on one case.
#include <fmt/format.h>

#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/hydro_output.hpp"
#include "postproc/report/limits_output.hpp"
#include "solver/oxygen/case_run.hpp"
#include "postproc/report/oxygen_output.hpp"
#include "postproc/report/report.hpp"
#include "postproc/report/trust_output.hpp"
#include "solver/studies/grid_check.hpp"
#include "solver/flow/mixing_grid.hpp"
#include "solver/studies/uncertainty.hpp"

#include <optional>
#include "postproc/io/network_output.hpp"
#include "postproc/io/run_folder.hpp"
#include "postproc/report/text_summary.hpp"
#include "postproc/report/verdict_output.hpp"
#include "solver/studies/levers.hpp"
#include "solver/studies/verdict.hpp"
#include "postproc/io/vtk_writer.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat::cli {

// From this many grid cells on, `run` announces its stages (each takes minutes there).
constexpr long kAnnounceStagesFromZones = 50000;

struct RunOptions {
  CaseOptions case_opts;
  OutputOptions out;
  int uncertainty = 0;
  std::uint64_t seed = 1;
  bool grid_check = false;
  bool no_levers = false;
};

void add_run_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("run", "Build the zone network of a case, solve it and write the results");
  auto opts = std::make_shared<RunOptions>();
  add_case_options(*cmd, opts->case_opts);
  add_output_options(*cmd, opts->out);
  cmd->add_option("--uncertainty", opts->uncertainty,
                  "Monte Carlo samples over the uncertain model constants (P10/P50/P90 and sensitivity)")
      ->check(CLI::Range(0, 100000));
  cmd->add_option("--seed", opts->seed, "Seed of the uncertainty samples");
  cmd->add_flag("--grid-check", opts->grid_check, "Also run two coarser grids: observed order and GCI");
  cmd->add_flag("--no-levers", opts->no_levers, "When the case fails, do not search the levers that would fix it");
  cmd->callback([opts] {
    const auto loaded = load_case(opts->case_opts);
    const Case& c = loaded.data;
    RunFolder folder(opts->out.out_dir, opts->out.force);
    // A large grid takes minutes per stage: say what is being done (stderr, so the report on
    // stdout stays as it is).
    const bool large = static_cast<long>(c.grid.radial) * c.grid.axial >= kAnnounceStagesFromZones;
    const auto stage = [large](const std::string& what) {
      if (large) fmt::print(stderr, "oxystrat run: {} ...\n", what);
    };
    auto run = run_case(c, {}, nullptr, stage);
    const auto& net = run.net;
    const auto& hydro = run.hydro;
    stage(net.size() > kMixingZonesMax
              ? fmt::format("mixing time (theta95) on the grid halved until it has at most {} zones", kMixingZonesMax)
              : fmt::format("mixing time (theta95) on {} zones", net.size()));
    const auto mixing = case_mixing_time(c, net, hydro);
    const double theta = mixing.theta_s;
    if (mixing.halvings > 0) {
      run.notes.push_back(fmt::format(
          "theta95 was found on this case's grid halved {} time(s), {} zones instead of {}: the tracer integration's "
          "cost grows much faster than the field's, and on the tall demo theta95 moved by less than 1 % from 2e4 to "
          "5e4 zones. `oxystrat mixing` integrates on the full grid",
          mixing.halvings, mixing.zones, net.size()));
    }
    auto verdict = make_verdict(c, run);
    if (!verdict.meets && run.field && !opts->no_levers) {
      const auto overrides = case_overrides(opts->case_opts);
      stage("the levers that would make the case pass");
      verdict.advice = lever_advice(study_levers(loaded, overrides, {}));
    }
    fmt::print("{}", verdict_text(c, verdict));
    fmt::print("{}", geometry_summary(loaded, net));
    fmt::print("{}", power_table(c, hydro));
    fmt::print("Mixing  theta95 {} {:.4g} s ({}{}; `oxystrat mixing` for the tracer history)\n", mixing.reached ? "=" : ">",
               theta,
               mixing.judged_volume_fraction < 1.0
                   ? fmt::format("the broth inside the caverns; the {:.1f} % outside them is stagnant, exchanging by "
                                 "molecular diffusion only, and not counted",
                                 100.0 * (1.0 - mixing.judged_volume_fraction))
                   : std::string("whole vessel"),
               mixing.halvings > 0 ? fmt::format("; on a coarser grid of {} zones, see the notes", mixing.zones) : "");
    fmt::print("{}", oxygen_summary(c, run));
    std::optional<UncertaintyResult> unc;
    if (opts->uncertainty > 0) {
      UncertaintyOptions uo;
      uo.samples = opts->uncertainty;
      uo.seed = opts->seed;
      unc = run_uncertainty(c, uo);
      fmt::print("{}", uncertainty_text(*unc));
    }
    std::optional<GridCheck> grid;
    if (opts->grid_check) {
      grid = grid_check(c);
      fmt::print("{}", grid_check_text(*grid));
    }
    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, loaded);
      write_network_h5(h5, net);
      write_hydrodynamics_h5(h5, c, hydro);
      write_oxygen_h5(h5, c, run);
      h5.write("/summary/theta95", theta, "s");
      h5.write("/summary/theta95_zones", static_cast<double>(mixing.zones), "1");
      h5.write("/summary/theta95_judged_volume_fraction", mixing.judged_volume_fraction, "1");
      write_verdict_h5(h5, verdict);
      if (unc) write_uncertainty_h5(h5, *unc);
      if (grid) write_grid_check_h5(h5, *grid);
      h5.close();
    }
    auto arrays = network_cell_arrays(net);
    for (auto& a : hydrodynamics_cell_arrays(hydro)) arrays.push_back(std::move(a));
    for (auto& a : oxygen_cell_arrays(run)) arrays.push_back(std::move(a));
    for (auto& a : limits_cell_arrays(run)) arrays.push_back(std::move(a));
    write_profile_csv(folder.file("profile.csv").string(), run);
    std::string body = run_report_body(c, run, theta, &verdict, false, loaded.notes);  // the page title names the case
    if (unc) {
      write_uncertainty_csv(folder.file("uncertainty.csv").string(), *unc);
      body += uncertainty_html(*unc, c.culture.critical_do_mol_m3);
    }
    if (grid) body += grid_check_html(*grid);
    write_text_file(folder.file("report.html").string(), report_page("oxystrat: " + c.title, body));
    write_zones_vtu(folder.file("zones.vtu").string(), net, c.output.sectors, arrays);
    write_section_vtu(folder.file("section.vtu").string(), net, arrays);
    folder.commit();
    fmt::print("Wrote {}/result.h5, zones.vtu, section.vtu, report.html{}{}\n", folder.target().string(),
               run.field ? ", profile.csv" : "", unc ? ", uncertainty.csv" : "");
  });
}

}  // namespace oxystrat::cli
