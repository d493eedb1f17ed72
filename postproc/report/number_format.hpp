// Numbers and units as the reports print them: fixed decimals an engineer reads at a glance, and
// a unit prefix chosen for the size of the value (W/m3 for a cell culture, kW/m3 for a fermenter).
#pragma once

#include <string>

namespace oxystrat::report {

//! `significant` digits in fixed notation, at most `max_decimals` after the point; a value that
//! rounds to zero there prints as "0" (never "7.984e-06"); non-finite values print as an en dash.
std::string format_number(double v, int significant = 4, int max_decimals = 4);

//! A display unit and the factor from the given unit to it.
struct DisplayUnit {
  std::string unit;
  double factor = 1.0;
};

//! For power and power per volume: the prefix that keeps `magnitude` (in `unit`) between 1 and
//! 1000 (kW/m3 -> W/m3 below 1 kW/m3, W -> kW above 1000 W). Other units come back unchanged.
DisplayUnit adapt_unit(const std::string& unit, double magnitude);

//! format_number of the value in its adapted unit, followed by the unit: "350 W/m3".
std::string format_quantity(double v, const std::string& unit);

//! A time span in the unit that reads naturally: "45 s", "10 min", "2.5 h", "3.2 d".
std::string format_duration(double seconds);

}  // namespace oxystrat::report
