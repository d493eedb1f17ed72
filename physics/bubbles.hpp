// Bubbles: the size they form with at a sparger, the size turbulence breaks them to, how fast
// they rise through the liquid, and the liquid-side film around them. Free functions, SI in and
// out; sources in docs/method.md, section "Bubbles and gas transport".
#pragma once

namespace oxystrat::physics {

//! Surface tension of pure water [N/m] at temperature [K]: IAPWS R1-76 (2014),
//! 0.2358 tau^1.256 (1 - 0.625 tau), tau = 1 - T / 647.096 K [mem; it reproduces the steam-table
//! values 74.22 / 72.74 / 71.20 / 69.60 mN/m at 10-40 degC].
double water_surface_tension(double temperature_k);

//! O2 diffusivity in water [m2/s]: Han & Bartels (1996), J. Phys. Chem. 100:5597,
//! log10(D / cm2 s-1) = -4.410 + 773.8 / T - (506.4 / T)^2, measured -0.5 to 95 degC.
double o2_diffusivity_water(double temperature_k);

//! Largest bubble that survives turbulence of specific dissipation `epsilon` [W/kg] [m]:
//! Hinze (1955), AIChE J. 1:289, d_max = 0.725 (sigma / rho)^0.6 eps^-0.4 [mem].
double hinze_max_diameter(double surface_tension_n_m, double density_kg_m3, double epsilon_w_kg);

//! Largest bubble that viscous shear of stress `shear_stress_pa` leaves whole [m]: 2 Ca sigma / tau
//! with the critical capillary number Ca = 0.5 (order of the simple-shear values of Grace 1982
//! for low viscosity ratios, [mem]). It replaces Hinze's limit where that falls below the
//! Kolmogorov length, where turbulence breaks bubbles by viscous shear, not by inertia.
double viscous_max_diameter(double surface_tension_n_m, double shear_stress_pa);

//! Kolmogorov length (nu^3 / eps)^(1/4) [m].
double kolmogorov_length(double kinematic_viscosity_m2_s, double epsilon_w_kg);

//! Sauter diameter of a breakage-limited population [m]: d32 = 0.62 d_max (ratio reported for
//! stirred dispersions, e.g. Parthasarathy & Ahmed 1994 [mem]).
inline constexpr double sauter_to_max_ratio = 0.62;

//! Diameter of the bubbles an orifice (or a pore) of diameter `orifice_m` forms at the gas flow
//! `flow_per_orifice_m3_s` [m]: Gaddis & Vogelpohl (1986), Chem. Eng. Sci. 41:97, which joins the
//! static (Tate), viscous and inertial (Davidson & Schueler 1960) limits [mem]:
//! d = [(6 d_o sigma / (rho g))^(4/3) + 81 mu Q / (pi rho g) + (135 Q^2 / (4 pi^2 g))^(4/5)]^(1/4).
double orifice_bubble_diameter(double orifice_m, double flow_per_orifice_m3_s, double surface_tension_n_m,
                               double density_kg_m3, double viscosity_pa_s);

//! Largest bubble that holds together rising through still liquid [m]: 4 sqrt(sigma / (rho g)),
//! the Rayleigh-Taylor limit of the bubble's cap (~11 mm in water) [mem]. Larger gas pockets (a
//! jetting orifice) break up at once.
double largest_stable_bubble(double surface_tension_n_m, double density_kg_m3);

//! Terminal rise velocity of a bubble of diameter `d` in a process liquid [m/s]: the smaller of
//! the wave-analogy form for larger bubbles, sqrt(2.14 sigma / (rho d) + 0.505 g d) (Mendelson
//! 1967 as modified by Clift, Grace & Weber 1978 [mem]), and the rise of a rigid sphere (surfactant-
//! covered small bubbles) with the Schiller & Naumann (1933) drag, C_D = 24/Re (1 + 0.15 Re^0.687),
//! valid to Re ~ 800 [mem]. A bubble deformed by its own rise (Eotvos number rho g d^2 / sigma
//! above ~4, Clift et al. 1978 regime map [mem]) rises at the wave-analogy velocity whatever the
//! viscosity. In water: ~0.1 m/s at 1 mm, ~0.24 m/s at 4 mm.
double bubble_rise_velocity(double d_m, double surface_tension_n_m, double density_kg_m3, double viscosity_pa_s);

}  // namespace oxystrat::physics
