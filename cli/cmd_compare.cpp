// oxystrat compare CASE_A CASE_B ... --out DIR: configurations side by side.
#include <fmt/format.h>

#include <filesystem>
#include <set>

#include "cli/common.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/report/hydro_output.hpp"
#include "postproc/io/network_output.hpp"
#include "postproc/report/oxygen_output.hpp"
#include "postproc/io/progress.hpp"
#include "postproc/report/report.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/studies/compare.hpp"
#include "solver/studies/sweep_choice.hpp"
#include "postproc/report/table_output.hpp"

namespace oxystrat::cli {
namespace {

struct CompareCommandOptions {
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
  auto o = std::make_shared<CompareCommandOptions>();
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
    Progress progress(loaded.size(), "cases");
    CaseComparisonOptions co;
    co.with_mixing = !o->no_mixing;
    co.uncertainty_samples = o->uncertainty;
    co.seed = o->seed;
    co.on_case_done = [&progress] { progress.step(); };
    const auto runs = compare_cases(loaded, co);
    std::vector<std::vector<SummaryValue>> values;
    std::vector<ComparedCase> compared;
    std::vector<bool> feasible_flags;
    std::vector<std::string> violated;  // per case, the constraints it breaks
    for (size_t i = 0; i < loaded.size(); ++i) {
      values.push_back(runs[i].values);
      feasible_flags.push_back(runs[i].feasible);
      violated.push_back(broken_constraints(runs[i].checks));
      compared.push_back({names[i], &loaded[i].data, &runs[i].run, runs[i].values, runs[i].checks});
    }
    fmt::print("{}", compare_text(names, values, feasible_flags, violated));
    for (size_t i = 0; i < loaded.size(); ++i) {
      for (const auto& w : runs[i].run.cautions) fmt::print("caution ({}): {}\n", names[i], w);
      if (const auto note = scatter_note(names[i], runs[i].values, feasible_flags[i]); !note.empty()) fmt::print("note: {}\n", note);
    }
    {
      H5Writer h5(folder.file("result.h5").string());
      write_compare_h5(h5, names, values, feasible_flags, violated);
      for (size_t i = 0; i < loaded.size(); ++i) {
        h5.set_prefix("/cases/" + names[i]);
        write_case_h5(h5, loaded[i]);
        write_network_h5(h5, runs[i].run.net);
        write_hydrodynamics_h5(h5, loaded[i].data, runs[i].run.hydro);
        write_oxygen_h5(h5, loaded[i].data, runs[i].run);
      }
      h5.set_prefix("");
      h5.close();
    }
    write_compare_csv(folder.file("compare.csv").string(), names, values, violated);
    std::string body = compare_report_body(compared);
    for (size_t i = 0; i < loaded.size(); ++i) {
      body += run_report_body(loaded[i].data, runs[i].run, runs[i].theta95_s, nullptr, true, loaded[i].notes);
    }
    write_text_file(folder.file("report.html").string(), report_page("oxystrat: comparison", body));
    folder.commit();
    fmt::print("Wrote {}/compare.csv, result.h5, report.html\n", folder.target().string());
  });
}

}  // namespace oxystrat::cli
