// oxystrat mixing CASE --out DIR: tracer mixing time computed on the zone network.
#include <fmt/format.h>

#include <filesystem>

#include "input/units.hpp"
#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/hydro_output.hpp"
#include "postproc/report/mixing_output.hpp"
#include "postproc/report/report.hpp"
#include "solver/flow/mixing_time.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/io/run_folder.hpp"
#include "postproc/io/vtk_writer.hpp"

namespace oxystrat::cli {
namespace {

struct MixingCommandOptions {
  CaseOptions case_opts;
  OutputOptions out;
  std::string inject, probe;
  double homogeneity = 0.95;
};


}  // namespace

void add_mixing_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("mixing", "Tracer mixing time of a case, computed on its zone network");
  auto o = std::make_shared<MixingCommandOptions>();
  add_case_options(*cmd, o->case_opts);
  add_output_options(*cmd, o->out);
  cmd->add_option("--inject", o->inject, "Injection point \"R,Z\" (default: liquid surface at the shaft)");
  cmd->add_option("--probe", o->probe, "Probe point \"R,Z\" (default: 3/4 radius, 1/4 of the liquid height)");
  cmd->add_option("--homogeneity", o->homogeneity, "Degree of homogeneity x of theta_x")->check(CLI::Range(0.5, 0.999));
  cmd->callback([o] {
    const auto loaded = load_case(o->case_opts);
    const Case& c = loaded.data;
    RunFolder folder(o->out.out_dir, o->out.force);
    const auto net = build_zone_geometry(c);
    const auto hydro = compute_hydrodynamics(c, net);
    MixingOptions mo;
    mo.homogeneity = o->homogeneity;
    if (!o->inject.empty()) std::tie(mo.inject_r_m, mo.inject_z_m) = parse_vessel_point("--inject", o->inject);
    if (!o->probe.empty()) std::tie(mo.probe_r_m, mo.probe_z_m) = parse_vessel_point("--probe", o->probe);
    const auto mix = tracer_mixing_time(net, hydro, mo);
    const std::string theta = theta_label(mo.homogeneity);
    fmt::print("{}\n{}\n{}", c.title, mixing_headline(c, mix, mo.homogeneity), power_table(c, hydro));
    fmt::print("Mixing ({} zones, {} implicit steps, {} factorisations)\n", net.size(), mix.stats.steps,
               mix.stats.factorisations);
    fmt::print("  {} whole vessel  {:.4g} s  (N theta = {:.4g}{})\n", theta, mix.theta_s, c.operation.speed_rps * mix.theta_s,
               mix.judged_volume_fraction < 1.0
                   ? fmt::format("; the broth inside the caverns: the {:.1f} % outside them is stagnant and not counted",
                                 100.0 * (1.0 - mix.judged_volume_fraction))
                   : "");
    fmt::print("  {} at the probe  {:.4g} s  (zone {} at r = {:.3g} m, z = {:.3g} m)\n", theta, mix.theta_probe_s,
               mix.probe_zone, net.r[mix.probe_zone], net.z[mix.probe_zone]);
    fmt::print("  injected in zone {} at r = {:.3g} m, z = {:.3g} m\n", mix.inject_zone, net.r[mix.inject_zone],
               net.z[mix.inject_zone]);
    if (!mix.reached) fmt::print(stderr, "warning: the tracer did not mix within {:.3g} s; theta is a lower bound\n", mo.max_time_s);

    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, loaded);
      write_network_h5(h5, net);
      write_hydrodynamics_h5(h5, c, hydro);
      write_mixing_h5(h5, mix, mo.homogeneity);
      h5.close();
    }
    write_mixing_csv(folder.file("tracer.csv").string(), mix);
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat mixing: " + c.title, mixing_report_body(c, net, hydro, mix, mo.homogeneity)));
    // A ParaView time series of the tracer field on the (r, z) section and the revolved network.
    std::filesystem::create_directory(folder.file("tracer"));
    std::vector<std::string> sections, volumes;
    auto base = network_cell_arrays(net);
    for (size_t i = 0; i < mix.snapshots.size(); ++i) {
      auto arrays = base;
      const auto& s = mix.snapshots[i];
      arrays.push_back({"tracer", std::vector<double>(s.data(), s.data() + s.size()), {}});
      const auto sec = fmt::format("tracer/section_{:04d}.vtu", i);
      const auto vol = fmt::format("tracer/zones_{:04d}.vtu", i);
      write_section_vtu(folder.file(sec).string(), net, arrays);
      write_zones_vtu(folder.file(vol).string(), net, c.output.sectors, arrays);
      sections.push_back(sec);
      volumes.push_back(vol);
    }
    write_pvd(folder.file("tracer_section.pvd").string(), mix.snapshot_time_s, sections);
    write_pvd(folder.file("tracer.pvd").string(), mix.snapshot_time_s, volumes);
    folder.commit();
    fmt::print("Wrote {}/result.h5, tracer.csv, tracer.pvd, tracer_section.pvd, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
