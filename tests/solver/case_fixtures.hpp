// Small cases written inline for solver tests, and a helper to run the chain on them.
#pragma once

#include <fmt/format.h>

#include <string>

#include "input/case_reader.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "mesh/zone_network.hpp"
#include "solver/studies/reference_cases.hpp"

namespace oxystrat::fixtures {

//! A single impeller at H = T in a flat-bottomed 1 m vessel, no gas: the mixing-time reference.
inline Case single_impeller(const std::string& type, double d_over_t, int radial, int axial, double speed_rpm = 120.0) {
  return reference_single_impeller(type, d_over_t, radial, axial, speed_rpm);
}

//! A gassed 2.5 m3 vessel with two Rushtons and a culture: the oxygen-field workhorse.
inline Case gassed_vessel(int radial = 6, int axial = 16) { return reference_gassed_vessel(radial, axial, 15.0); }

//! The chain from a case to what the oxygen solve needs: zones, hydrodynamics, gas routing.
struct Chain {
  ZoneNetwork net;
  Hydrodynamics hydro;
  GasRouting routing;
  explicit Chain(const Case& c) : net(build_zone_geometry(c)), hydro(compute_hydrodynamics(c, net)), routing(route_gas(c, net, hydro)) {}
};

inline std::string source_dir() { return OXYSTRAT_SOURCE_DIR; }

//! The bundled tall demo (cases/tall-3rushton.toml) on a radial x axial grid.
inline Case tall_demo(int radial, int axial) {
  return read_case_file(source_dir() + "/cases/tall-3rushton.toml",
                        {parse_override(fmt::format("grid.radial={}", radial)), parse_override(fmt::format("grid.axial={}", axial))})
      .data;
}

}  // namespace oxystrat::fixtures
