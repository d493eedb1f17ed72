// Impeller correlations: power and pumping numbers, gassed power, flooding. Free functions of
// plain arguments, SI in and out, each with its source. Values tagged [mem] were recalled from the
// literature and not re-checked against the original paper (see docs/method.md, section 3).
#pragma once

#include <string>

#include "physics/impeller_types.hpp"

namespace oxystrat {

//! Power number at Reynolds number `re`: laminar Kp/Re below Re = 10, turbulent `np_turbulent`
//! above 1e4, log-log interpolation between (a smooth stand-in for the transitional curve).
double power_number(double re, double np_turbulent, double kp_laminar);

//! Gassed-to-ungassed power ratio of a Rushton turbine at aeration number Fl_G = Qg/(N D^3):
//! Cui, van der Lans & Luyben (1996): 1 - 12.6 Fl_G for Fl_G < 0.035, else 0.62 - 1.85 Fl_G;
//! floored at 0.2 (beyond the data; the impeller is flooded long before).
double cui_gassed_power_ratio(double aeration_number);

//! Aeration number at which a Rushton turbine floods: Fl_G,F = 30 Fr (D/T)^3.5
//! (Nienow, Warmoeskerken, Smith & Konno 1985), Fr = N^2 D / g.
double flooding_aeration_number(double froude, double d_over_t);

//! Aeration number below which gas is completely dispersed (recirculated below the impeller):
//! Fl_G,CD = 0.2 Fr^0.5 (D/T)^0.5 (Nienow et al. 1985).
double complete_dispersion_aeration_number(double froude, double d_over_t);

//! Aeration number at flooding for any type: the Rushton value times the type's flooding capacity
//! (impeller_types.hpp) [-].
double flooding_aeration_number(ImpellerType type, double froude, double d_over_t);
//! Aeration number below which gas is completely dispersed, for any type: the Rushton value
//! times the type's flooding capacity [our scaling, mem] [-].
double complete_dispersion_aeration_number(ImpellerType type, double froude, double d_over_t);

//! Pg/P0 of any type at aeration number Fl_G: Cui et al. (1996) for a Rushton turbine; for the
//! other types a straight fall from 1 at no gas to the type's ratio at flooding, reached at its
//! flooding aeration number and held beyond (our form between the [mem] end points, so that the
//! ratio depends on the gas load and not only on the type) [-].
double gassed_power_ratio(ImpellerType type, double aeration_number, double froude, double d_over_t);

enum class GasRegime { ungassed, dispersed, loaded, flooded };
std::string to_string(GasRegime r);

//! Regime from the aeration number and the two criteria above.
GasRegime gas_regime(double aeration_number, double flooding, double dispersion);

}  // namespace oxystrat
