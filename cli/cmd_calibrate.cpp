// oxystrat calibrate CASE --kla-data FILE [--mixing-data FILE] --out DIR: the kLa correlation's
// constants (and the exchange constant) fitted to measurements on the user's pilot vessel, written
// as a case fragment to include.
#include <fmt/chrono.h>
#include <fmt/format.h>

#include <chrono>
#include <ctime>
#include <optional>

#include "solver/studies/calibrate_exchange.hpp"
#include "solver/studies/calibrate_kla.hpp"
#include "postproc/report/calibrate_output.hpp"
#include "input/units.hpp"
#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"

namespace oxystrat::cli {
namespace {

struct CalibrateCommandOptions {
  CaseOptions case_opts;
  OutputOptions out;
  std::string kla_data, mixing_data;
  std::string inject, probe;
  double homogeneity = 0.95;
  bool whole_vessel = false;
  bool no_zone_check = false;
};

std::string utc_now() {
  const std::time_t t = std::chrono::system_clock::to_time_t(std::chrono::system_clock::now());
  std::tm tm{};
  gmtime_r(&t, &tm);
  return fmt::format("{:%Y-%m-%d %H:%M} UTC", tm);
}

}  // namespace

void add_calibrate_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "calibrate", "Fit the kLa correlation's constants (and the exchange constant) to measurements on the pilot vessel "
                   "CASE; writes a case fragment to include");
  auto o = std::make_shared<CalibrateCommandOptions>();
  add_case_options(*cmd, o->case_opts);
  add_output_options(*cmd, o->out);
  cmd->add_option("--kla-data", o->kla_data,
                  "Measured kLa per operating point (CSV with units), e.g. 'speed [rpm],gas flow [Nm3/h],kLa [1/h]'")
      ->check(CLI::ExistingFile);
  cmd->add_option("--mixing-data", o->mixing_data,
                  "Measured mixing times per operating point (CSV), e.g. 'speed [rpm],gas flow [Nm3/h],mixing time [s]'")
      ->check(CLI::ExistingFile);
  cmd->add_option("--inject", o->inject, "Tracer injection point of the mixing measurements \"R,Z\" (default: liquid "
                                         "surface at the shaft)");
  cmd->add_option("--probe", o->probe, "Probe point of the mixing measurements \"R,Z\" (default: 3/4 radius, 1/4 of the "
                                       "liquid height)");
  cmd->add_option("--homogeneity", o->homogeneity, "Degree of homogeneity x of the measured theta_x")
      ->check(CLI::Range(0.5, 0.999))
      ->capture_default_str();
  cmd->add_flag("--whole-vessel", o->whole_vessel,
                "Compare the measured mixing times with the whole-vessel theta rather than the probe's");
  cmd->add_flag("--no-zone-check", o->no_zone_check,
                "Skip the steady zone-model solve at every kLa point with the fitted constants");
  cmd->callback([o] {
    if (o->kla_data.empty() && o->mixing_data.empty()) {
      throw CaseError("calibrate: give --kla-data FILE (measured kLa) and/or --mixing-data FILE (measured mixing times)");
    }
    const auto loaded = load_case(o->case_opts);
    const auto overrides = case_overrides(o->case_opts);
    // Checked before the work: an existing folder without --force fails at once.
    for (const auto& data : {o->kla_data, o->mixing_data}) {
      if (!data.empty()) protect_from_replacement(data);
    }
    RunFolder folder(o->out.out_dir, o->out.force);
    CalibrationSources src{o->case_opts.case_path, o->kla_data, o->mixing_data, utc_now()};
    std::optional<KlaCalibration> kla;
    std::optional<MixingCalibration> mix;
    if (!o->kla_data.empty()) {
      const auto data = read_calibration_data(o->kla_data, CalibrationQuantity::kla);
      for (const auto& n : data.notes) fmt::print(stderr, "note: {}\n", n);
      KlaCalibrationOptions ko;
      ko.zone_model_check = !o->no_zone_check;
      kla = calibrate_kla(loaded, overrides, data, ko);
    }
    if (!o->mixing_data.empty()) {
      const auto data = read_calibration_data(o->mixing_data, CalibrationQuantity::mixing_time);
      MixingCalibrationOptions mo;
      mo.mixing.homogeneity = o->homogeneity;
      mo.at_probe = !o->whole_vessel;
      if (!o->inject.empty()) std::tie(mo.mixing.inject_r_m, mo.mixing.inject_z_m) = parse_vessel_point("--inject", o->inject);
      if (!o->probe.empty()) std::tie(mo.mixing.probe_r_m, mo.mixing.probe_z_m) = parse_vessel_point("--probe", o->probe);
      mix = calibrate_exchange(loaded, overrides, data, mo);
    }
    const KlaCalibration* k = kla ? &*kla : nullptr;
    const MixingCalibration* m = mix ? &*mix : nullptr;
    fmt::print("{}", calibration_text(src, k, m));
    if (k) for (const auto& w : k->warnings) fmt::print(stderr, "warning: {}\n", w);
    if (m) for (const auto& w : m->warnings) fmt::print(stderr, "warning: {}\n", w);
    write_text_file(folder.file("calibration.toml").string(), calibration_toml(src, k, m));
    if (k) write_kla_calibration_csv(folder.file("calibration.csv").string(), *k);
    if (m) write_mixing_calibration_csv(folder.file("mixing.csv").string(), *m);
    {
      H5Writer h5(folder.file("result.h5").string());
      write_calibration_h5(h5, src, k, m);
      h5.close();
    }
    write_text_file(folder.file("report.html").string(),
                    report_page("oxystrat calibrate: " + loaded.data.title, calibration_report_body(src, k, m), false));
    folder.commit();
    fmt::print("Wrote {}/calibration.toml{}{}, result.h5, report.html\n", folder.target().string(),
               k ? ", calibration.csv" : "", m ? ", mixing.csv" : "");
    const bool mix_usable = m && m->not_determined.empty();
    if (m && !mix_usable) {
      fmt::print("The exchange constant is not set in calibration.toml: {} (see the warnings).\n", m->not_determined);
    }
    if (!k && !mix_usable) return;
    fmt::print("Use it: include = [\"calibration.toml\"] in a case file (the path relative to that file), or\n");
    std::string sets;
    if (k) {
      sets += fmt::format(" --set model.kla_prefactor={:.6g} --set model.kla_power_exponent={:.6g} --set "
                          "model.kla_gas_exponent={:.6g}",
                          k->fitted.prefactor, k->fitted.power_exponent, k->fitted.gas_exponent);
    }
    if (mix_usable) sets += fmt::format(" --set model.exchange_constant={:.6g}", m->fitted);
    fmt::print("       {}\n", sets.substr(1));
  });
}

}  // namespace oxystrat::cli
