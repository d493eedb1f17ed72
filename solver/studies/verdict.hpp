// The engineer's answer first: does the tank meet its constraints, which limit binds, and where
// it starves, in words a manager can read.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/constraints.hpp"

namespace oxystrat {

//! Where the broth is below the DO floor: the band of heights and radii it spans [m] and its share
//! of the volume [-].
struct StarvedRegion {
  double volume_fraction = 0.0;
  double z_lo = 0.0, z_hi = 0.0, r_lo = 0.0, r_hi = 0.0;
  std::string where;  //!< "the top 1.9 m", "the bottom head", "near the wall from 2.1 to 3.4 m", ...
};

struct Verdict {
  bool meets = false;                   //!< every constraint satisfied
  std::vector<ConstraintCheck> checks;
  double do_floor_mol_m3 = 0.0;
  StarvedRegion starved;
  std::string binding;                  //!< the constraints that fail ('; '-separated); empty when all hold
  std::string headline;                 //!< one sentence: fine or not, and why
  std::string advice;                   //!< what to change, or what to watch
};

Verdict make_verdict(const Case& c, const CaseRun& run);

struct LeversStudy;
//! The advice of a failing verdict from a levers study: each lever that fixes it, with its value.
std::string lever_advice(const LeversStudy& levers);

}  // namespace oxystrat
