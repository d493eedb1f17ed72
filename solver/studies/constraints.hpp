// Does an operating point keep the case's [constraints]? One check per limit, in words.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/oxygen/case_run.hpp"

namespace oxystrat {

struct ConstraintCheck {
  std::string name;    //!< "do_min", "tip_speed", ...
  bool satisfied = true;
  std::string detail;  //!< "DO min 0.012 mmol/L < 0.020 mmol/L"
};

std::vector<ConstraintCheck> check_constraints(const Case& c, const CaseRun& run);
bool feasible(const std::vector<ConstraintCheck>& checks);

}  // namespace oxystrat
