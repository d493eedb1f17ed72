// One case through the whole chain: zone network, hydrodynamics, gas routing, steady oxygen
// field, the single-zone (one average kLa) answer beside it, and the supportable biomass.
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/design_limits.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

struct CaseRun {
  ZoneNetwork net;
  Hydrodynamics hydro;
  GasRouting routing;
  std::optional<OxygenField> field;        //!< empty when no gas is sparged
  std::optional<OxygenField> single_zone;  //!< the same case as one well-mixed zone
  double max_biomass_kg_m3 = 0.0;
  double max_biomass_single_zone_kg_m3 = 0.0;
  bool biomass_searched = false;           //!< the two above were searched for (else they are 0, not an answer)
  std::vector<std::string> cautions;
  std::vector<std::string> notes;          //!< what was skipped and why
  DesignLimits limits;                     //!< heat, shear and cost at this point
};

struct CaseRunOptions {
  bool supportable_biomass = true;  //!< run the root search (many steady solves)
  bool single_zone = true;          //!< also solve the one-zone answer (and its supportable biomass)
  double biomass_rel_tol = 1e-4;    //!< relative tolerance of the supportable biomass [-]
  NewtonOptions field_solve = {};   //!< the field's solve (margin_solve_options() when only checked against limits)
};

//! Told what is being done before each long part of a run (a command shows it on large grids).
using StageReport = std::function<void(const std::string& what)>;

//! `workspace` (optional) is kept by a caller that runs many cases of one grid (a sweep thread):
//! the symbolic work of the linear solves is then done once.
CaseRun run_case(const Case& c, const CaseRunOptions& opts = {}, NewtonWorkspace* workspace = nullptr,
                 const StageReport& stage = {});

//! Per axial row of the network: height [m] and min / volume-mean / max of a zone field.
struct HeightProfile {
  std::vector<double> z, min, mean, max;
};
//! `include` (optional) selects the zones that count, e.g. only gassed zones for C*.
HeightProfile height_profile(const ZoneNetwork& net, const std::vector<double>& field,
                             const std::vector<bool>& include = {});

}  // namespace oxystrat
