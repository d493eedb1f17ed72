// Physical hazards and limits of the model that apply to a result, in plain words. They are
// printed and stored; they defer to local codes, the vessel's certification and licensed practice.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "physics/constants.hpp"

namespace oxystrat {

//! `field` may be null (no gas: only the hydrodynamic cautions apply).
std::vector<std::string> cautions(const Case& c, const Hydrodynamics& h, const OxygenField* field);

//! pCO2 above which cell cultures are inhibited [Pa]: 150 mmHg (Gray et al. 1996). Microbial
//! cultures are cautioned from the same value, the middle of their wide range.
inline constexpr double pco2_inhibition_pa = 150.0 * kMmHgPa;

//! The caution for a largest pCO2 of `pco2_pa` in a culture of this kind; empty below
//! pco2_inhibition_pa.
std::string pco2_caution(CultureKind kind, double pco2_pa);

}  // namespace oxystrat
