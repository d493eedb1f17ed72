// oxystrat compare CASE_A CASE_B ... --out DIR: configurations side by side.
#include <fmt/format.h>

#include <filesystem>
#include <set>

#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/hydro_output.hpp"
#include "solver/flow/mixing_time.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/report/oxygen_output.hpp"
#include "postproc/io/progress.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/oxygen/summary_values.hpp"
#include "solver/studies/sweep.hpp"
#include "solver/studies/sweep_choice.hpp"
#include "postproc/report/table_output.hpp"

namespace oxystrat::cli {
namespace {

struct CompareOptions {
  std::vector<std::string> cases;
  std::vector<std::string> sets;
  OutputOptions out;
  bool no_mixing = false;
  int uncertainty = 0;
  std::uint64_t seed = 1;
};

// Group names from the file stems, made unique.
std::vector<std::string> case_names(const std::vector<std::string>& paths) {
  std::vector<std::string> names;
  std::set<std::string> seen;
  for (const auto& p : paths) {
    std::string n = std::filesystem::path(p).stem().string();
    for (int k = 2; seen.count(n) != 0; ++k) n = std::filesystem::path(p).stem().string() + "-" + std::to_string(k);
    seen.insert(n);
    names.push_back(n);
  }
  return names;
}

}  // namespace

void add_compare_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("compare", "Run several cases and put them side by side (table, CSV, HDF5, report)");
  auto o = std::make_shared<CompareOptions>();
  cmd->add_option("CASES", o->cases, "Case files (TOML), two or more")->required()->expected(1, -1)->check(CLI::ExistingFile);
  cmd->add_option("--set", o->sets, "Override a key in every case, KEY=VALUE (repeatable)")->take_all()->allow_extra_args(false);
  add_output_options(*cmd, o->out);
  cmd->add_flag("--no-mixing", o->no_mixing, "Skip the tracer mixing time (faster)");
  cmd->add_option("--uncertainty", o->uncertainty, "Monte Carlo samples per case: P10/P50/P90 rows and whiskers")
      ->check(CLI::Range(0, 100000));
  cmd->add_option("--seed", o->seed, "Seed of the uncertainty samples");
  cmd->callback([o] {
    std::vector<LoadedCase> loaded;
    for (const auto& path : o->cases) loaded.push_back(load_case({path, o->sets}));
    RunFolder folder(o->out.out_dir, o->out.force);
    const auto names = case_names(o->cases);
    std::vector<CaseRun> runs(loaded.size());
    std::vector<double> theta(loaded.size(), 0.0);
    Progress progress(loaded.size(), "cases");
    // Cases are independent: run them in parallel; results land by index.
#pragma omp parallel for schedule(dynamic, 1)
    for (long i = 0; i < static_cast<long>(loaded.size()); ++i) {
      runs[i] = run_case(loaded[i].data);
      if (!o->no_mixing) theta[i] = tracer_mixing_time(runs[i].net, runs[i].hydro, {}).theta_s;
#pragma omp critical(oxystrat_progress)
      progress.step();
    }
    std::vector<std::vector<SummaryValue>> values;
    std::vector<ComparedCase> compared;
    std::vector<bool> feasible_flags;
    std::vector<std::string> violated;  // per case, the constraints it breaks
    for (size_t i = 0; i < loaded.size(); ++i) {
      values.push_back(summary_values(loaded[i].data, runs[i], o->no_mixing ? std::nullopt : std::optional<double>(theta[i])));
      if (o->uncertainty > 0) append_uncertainty_values(loaded[i].data, o->uncertainty, o->seed, !o->no_mixing, values.back());
      const auto checks = check_constraints(loaded[i].data, runs[i]);
      feasible_flags.push_back(feasible(checks));
      violated.push_back(broken_constraints(checks));
      compared.push_back({names[i], &loaded[i].data, &runs[i], values.back(), checks});
    }
    fmt::print("{}", compare_text(names, values, feasible_flags, violated));
    for (size_t i = 0; i < loaded.size(); ++i) {
      for (const auto& w : runs[i].cautions) fmt::print("caution ({}): {}\n", names[i], w);
    }
    {
      H5Writer h5(folder.file("result.h5").string());
      write_compare_h5(h5, names, values, feasible_flags, violated);
      for (size_t i = 0; i < loaded.size(); ++i) {
        h5.set_prefix("/cases/" + names[i]);
        write_case_h5(h5, loaded[i]);
        write_network_h5(h5, runs[i].net);
        write_hydrodynamics_h5(h5, loaded[i].data, runs[i].hydro);
        write_oxygen_h5(h5, loaded[i].data, runs[i]);
      }
      h5.set_prefix("");
      h5.close();
    }
    write_compare_csv(folder.file("compare.csv").string(), names, values, violated);
    std::string body = compare_report_body(compared);
    for (size_t i = 0; i < loaded.size(); ++i) {
      body += run_report_body(loaded[i].data, runs[i], o->no_mixing ? std::nullopt : std::optional<double>(theta[i]));
    }
    write_text_file(folder.file("report.html").string(), report_page("oxystrat: comparison", body));
    folder.commit();
    fmt::print("Wrote {}/compare.csv, result.h5, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
