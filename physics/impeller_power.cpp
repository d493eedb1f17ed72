#include "physics/impeller_power.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {

double power_number(double re, double np_turbulent, double kp_laminar) {
  constexpr double re_laminar = 10.0;
  constexpr double re_turbulent = 1e4;
  if (re <= re_laminar) return kp_laminar / std::max(re, 1e-12);
  if (re >= re_turbulent) return np_turbulent;
  const double x = (std::log(re) - std::log(re_laminar)) / (std::log(re_turbulent) - std::log(re_laminar));
  const double lo = std::log(kp_laminar / re_laminar);
  const double hi = std::log(np_turbulent);
  return std::exp(lo + x * (hi - lo));
}

double cui_gassed_power_ratio(double fl) {
  const double ratio = fl < 0.035 ? 1.0 - 12.6 * fl : 0.62 - 1.85 * fl;
  return std::clamp(ratio, 0.2, 1.0);
}

double flooding_aeration_number(double froude, double d_over_t) { return 30.0 * froude * std::pow(d_over_t, 3.5); }

double complete_dispersion_aeration_number(double froude, double d_over_t) {
  return 0.2 * std::sqrt(froude) * std::sqrt(d_over_t);
}

double flooding_aeration_number(ImpellerType type, double froude, double d_over_t) {
  return impeller_data(type).flooding_capacity * flooding_aeration_number(froude, d_over_t);
}

double complete_dispersion_aeration_number(ImpellerType type, double froude, double d_over_t) {
  return impeller_data(type).flooding_capacity * complete_dispersion_aeration_number(froude, d_over_t);
}

double gassed_power_ratio(ImpellerType type, double fl, double froude, double d_over_t) {
  if (fl <= 0.0) return 1.0;
  if (type == ImpellerType::rushton) return cui_gassed_power_ratio(fl);
  const double at_flooding = impeller_data(type).gassed_ratio_at_flooding;
  const double load = std::min(1.0, fl / flooding_aeration_number(type, froude, d_over_t));
  return 1.0 - (1.0 - at_flooding) * load;
}

std::string to_string(GasRegime r) {
  switch (r) {
    case GasRegime::ungassed: return "ungassed";
    case GasRegime::dispersed: return "completely dispersed";
    case GasRegime::loaded: return "loaded";
    case GasRegime::flooded: return "flooded";
  }
  return "?";
}

GasRegime gas_regime(double fl, double flooding, double dispersion) {
  if (fl <= 0.0) return GasRegime::ungassed;
  if (fl > flooding) return GasRegime::flooded;
  if (fl < dispersion) return GasRegime::dispersed;
  return GasRegime::loaded;
}

}  // namespace oxystrat
