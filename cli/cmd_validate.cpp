// oxystrat validate --out DIR: every published check the model makes, in one table.
#include <fmt/format.h>

#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/studies/validation.hpp"
#include "postproc/report/validation_output.hpp"
#include "input/errors.hpp"

namespace oxystrat::cli {

void add_validate_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("validate", "Run every published check of the model and write the validation report");
  auto out = std::make_shared<OutputOptions>();
  add_output_options(*cmd, *out);
  cmd->callback([out] {
    RunFolder folder(out->out_dir, out->force);
    const auto& checks = validation_checks();
    std::vector<ValidationResult> results(checks.size());
#pragma omp parallel for schedule(dynamic, 1)
    for (long i = 0; i < static_cast<long>(checks.size()); ++i) results[i] = run_check(checks[i]);
    fmt::print("{}", validation_text(results));
    size_t failed = 0;
    for (const auto& r : results) failed += !r.passed;
    write_validation_csv(folder.file("validation.csv").string(), results);
    {
      H5Writer h5(folder.file("result.h5").string());
      write_validation_h5(h5, results);
      h5.close();
    }
    write_text_file(folder.file("report.html").string(), report_page("oxystrat validation", validation_html(results), false));
    folder.commit();
    fmt::print("{} of {} checks pass. Wrote {}/validation.csv, result.h5, report.html\n", results.size() - failed,
               results.size(), folder.target().string());
    if (failed > 0) throw Error(fmt::format("{} validation check(s) FAILED (listed above)", failed));
  });
}

}  // namespace oxystrat::cli
