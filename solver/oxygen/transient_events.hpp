// What a transient's step events may change. A run keeps one zone network, one probe and feed
// point, the culture's growth state and, under DO control, the controller's actuators: an event
// that would change one of them is refused before the run starts, since applying it mid-run
// would either mix two networks' states or be overridden without a word.
#pragma once

#include <vector>

#include "input/case_reader.hpp"

namespace oxystrat {

//! Throws CaseError naming the event, its time and its key when an event of `base` (with
//! `base_overrides` under it, each event on top of those before it) changes the zone network, the
//! probe or feed point, whether the culture grows, is fed or is controlled, the biomass or
//! substrate of a growing culture, or the speed, gas flow or O2 fraction of a controlled run.
void check_transient_events(const LoadedCase& base, const std::vector<Override>& base_overrides);

}  // namespace oxystrat
