// Bundled demo cases, sized with --set style overrides, for the benchmark programs.
#pragma once

#include <cmath>
#include <string>
#include <vector>

#include "input/case_reader.hpp"

namespace oxystrat::bench {

inline std::string bundled_case(const std::string& name) { return std::string(OXYSTRAT_SOURCE_DIR) + "/cases/" + name; }

//! The bundled case `name` with `--set` arguments applied (as the CLI applies them).
inline LoadedCase load_case(const std::string& name, const std::vector<std::string>& sets = {}) {
  std::vector<Override> overrides;
  for (const auto& s : sets) overrides.push_back(parse_override(s));
  return read_case_file(bundled_case(name), overrides);
}

//! Grid overrides for about `zones` zones in the 1 : 5 radial : axial proportion of the tall demo
//! (R = 1.6 m, H = 8 m, so the cells are about square in (r, z)); 2000 gives 20 x 100. Grid
//! alignment adds a few lines and the bottom head removes a few cells.
inline std::vector<std::string> grid_for_zones(double zones) {
  const int radial = static_cast<int>(std::lround(std::sqrt(zones / 5.0)));
  const int axial = static_cast<int>(std::lround(zones / radial));
  return {"grid.radial=" + std::to_string(radial), "grid.axial=" + std::to_string(axial)};
}

}  // namespace oxystrat::bench
