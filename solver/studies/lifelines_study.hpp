// What cells experience in one state of the tank (`oxystrat lifelines`): the steady field, or the
// transient frozen at a time T0, whose operating point then sets the flow and whose DO and
// substrate fields are what the cells see; then the cells followed through that flow field
// (solver/studies/lifelines.hpp).
#pragma once

#include <optional>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/lifelines.hpp"

namespace oxystrat {

struct LifelineStudyOptions {
  LifelineOptions cells;
  //! Freeze the transient at this time [s] (the case's control, events, growth and feed run up to
  //! it); empty: the steady field.
  std::optional<double> after_s;
  //! With after_s and a growing culture: cells are outside above this substrate [kg/m3]; empty: K_S.
  std::optional<double> substrate_threshold_kg_m3;
  //! The case's --set arguments, which the transient's events re-apply when they re-read the case.
  std::vector<Override> overrides;
};

struct LifelineStudy {
  Case at;                           //!< the case at the operating point that sets the flow
  std::optional<double> frozen_at_s; //!< with after_s: the time of the frame the fields come from [s]
  CaseRun run;                       //!< network and flow at `at` (no supportable biomass or one-zone answer)
  std::vector<double> do_mol_m3;     //!< the DO the cells see [mol/m3]; empty without gas (steady)
  LifelineRegimes regimes;           //!< impeller discharge and bulk of each impeller's loop
  LifelineResult result;
  //! What the fields the cells see rest on: the transient's cautions up to T0 with after_s, else
  //! the steady run's.
  std::vector<std::string> cautions;
};

LifelineStudy run_lifeline_study(const LoadedCase& loaded, const LifelineStudyOptions& opts);

}  // namespace oxystrat
