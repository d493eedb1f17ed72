// The engineering units of tables people read (kW, 1/h, mmol/L, %, mmHg, ...) against the SI unit
// every file for programs holds. A table value is an SI value times `per_si`; only linear units
// (no offsets) appear in tables, so one factor suffices.
#pragma once

#include <string>
#include <string_view>

namespace oxystrat::units {

struct DisplayScale {
  std::string si_unit;  //!< the SI unit the display unit stands for ("W" for "kW")
  double per_si = 1.0;  //!< display value = SI value x per_si (1e-3 for kW)
};

//! The SI unit and factor of a table unit. A unit that is already SI maps to itself with factor 1. Throws std::invalid_argument for a table unit
//! this list does not know, so that a new one cannot slip into a file unconverted.
DisplayScale display_scale(std::string_view display_unit);

//! The factor from SI `si_unit` to `display_unit`; throws std::invalid_argument when the two do
//! not belong together (say "W" and "1/h").
double display_per_si(std::string_view si_unit, std::string_view display_unit);

}  // namespace oxystrat::units
