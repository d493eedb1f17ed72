// Shared check for unit conversions: the parsed SI value against an expected one.
#pragma once

// units.hpp first: it names a parameter `si_value`, which <signal.h> (pulled in by GoogleTest)
// defines as a macro (glibc: si_value -> _sifields._rt.si_sigval), so the header fails to
// compile after <signal.h>. A bug in units.hpp, worked around here by the include order.
#include "input/units.hpp"
#include "tests/round_off.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

namespace oxystrat::test {

// Round-off tolerance (kRoundOff): a conversion is one multiplication and at most one addition.

inline void expect_si(units::Dimension dim, const std::string& text, double expected, double molar_mass = 0.0) {
  SCOPED_TRACE("parsing '" + text + "'");
  const double si = units::parse(dim, text, molar_mass);
  EXPECT_NEAR(si, expected, kRoundOff * std::abs(expected)) << text;
}

}  // namespace oxystrat::test
