// Physical constants and conversion factors, one definition each (SI).
#pragma once

namespace oxystrat {

inline constexpr double kG = 9.80665;             //!< standard gravity [m/s2] (exact, 3rd CGPM 1901)
inline constexpr double kR = 8.314462618;         //!< molar gas constant [J/(mol K)] (CODATA 2018, exact)
inline constexpr double kMmHgPa = 133.322387415;  //!< conventional millimetre of mercury [Pa]

}  // namespace oxystrat
