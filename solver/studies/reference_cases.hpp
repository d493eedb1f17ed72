// Small vessels written inline that the validation table and the tests both run: one text each,
// so a check and its test cannot drift apart.
#pragma once

#include <string>

#include "input/case.hpp"

namespace oxystrat {

//! One impeller at H = T in a flat-bottomed 1 m vessel, no gas: the mixing-time reference.
Case reference_single_impeller(const std::string& type, double d_over_t, int radial, int axial, double speed_rpm = 120.0);

//! A gassed single Rushton (D = T/3) in a flat-bottomed 1 m vessel at H = T, air-water at 20 degC,
//! ring sparger: the holdup reference.
Case reference_gassed_single_rushton(double speed_rpm, double vvm);

//! A gassed 2.5 m3 vessel (T = 1.2 m, H = 2.4 m) with two Rushtons, a ring sparger and a culture.
Case reference_gassed_vessel(int radial, int axial, double biomass_g_l = 15.0);

}  // namespace oxystrat
