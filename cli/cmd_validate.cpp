// oxystrat validate --out DIR: verification checks and validation against measured data.
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
  auto* cmd = app.add_subcommand("validate", "Verify the code against its equations and validate the model against measured data (report)");
  auto out = std::make_shared<OutputOptions>();
  add_output_options(*cmd, *out);
  cmd->callback([out] {
    RunFolder folder(out->out_dir, out->force);
    const auto& checks = validation_checks();
    std::vector<ValidationResult> results(checks.size());
#pragma omp parallel for schedule(dynamic, 1)
    for (long i = 0; i < static_cast<long>(checks.size()); ++i) results[i] = run_check(checks[i]);
    fmt::print("{}", validation_text(results));
    write_validation_csv(folder.file("validation.csv").string(), results);
    {
      H5Writer h5(folder.file("result.h5").string());
      write_validation_h5(h5, results);
      h5.close();
    }
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat: verification and validation", validation_html(results), false));
    folder.commit();
    const auto t = tally(results);
    fmt::print("Verification: {} of {} checks pass. Validation: {} of {} rows of measured data inside their band. "
               "Wrote {}/validation.csv, result.h5, report.html\n",
               t.verification_checks - t.verification_failed, t.verification_checks, t.inside_band, t.validation_rows,
               folder.target().string());
    // A failed verification is a bug; a validation row outside its band is a finding, reported above.
    if (t.verification_failed > 0) {
      throw Error(fmt::format("{} verification check(s) FAILED (listed above)", t.verification_failed));
    }
    if (t.errors > 0) throw Error(fmt::format("{} validation row(s) could not be computed (listed above)", t.errors));
  });
}

}  // namespace oxystrat::cli
