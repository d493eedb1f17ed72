// oxystrat levers CASE --out DIR: each lever the trade uses, moved alone to the smallest change that
// meets the case's constraints, with what it costs.
#include <fmt/format.h>

#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/io/run_folder.hpp"
#include "postproc/report/levers_output.hpp"
#include "postproc/report/report.hpp"
#include "solver/studies/levers.hpp"

namespace oxystrat::cli {

void add_levers_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "levers", "Move speed, gas flow, back pressure and O2 enrichment alone to what meets the constraints; their side effects");
  auto opts = std::make_shared<CaseOptions>();
  auto out = std::make_shared<OutputOptions>();
  auto lo = std::make_shared<LeverOptions>();
  add_case_options(*cmd, *opts);
  add_output_options(*cmd, *out);
  cmd->add_option("--impellers", lo->impeller_case, "A case file of the same vessel whose impellers to try instead")
      ->check(CLI::ExistingFile);
  cmd->add_option("--threads", lo->threads, "Threads (default: all)")->check(CLI::Range(1, 1024));
  cmd->callback([opts, out, lo] {
    const auto loaded = load_case(*opts);
    const auto overrides = case_overrides(*opts);
    if (!lo->impeller_case.empty()) protect_from_replacement(lo->impeller_case);
    RunFolder folder(out->out_dir, out->force);
    const auto study = study_levers(loaded, overrides, *lo);
    fmt::print("{}", levers_text(loaded.data, study));
    {
      H5Writer h5(folder.file("result.h5").string());
      write_case_h5(h5, loaded);
      write_levers_h5(h5, study);
      h5.close();
    }
    write_levers_csv(folder.file("levers.csv").string(), study);
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat levers: " + loaded.data.title, levers_report_body(loaded.data, study)));
    folder.commit();
    fmt::print("Wrote {}/levers.csv, result.h5, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
