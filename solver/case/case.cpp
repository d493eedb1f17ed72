#include "case/case.hpp"

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
