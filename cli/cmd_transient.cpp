// oxystrat transient CASE --duration T --out DIR: the oxygen field in time, with DO control and events.
#include <fmt/format.h>

#include <filesystem>
#include <fstream>

#include "case/units.hpp"
#include "common.hpp"
#include "h5_writer.hpp"
#include "network_output.hpp"
#include "report.hpp"
#include "run_folder.hpp"
#include "svg_plot.hpp"
#include "transient.hpp"
#include "vtk_writer.hpp"

namespace oxystrat::cli {
namespace {

struct TransientCommandOptions {
  CaseOptions case_opts;
  OutputOptions out;
  std::string duration = "1 h", step = "5 s", interval = "1 min";
};

double time_option(const std::string& name, const std::string& text) {
  try {
    const double t = units::parse(units::Dimension::time, text);
    if (t > 0.0 && t <= 100 * 86400.0) return t;
  } catch (const units::UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", name, text, e.what()));
  }
  throw CaseError(fmt::format("{} '{}': allowed more than 0 s and at most 100 d", name, text));
}

}  // namespace

void add_transient_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("transient", "The oxygen field in time, with the case's DO control and step events");
  auto o = std::make_shared<TransientCommandOptions>();
  add_case_options(*cmd, o->case_opts);
  add_output_options(*cmd, o->out);
  cmd->add_option("--duration", o->duration, "Time simulated, with a unit (\"12 h\")");
  cmd->add_option("--step", o->step, "Implicit Euler step (\"5 s\")");
  cmd->add_option("--interval", o->interval, "Output interval of the fields (\"1 min\")");
  cmd->callback([o] {
    const auto loaded = load_case(o->case_opts);
    std::vector<Override> overrides;
    for (const auto& s : o->case_opts.sets) overrides.push_back(parse_override(s));
    TransientOptions to;
    to.duration_s = time_option("--duration", o->duration);
    to.step_s = time_option("--step", o->step);
    to.output_interval_s = time_option("--interval", o->interval);
    RunFolder folder(o->out.out_dir, o->out.force);
    const auto r = run_transient(loaded, overrides, to);
    const auto& last = r.trace.back();
    fmt::print("{}\nTransient over {:.4g} s in {} steps: at the end probe DO {:.4f} mmol/L, DO min {:.4f} mmol/L, "
               "{:.1f} % of the volume below critical; speed {:.4g} rpm, gas {:.4g} Nm3/h, O2 {:.1f} %\n",
               loaded.data.title, last.time_s, r.trace.size(), last.probe_do, last.do_min, 100 * last.volume_below_critical,
               60 * last.speed_rps, 3600 * last.gas_normal_m3_s, 100 * last.oxygen_fraction);
    fmt::print("O2 balance over the run: fed {:.6g} mol = off-gas {:.6g} + taken up {:.6g} + stored {:.6g} (residual {:.2e})\n",
               r.o2_fed, r.o2_out, r.o2_taken_up, r.o2_stored_change,
               (r.o2_fed - r.o2_out - r.o2_taken_up - r.o2_stored_change) / r.o2_fed);
    std::ofstream csv(folder.file("trace.csv"));
    csv << "time [s],probe DO [mmol/L],DO min [mmol/L],DO mean [mmol/L],below critical [-],speed [rpm],gas [Nm3/h],"
           "O2 fraction [-],OTR [mol/s],OUR [mol/s]\n";
    std::vector<double> t, probe, dmin, speed;
    for (const auto& s : r.trace) {
      csv << fmt::format("{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g}\n", s.time_s, s.probe_do,
                         s.do_min, s.do_mean, s.volume_below_critical, 60 * s.speed_rps, 3600 * s.gas_normal_m3_s,
                         s.oxygen_fraction, s.otr_mol_s, s.our_mol_s);
      t.push_back(s.time_s);
      probe.push_back(s.probe_do);
      dmin.push_back(s.do_min);
      speed.push_back(60 * s.speed_rps);
    }
    csv.close();
    const auto net = build_zone_geometry(loaded.data);
    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, loaded);
      write_network_h5(h5, net);
      h5.write("/transient/time", t, "s");
      h5.write("/transient/probe_do", probe, "mol/m3");
      h5.write("/transient/do_min", dmin, "mol/m3");
      h5.write("/transient/speed", speed, "rpm");
      h5.write("/transient/probe_zone", std::vector<int>{r.probe_zone}, "1");
      std::vector<double> fields;
      for (const auto& f : r.do_fields) fields.insert(fields.end(), f.begin(), f.end());
      h5.write("/transient/field_time", r.field_time_s, "s");
      h5.write("/transient/do_field", fields, r.do_fields.size(), static_cast<size_t>(net.size()), "mol/m3");
      h5.write("/transient/o2_fed", r.o2_fed, "mol");
      h5.write("/transient/o2_offgas", r.o2_out, "mol");
      h5.write("/transient/o2_taken_up", r.o2_taken_up, "mol");
      h5.write("/transient/o2_stored_change", r.o2_stored_change, "mol");
      h5.close();
    }
    std::filesystem::create_directory(folder.file("fields"));
    std::vector<std::string> files;
    for (size_t i = 0; i < r.do_fields.size(); ++i) {
      const auto name = fmt::format("fields/section_{:04d}.vtu", i);
      auto arrays = network_cell_arrays(net);
      arrays.push_back({"do", r.do_fields[i], {}});
      write_section_vtu(folder.file(name).string(), net, arrays);
      files.push_back(name);
    }
    write_pvd(folder.file("transient.pvd").string(), r.field_time_s, files);
    const double crit = loaded.data.culture.critical_do_mol_m3;
    std::string body = "<h2>Transient</h2>\n<div class=\"row\">\n";
    body += svg::line_chart("DO at the probe and the vessel minimum", "time [s]", "DO [mmol/L]",
                            {{"probe", t, probe, "#1f77b4"}, {"minimum over zones", t, dmin, "#d62728"}},
                            {{false, crit, "critical DO"}}, 620, 320);
    body += svg::line_chart("Agitator speed", "time [s]", "speed [rpm]", {{"speed", t, speed, "#2ca02c"}}, {}, 620, 320);
    body += "</div>\n";
    write_text_file(folder.file("report.html").string(), report_page("oxystrat transient: " + loaded.data.title, body));
    folder.commit();
    fmt::print("Wrote {}/trace.csv, result.h5, transient.pvd, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
