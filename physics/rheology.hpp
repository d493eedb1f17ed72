// Broth rheology: the stress a shear rate takes, the apparent viscosity, the shear rate that a
// local dissipation sustains, the effective shear rate of an impeller (Metzner & Otto), and the
// cavern an impeller clears in a yield-stress broth. Free functions, SI in and out; sources in
// docs/method.md, section "Viscous and non-Newtonian broths".
#pragma once

#include <string>

namespace oxystrat {

enum class RheologyKind { newtonian, power_law, herschel_bulkley, casson };
std::string to_string(RheologyKind k);

struct Rheology {
  RheologyKind kind = RheologyKind::newtonian;
  double viscosity_pa_s = 1e-3;  //!< Newtonian viscosity; Casson's plastic viscosity [Pa s]
  double consistency = 0.0;      //!< K of power law and Herschel-Bulkley [Pa s^n]
  double flow_index = 1.0;       //!< n [-]
  double yield_stress_pa = 0.0;  //!< tau_y of Herschel-Bulkley and Casson [Pa]
  bool newtonian() const { return kind == RheologyKind::newtonian; }
};

//! Shear stress at shear rate `gamma` [Pa]: Newtonian mu gamma; power law K gamma^n (Ostwald-de
//! Waele); Herschel-Bulkley tau_y + K gamma^n (1926); Casson (sqrt(tau_y) + sqrt(mu_c gamma))^2.
double shear_stress(const Rheology& r, double gamma_1_s);

//! Apparent viscosity tau / gamma [Pa s]; gamma is floored at 1e-3 1/s (a fluid at rest has no
//! finite apparent viscosity with a yield stress).
double apparent_viscosity(const Rheology& r, double gamma_1_s);

//! Shear rate whose viscous dissipation equals the local turbulent dissipation, tau(gamma) gamma =
//! rho eps (the Camp & Stein 1943 mean velocity gradient sqrt(eps / nu) for a Newtonian fluid;
//! for a power law it gives (rho eps / K)^(1/(n+1))) [1/s].
double dissipation_shear_rate(const Rheology& r, double density_kg_m3, double epsilon_w_kg);

//! Reynolds number of an impeller with the apparent viscosity at the Metzner & Otto (1957)
//! effective shear rate k_s N: rho N D^2 / mu_a(k_s N) [-].
double metzner_otto_reynolds(const Rheology& r, double density_kg_m3, double speed_rps, double diameter_m,
                             double metzner_otto_constant);

//! Diameter of the cylindrical cavern around an impeller in a yield-stress broth [m]: Elson,
//! Cheesman & Nienow (1986), (D_c/D)^3 = Np rho N^2 D^2 / (pi^2 tau_y (H_c/D_c + 1/3)) with
//! H_c/D_c = 0.4 [mem], while D_c < T; the vessel wall then stops it (returns T).
double cavern_diameter(double power_number, double density_kg_m3, double speed_rps, double diameter_m,
                       double yield_stress_pa, double vessel_diameter_m);

//! Height of that cavern [m]: 0.4 D_c while D_c < T; once it reaches the wall it grows along the
//! axis, H_c / T = Np rho N^2 D^2 (D/T)^3 / (pi^2 tau_y) - 1/3 (the same torque balance).
double cavern_height(double power_number, double density_kg_m3, double speed_rps, double diameter_m,
                     double yield_stress_pa, double vessel_diameter_m);

}  // namespace oxystrat
