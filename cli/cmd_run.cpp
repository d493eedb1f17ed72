// oxystrat run CASE --out DIR: the main job on one case.
#include <fmt/format.h>

#include "common.hpp"
#include "h5_writer.hpp"
#include "hydro_output.hpp"
#include "case_run.hpp"
#include "oxygen_output.hpp"
#include "report.hpp"
#include "network_output.hpp"
#include "run_folder.hpp"
#include "text_summary.hpp"
#include "vtk_writer.hpp"
#include "zone_network.hpp"

namespace oxystrat::cli {

struct RunOptions {
  CaseOptions case_opts;
  OutputOptions out;
};

void add_run_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("run", "Build the zone network of a case, solve it and write the results");
  auto opts = std::make_shared<RunOptions>();
  add_case_options(*cmd, opts->case_opts);
  add_output_options(*cmd, opts->out);
  cmd->callback([opts] {
    const auto loaded = load_case(opts->case_opts);
    RunFolder folder(opts->out.out_dir, opts->out.force);
    const auto run = run_case(loaded.data);
    const auto& net = run.net;
    const auto& hydro = run.hydro;
    fmt::print("{}", geometry_summary(loaded, net));
    fmt::print("{}", power_table(loaded.data, hydro));
    fmt::print("{}", oxygen_summary(loaded.data, run));
    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, loaded);
      write_network_h5(h5, net);
      write_hydrodynamics_h5(h5, loaded.data, hydro);
      write_oxygen_h5(h5, loaded.data, run);
      h5.close();
    }
    auto arrays = network_cell_arrays(net);
    for (auto& a : hydrodynamics_cell_arrays(hydro)) arrays.push_back(std::move(a));
    for (auto& a : oxygen_cell_arrays(run)) arrays.push_back(std::move(a));
    write_profile_csv(folder.file("profile.csv").string(), run);
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat: " + loaded.data.title, run_report_body(loaded.data, run, std::nullopt)));
    write_zones_vtu(folder.file("zones.vtu").string(), net, loaded.data.output.sectors, arrays);
    write_section_vtu(folder.file("section.vtu").string(), net, arrays);
    folder.commit();
    fmt::print("Wrote {}/result.h5, zones.vtu, section.vtu, report.html{}\n", folder.target().string(), run.field ? ", profile.csv" : "");
  });
}

}  // namespace oxystrat::cli
