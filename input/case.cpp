#include "input/case.hpp"

#include <algorithm>

namespace oxystrat {

VantRietConstants vant_riet_constants(Coalescence c, const ModelConstants& m) {
  VantRietConstants k = vant_riet_constants(c);
  if (m.kla_prefactor > 0.0) k.prefactor = m.kla_prefactor;
  if (m.kla_power_exponent > 0.0) k.power_exponent = m.kla_power_exponent;
  if (m.kla_gas_exponent > 0.0) k.gas_exponent = m.kla_gas_exponent;
  return k;
}

std::string to_string(SpargerType t) {
  switch (t) {
    case SpargerType::ring: return "ring";
    case SpargerType::pipe: return "pipe";
    case SpargerType::porous: return "porous";
  }
  return "?";
}
std::string to_string(KlaModel m) { return m == KlaModel::mechanistic ? "mechanistic" : "local-correlation"; }

std::string to_string(CultureKind k) { return k == CultureKind::cell ? "cell" : "microbial"; }

}  // namespace oxystrat

namespace oxystrat {

double Feed::rate_at(double t) const {
  if (!enabled || time_s.empty() || t < time_s.front()) return 0.0;
  if (t >= time_s.back()) return rate_m3_s.back();
  const auto hi = static_cast<size_t>(std::upper_bound(time_s.begin(), time_s.end(), t) - time_s.begin());
  const double f = (t - time_s[hi - 1]) / (time_s[hi] - time_s[hi - 1]);
  return rate_m3_s[hi - 1] + f * (rate_m3_s[hi] - rate_m3_s[hi - 1]);
}

double Feed::volume_until(double t) const {
  if (!enabled || time_s.empty() || t <= time_s.front()) return 0.0;
  double v = 0.0;
  for (size_t i = 1; i < time_s.size() && time_s[i - 1] < t; ++i) {
    const double end = std::min(t, time_s[i]);
    v += 0.5 * (rate_m3_s[i - 1] + rate_at(end)) * (end - time_s[i - 1]);
  }
  if (t > time_s.back()) v += rate_m3_s.back() * (t - time_s.back());
  return v;
}

}  // namespace oxystrat
