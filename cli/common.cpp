#include "cli/common.hpp"

#include <fmt/format.h>

#include "input/errors.hpp"
#include "input/units.hpp"
#include "postproc/io/run_folder.hpp"

namespace oxystrat::cli {

void add_case_options(CLI::App& cmd, CaseOptions& o) {
  cmd.add_option("CASE", o.case_path, "Case file (TOML)")->required()->check(CLI::ExistingFile);
  cmd.add_option("--set", o.sets,
                 "Override a case key, KEY=VALUE with the units of the case file, e.g. "
                 "--set operation.speed=\"110 rpm\" --set impeller.1.type=hydrofoil-up (repeatable)")
      ->take_all()
      ->allow_extra_args(false);
}

void add_output_options(CLI::App& cmd, OutputOptions& o) {
  cmd.add_option("--out", o.out_dir, "Output folder (created; must not exist unless --force)")->required();
  cmd.add_flag("--force", o.force, "Replace an existing output folder once the new result is complete");
}

std::vector<Override> case_overrides(const CaseOptions& o) {
  std::vector<Override> overrides;
  for (const auto& s : o.sets) overrides.push_back(parse_override(s));
  return overrides;
}

LoadedCase load_case(const CaseOptions& o) {
  protect_from_replacement(o.case_path);
  auto loaded = read_case_file(o.case_path, case_overrides(o));
  for (const auto& f : loaded.included_files) protect_from_replacement(f);
  for (const auto& note : loaded.notes) fmt::print(stderr, "warning: {}\n", note);
  return loaded;
}

std::pair<double, double> parse_vessel_point(const std::string& option, const std::string& text) {
  const auto comma = text.find(',');
  if (comma == std::string::npos) {
    throw CaseError(fmt::format("{} '{}': expected R,Z with units, e.g. {} \"0.4 m,7.5 m\"", option, text, option));
  }
  double r = 0.0, z = 0.0;
  try {
    r = units::parse(units::Dimension::length, text.substr(0, comma));
    z = units::parse(units::Dimension::length, text.substr(comma + 1));
  } catch (const UnitError& e) {
    throw CaseError(fmt::format("{} '{}': {}", option, text, e.what()));
  }
  if (r < 0.0 || z < 0.0) {
    throw CaseError(fmt::format("{} '{}': R is the distance from the vessel's axis and Z the height above its lowest "
                                "point; neither can be negative",
                                option, text));
  }
  return {r, z};
}

}  // namespace oxystrat::cli
