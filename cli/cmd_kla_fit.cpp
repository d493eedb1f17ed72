// oxystrat kla-fit DATA.csv: kLa (and the probe lag) from a measured DO trace by the dynamic
// gassing-out method.
#include <fmt/format.h>

#include <optional>

#include "input/case_reader.hpp"
#include "input/units.hpp"
#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "solver/fit/do_trace.hpp"
#include "solver/fit/kla_fit.hpp"
#include "postproc/report/kla_fit_output.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"

namespace oxystrat::cli {
namespace {

struct KlaFitCommandOptions {
  std::string data;
  std::string probe_lag = "auto";
  std::string our, saturation;
  OutputOptions out;
};

// "auto", "none" or a time with its unit ("12 s", "0.2 min").
void parse_probe_lag(const std::string& text, KlaFitOptions& o) {
  if (text == "auto") {
    o.lag_mode = ProbeLagMode::fitted;
    return;
  }
  if (text == "none") {
    o.lag_mode = ProbeLagMode::none;
    return;
  }
  double tau = 0.0;
  try {
    tau = units::parse(units::Dimension::time, text);
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("--probe-lag '{}': expected auto, none or a time with its unit, e.g. --probe-lag "
                                "\"12 s\" ({})",
                                text, e.what()));
  }
  if (!(tau >= 0.0)) throw CaseError(fmt::format("--probe-lag '{}': a lag cannot be negative", text));
  o.lag_mode = tau > 0.0 ? ProbeLagMode::fixed : ProbeLagMode::none;
  o.probe_lag_s = tau;
}

}  // namespace

void add_kla_fit_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "kla-fit", "kLa (and the probe lag) from a measured DO trace by the dynamic gassing-out method");
  auto o = std::make_shared<KlaFitCommandOptions>();
  cmd->add_option("DATA", o->data,
                  "DO trace (CSV): a header with units, e.g. 'time [s],DO [%]', then one row per sample")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("--probe-lag", o->probe_lag,
                  "Probe time constant: auto (fitted), none, or a measured value with unit, e.g. \"12 s\"")
      ->capture_default_str();
  cmd->add_option("--our", o->our,
                  "O2 uptake rate during the rise, e.g. \"20 mmol/L/h\" or \"0.005 mol/m3/s\" (%/h for a trace in %)");
  cmd->add_option("--saturation", o->saturation,
                  "C* when known, in the trace's kind of unit, e.g. \"100 %\" or \"0.215 mmol/L\" (default: fitted)");
  cmd->add_option("--out", o->out.out_dir, "Output folder for fit.csv, result.h5, report.html (created; must not "
                                           "exist unless --force)");
  cmd->add_flag("--force", o->out.force, "Replace an existing output folder once the new result is complete");
  cmd->callback([o] {
    KlaFitOptions fo;
    parse_probe_lag(o->probe_lag, fo);
    // Checked before the work: an existing folder without --force fails at once.
    protect_from_replacement(o->data);
    std::optional<RunFolder> folder;
    if (!o->out.out_dir.empty()) folder.emplace(o->out.out_dir, o->out.force);
    std::string trimmed;
    const DoTrace trace = rise_from_minimum(read_do_trace(o->data), trimmed);
    if (!o->our.empty()) fo.uptake = parse_uptake_rate(o->our, trace.scale, "--our");
    if (!o->saturation.empty()) fo.saturation = parse_do_value(o->saturation, trace.scale, "--saturation");
    KlaFitResult fit = fit_kla(trace, fo);
    if (!trimmed.empty()) fit.warnings.insert(fit.warnings.begin(), trimmed);
    fmt::print("{}", kla_fit_text(trace, fo, fit));
    for (const auto& w : fit.warnings) fmt::print(stderr, "warning: {}\n", w);
    if (!folder) return;
    write_kla_fit_csv(folder->file("fit.csv").string(), trace, fit);
    {
      H5Writer h5(folder->file("result.h5").string());
      write_kla_fit_h5(h5, trace, fo, fit);
      h5.close();
    }
    write_text_file(folder->file("report.html").string(),
                    report_page("oxystrat kla-fit: " + trace.file_name, kla_fit_report_body(trace, fo, fit), false));
    folder->commit();
    fmt::print("Wrote {}/fit.csv, result.h5, report.html\n", folder->target().string());
  });
}

}  // namespace oxystrat::cli
