// oxystrat: oxygen supply zone by zone in stirred bioreactors. This file only wires the commands.
#include <fmt/format.h>

#include <CLI/CLI.hpp>
#include <exception>

#include "cli/common.hpp"
#include "postproc/io/interrupts.hpp"
#include "postproc/io/run_folder.hpp"
#include "solver/linalg/memory_policy.hpp"
#include "cli/ranks.hpp"

#ifndef OXYSTRAT_VERSION
#define OXYSTRAT_VERSION "0.0.0"
#endif

namespace {

int run(int argc, char** argv) {
  CLI::App app{"oxystrat: where a stirred, sparged vessel runs short of oxygen, zone by zone"};
  app.set_version_flag("--version", std::string("oxystrat ") + OXYSTRAT_VERSION);
  app.require_subcommand(1, 1);
  oxystrat::cli::add_run_command(app);
  oxystrat::cli::add_check_command(app);
  oxystrat::cli::add_mixing_command(app);
  oxystrat::cli::add_compare_command(app);
  oxystrat::cli::add_sweep_command(app);
  oxystrat::cli::add_kla_fit_command(app);
  oxystrat::cli::add_validate_command(app);
  oxystrat::cli::add_lifelines_command(app);
  oxystrat::cli::add_transient_command(app);
  oxystrat::cli::add_calibrate_command(app);
  oxystrat::cli::add_levers_command(app);
  oxystrat::cli::add_scale_up_command(app);
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    return app.exit(e);
  } catch (const std::exception& e) {
    fmt::print(stderr, "oxystrat: error: {}\n", e.what());
    oxystrat::cli::abort_ranks(1);  // the other ranks would wait for this one forever
    return 1;
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  oxystrat::retain_freed_memory();
  oxystrat::clean_up_on_interrupt();  // first: before MPI or OpenMP start threads
  oxystrat::cli::start_ranks(&argc, &argv);
  oxystrat::set_run_folder_notes([](const std::string& s) { fmt::print(stderr, "note: {}\n", s); });
  const int code = run(argc, argv);
  oxystrat::cli::stop_ranks();
  return code;
}
