// Checks of a read case that no single key can make: limits that must be ordered, gas that may
// not add up, a broth that boils at the head pressure, and the [[event]] overrides, which are
// applied to the case at their time but are checked now, before any work.
#pragma once

#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "input/toml_source.hpp"

namespace oxystrat::detail {

//! Water vapour pressure at or above this share of the head pressure earns a caution: the head
//! space is mostly vapour, C* a fraction of its dry-gas value, and the broth near boiling.
inline constexpr double vapour_caution_share = 0.5;
//! O2 fraction above which the gas counts as oxygen-enriched (23.5 %: the usual threshold of
//! workplace rules for an oxygen-enriched atmosphere, common practice).
inline constexpr double enriched_o2_fraction = 0.235;

//! [control]: speed_min <= speed_max, gas_min <= gas_max (CaseError at the key otherwise).
void check_control_limits(const TomlSource& src, const Case& c);
//! Refuses a broth whose water vapour pressure reaches the head pressure (it boils: C* would be
//! negative); notes a broth close to it and oxygen-enriched gas (inlet or controller limit).
void check_gas_and_boiling(const TomlSource& src, const Case& c, std::vector<std::string>& notes);
//! Reads the case again with the overrides and each [[event]]'s `set` added in order, so that a
//! misspelt key or a bad value in an event is refused now (CaseError at the event's line), not
//! when the event fires. Not re-entered for the reads it makes.
void check_events(const TomlSource& src, const Case& c, const std::string& text, const std::string& file_name,
                  const std::vector<Override>& overrides);

}  // namespace oxystrat::detail
