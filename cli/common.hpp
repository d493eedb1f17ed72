// Pieces every command shares: the case argument with --set overrides, and the output folder.
#pragma once

#include <CLI/CLI.hpp>

#include <string>
#include <utility>
#include <vector>

#include "input/case_reader.hpp"

namespace oxystrat::cli {

struct CaseOptions {
  std::string case_path;
  std::vector<std::string> sets;
};

struct OutputOptions {
  std::string out_dir;
  bool force = false;
};

//! Adds CASE and --set to a command.
void add_case_options(CLI::App& cmd, CaseOptions& o);
//! Adds --out (required) and --force to a command.
void add_output_options(CLI::App& cmd, OutputOptions& o);

//! The --set arguments of `o`, parsed (CaseError for one without '=').
std::vector<Override> case_overrides(const CaseOptions& o);
//! Reads the case with its overrides; prints the reader's notes to stderr as warnings.
LoadedCase load_case(const CaseOptions& o);

//! A point in the vessel given to `option` as "R,Z": two lengths with units, the distance from the
//! axis and the height above the lowest point, in m (neither negative).
std::pair<double, double> parse_vessel_point(const std::string& option, const std::string& text);

void add_run_command(CLI::App& app);
void add_check_command(CLI::App& app);
void add_mixing_command(CLI::App& app);
void add_compare_command(CLI::App& app);
void add_sweep_command(CLI::App& app);
void add_kla_fit_command(CLI::App& app);
void add_validate_command(CLI::App& app);
void add_lifelines_command(CLI::App& app);
void add_transient_command(CLI::App& app);
void add_calibrate_command(CLI::App& app);
void add_levers_command(CLI::App& app);
void add_scale_up_command(CLI::App& app);

}  // namespace oxystrat::cli
