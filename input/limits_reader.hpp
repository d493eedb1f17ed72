// Reads the keys of a design's other limits (heat, shear, cost): culture.kind and heat_yield,
// impeller.N.dissipation_ratio, the [cooling], [utilities] and [prices] tables and their
// [constraints]. Called by the case reader after the tables these keys depend on.
#pragma once

#include "input/case.hpp"
#include "input/toml_source.hpp"

namespace oxystrat::detail {

//! Fills c.cooling, c.utilities, c.prices, c.culture.kind / heat_yield, the impellers'
//! dissipation ratios and the heat and shear constraints. Throws CaseError naming file:line.
void read_design_limits(TomlSource& src, Case& c);

}  // namespace oxystrat::detail
