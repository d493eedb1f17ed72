#include "physics/turbulence.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat::physics {

double kolmogorov_stress(double density_kg_m3, double kinematic_viscosity_m2_s, double epsilon_w_kg) {
  return density_kg_m3 * std::sqrt(std::max(epsilon_w_kg, 0.0) * kinematic_viscosity_m2_s);
}

double dissipation_max_to_mean(ImpellerType type) {
  switch (type) {
    case ImpellerType::rushton: return 40.0;
    case ImpellerType::hollow_blade: return 30.0;
    case ImpellerType::pitched_blade_down:
    case ImpellerType::pitched_blade_up: return 20.0;
    case ImpellerType::hydrofoil_down:
    case ImpellerType::hydrofoil_up: return 12.0;
  }
  return 40.0;
}

}  // namespace oxystrat::physics
