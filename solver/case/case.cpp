#include "case/case.hpp"

#include <algorithm>

namespace oxystrat {

std::string to_string(BottomShape s) {
  switch (s) {
    case BottomShape::flat: return "flat";
    case BottomShape::ellipsoidal: return "ellipsoidal";
    case BottomShape::hemispherical: return "hemispherical";
  }
  return "?";
}

std::string to_string(ImpellerType t) {
  switch (t) {
    case ImpellerType::rushton: return "rushton";
    case ImpellerType::pitched_blade_down: return "pitched-blade-down";
    case ImpellerType::pitched_blade_up: return "pitched-blade-up";
    case ImpellerType::hydrofoil_down: return "hydrofoil-down";
    case ImpellerType::hydrofoil_up: return "hydrofoil-up";
    case ImpellerType::hollow_blade: return "hollow-blade";
  }
  return "?";
}

std::string to_string(SpargerType t) { return t == SpargerType::ring ? "ring" : "pipe"; }
std::string to_string(Coalescence c) { return c == Coalescence::coalescing ? "coalescing" : "non-coalescing"; }
std::string to_string(KlaModel m) { return m == KlaModel::mechanistic ? "mechanistic" : "local-correlation"; }

bool is_radial(ImpellerType t) { return t == ImpellerType::rushton || t == ImpellerType::hollow_blade; }

int pumping_direction(ImpellerType t) {
  switch (t) {
    case ImpellerType::pitched_blade_down:
    case ImpellerType::hydrofoil_down: return -1;
    case ImpellerType::pitched_blade_up:
    case ImpellerType::hydrofoil_up: return +1;
    default: return 0;
  }
}

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
