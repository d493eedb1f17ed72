#include "postproc/report/number_format.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>

namespace oxystrat::report {

std::string format_number(double v, int significant, int max_decimals) {
  if (!std::isfinite(v)) return "\xE2\x80\x93";  // en dash
  const double a = std::abs(v);
  if (a >= 1e7) return fmt::format("{:.{}e}", v, std::max(0, significant - 1));
  const int magnitude = a > 0.0 ? static_cast<int>(std::floor(std::log10(a))) : 0;
  const int decimals = std::clamp(significant - 1 - magnitude, 0, max_decimals);
  // Zero at the printed precision reads as 0, whatever its sign or round-off.
  if (a < 0.5 * std::pow(10.0, -decimals)) return "0";
  std::string s = fmt::format("{:.{}f}", v, decimals);
  // Rounding up can add a digit (9.9996 -> 10.000): print at the new magnitude instead.
  if (decimals > 0 && std::abs(std::stod(s)) >= std::pow(10.0, magnitude + 1)) {
    s = fmt::format("{:.{}f}", v, std::max(0, decimals - 1));
  }
  // No trailing zeros: "2", "0.5", not "2.000", "0.5000".
  if (s.find('.') != std::string::npos) {
    s.erase(s.find_last_not_of('0') + 1);
    if (s.back() == '.') s.pop_back();
  }
  return s;
}

namespace {

// One family of units that differ by a factor 1000 each, smallest first.
struct Family {
  std::array<const char*, 3> units;
};

constexpr Family kFamilies[] = {
    {{"W/m3", "kW/m3", "MW/m3"}},
    {{"W", "kW", "MW"}},
    {{"W/kg", "kW/kg", "MW/kg"}},
};

}  // namespace

DisplayUnit adapt_unit(const std::string& unit, double magnitude) {
  for (const auto& f : kFamilies) {
    for (int i = 0; i < 3; ++i) {
      if (unit != f.units[i]) continue;
      const double a = std::abs(magnitude);
      if (!std::isfinite(a) || a == 0.0) return {unit, 1.0};
      int j = i;
      double factor = 1.0;
      while (j > 0 && a * factor < 1.0) --j, factor *= 1e3;
      while (j < 2 && a * factor >= 1e4) ++j, factor *= 1e-3;
      return {f.units[j], factor};
    }
  }
  return {unit, 1.0};
}

std::string format_quantity(double v, const std::string& unit) {
  const auto d = adapt_unit(unit, v);
  return format_number(v * d.factor) + " " + d.unit;
}

std::string format_duration(double seconds) {
  const double a = std::abs(seconds);
  if (a < 120.0) return format_number(seconds, 3, 1) + " s";
  if (a < 7200.0) return format_number(seconds / 60.0, 3, 1) + " min";
  if (a < 172800.0) return format_number(seconds / 3600.0, 3, 1) + " h";
  return format_number(seconds / 86400.0, 3, 1) + " d";
}

}  // namespace oxystrat::report
