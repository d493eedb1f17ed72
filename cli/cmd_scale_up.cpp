// oxystrat scale-up PILOT_CASE PRODUCTION_CASE --out DIR: the production operating point under each common
// scale-up criterion, run through the zone model, side by side.
#include <fmt/format.h>

#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/run_folder.hpp"
#include "postproc/report/report.hpp"
#include "postproc/report/scale_up_output.hpp"
#include "solver/studies/scale_up.hpp"

namespace oxystrat::cli {

void add_scale_up_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("scale-up", "Take a pilot's operating point to the production vessel by each common criterion");
  auto pilot = std::make_shared<std::string>();
  auto prod = std::make_shared<CaseOptions>();
  auto out = std::make_shared<OutputOptions>();
  auto so = std::make_shared<ScaleUpOptions>();
  cmd->add_option("PILOT_CASE", *pilot, "The pilot case (its operating point is carried over)")->required()->check(CLI::ExistingFile);
  cmd->add_option("PRODUCTION_CASE", prod->case_path, "The production case (vessel, impellers, culture, constraints)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("--set", prod->sets, "Override a key of the production case, KEY=VALUE (repeatable)")->take_all();
  add_output_options(*cmd, *out);
  cmd->add_option("--threads", so->threads, "Threads (default: all)")->check(CLI::Range(1, 1024));
  cmd->callback([pilot, prod, out, so] {
    const auto pilot_case = load_case({*pilot, {}});
    const auto production = load_case(*prod);
    const auto overrides = case_overrides(*prod);
    RunFolder folder(out->out_dir, out->force);
    const auto study = study_scale_up(pilot_case, production, overrides, *so);
    fmt::print("{}", scale_up_text(pilot_case.data, production.data, study));
    {
      H5Writer h5(folder.file("result.h5").string());
      write_scale_up_h5(h5, study);
      h5.close();
    }
    write_scale_up_csv(folder.file("scale_up.csv").string(), study);
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat scale-up", scale_up_report_body(pilot_case.data, production.data, study)));
    folder.commit();
    fmt::print("Wrote {}/scale_up.csv, result.h5, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
