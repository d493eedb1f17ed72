// The tolerance of checks against closed-form values: the computation is a handful to a few
// hundred double-precision operations on O(1) numbers, so it differs from the exact value by
// round-off only; 1e-12 relative leaves ample margin.
#pragma once

namespace oxystrat::test {

inline constexpr double kRoundOff = 1e-12;

}  // namespace oxystrat::test
