// Verification: the code does what its equations say. Identities against values computed from
// the same formula, published check values of a formula, analytic limits, exact conservation, and
// the points the mixing constant was fitted to (calibration). None of these is evidence that the
// model describes a real vessel; that is measured_checks.cpp.
#include <fmt/format.h>

#include <cmath>

#include "input/case_reader.hpp"
#include "physics/impeller_power.hpp"
#include "physics/mass_transfer.hpp"
#include "physics/solubility.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/mixing_time.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/reference_cases.hpp"
#include "solver/studies/validation.hpp"

namespace oxystrat::detail {
namespace {

// One impeller at H = T, C = T/3, flat bottom, 1 m vessel, no gas, on the calibration grid.
Case single_impeller(const std::string& type, double d_over_t, double speed_rpm = 120.0) {
  return reference_single_impeller(type, d_over_t, 27, 54, speed_rpm);
}

double theta95(const Case& c) {
  const auto net = build_zone_geometry(c);
  const auto h = compute_hydrodynamics(c, net);
  return tracer_mixing_time(net, h, {}).theta_s;
}

// The gassed two-Rushton vessel at 10 g/L (for the conservation and single-zone checks).
Case gassed(int radial, int axial) { return reference_gassed_vessel(radial, axial, 10.0); }


}  // namespace

std::vector<ValidationCheck> verification_checks() {
  using K = CheckKind;
  std::vector<ValidationCheck> v;
  // The code evaluates Benson & Krause's equation as written: values computed from that equation
  // (docs/method.md [calc]), not measurements (those are in measured_checks.cpp).
  const std::pair<double, double> bk[] = {{0, 14.621}, {10, 11.288}, {20, 9.092}, {25, 8.263},
                                          {30, 7.559}, {35, 6.949},  {37, 6.727}, {40, 6.413}};
  for (const auto& [t, mg] : bk) {
    v.push_back(make_check(K::verification, "solubility", fmt::format("O2 saturation, moist air 1 atm, {:g} degC", t),
                      "Benson & Krause 1984, Limnol. Oceanogr. 29:620, their equation evaluated [calc]", "mg/L", mg,
                      0.003, false, "values rounded to 0.001 mg/L",
                      [t = t] { return physics::o2_saturation_air_1atm(t + 273.15) * physics::molar_mass_o2 * 1e3; }));
  }
  v.push_back(make_check(K::verification, "solubility", "water vapour pressure at 300 K",
                    "IAPWS-IF97 (Wagner et al. 2000), check value of table 35 [pub]", "Pa", 3536.58941, 1e-8, true,
                    "round-off of the closed form", [] { return physics::water_vapour_pressure(300.0); }));
  v.push_back(make_check(K::verification, "solubility", "O2 solubility ratio in 0.15 M NaCl, 25 degC",
                    "Weisenberger & Schumpe 1996, AIChE J. 42:298, their model with their ion parameters [calc]", "1",
                    0.951, 0.001, false, "value rounded to 3 digits", [] {
                      return physics::salting_out_factor(physics::Gas::o2, 298.15, {{"Na+", 150.0}, {"Cl-", 150.0}});
                    }));
  v.push_back(make_check(K::verification, "power", "Rushton turbine, D = 0.5 m, 60 rpm, water: ungassed power",
                    "P = Np rho N^3 D^5 with the type table's Np = 5.0 [identity]", "W", 156.25, 1e-9, true, "round-off",
                    [] {
                      const Case c = single_impeller("rushton", 0.5, 60.0);
                      return compute_hydrodynamics(c, build_zone_geometry(c)).impellers[0].power_ungassed_w;
                    }));
  for (const auto& [fl, ratio] : {std::pair{0.02, 0.748}, std::pair{0.10, 0.435}}) {
    v.push_back(make_check(K::verification, "gassed power", fmt::format("Rushton Pg/P0 at Fl_G = {:g}", fl),
                      "Cui, van der Lans & Luyben 1996, their correlation evaluated [mem form]", "1", ratio, 1e-12, false,
                      "round-off", [fl = fl] { return cui_gassed_power_ratio(fl); }));
  }
  v.push_back(make_check(K::verification, "flooding", "Rushton flooding aeration number at Fr = 1, D/T = 0.5",
                    "Nienow, Warmoeskerken, Smith & Konno 1985: 30 Fr (D/T)^3.5, evaluated [mem form]", "1",
                    30.0 * std::pow(0.5, 3.5), 1e-12, false, "round-off", [] { return flooding_aeration_number(1.0, 0.5); }));
  v.push_back(make_check(K::verification, "flooding", "Rushton complete-dispersion aeration number at Fr = 1, D/T = 0.5",
                    "Nienow et al. 1985: 0.2 Fr^0.5 (D/T)^0.5, evaluated [mem form]", "1", 0.2 * std::sqrt(0.5), 1e-12,
                    false, "round-off", [] { return complete_dispersion_aeration_number(1.0, 0.5); }));
  // The exchange constant was fitted to these three points of the Grenville/Nienow correlation.
  for (double dt : {0.25, 1.0 / 3.0, 0.5}) {
    const double ref = 5.20 * std::pow(5.0, -1.0 / 3.0) / (dt * dt) / 2.0;  // at N = 2 rps
    v.push_back(make_check(K::calibration, "mixing time",
                      fmt::format("theta95, single Rushton at H = T, D/T = {:.3g}, 120 rpm (fitted point)", dt),
                      "N theta95 = 5.20 Np^-1/3 (T/D)^2, Grenville/Nienow, Handbook of Industrial Mixing 2004, ch. 9 [sec]",
                      "s", ref, 0.25, true, "the correlation's own scatter is about +-20 %",
                      [dt] { return theta95(single_impeller("rushton", dt)); }));
  }
  v.push_back(make_check(K::verification, "mixing time", "theta95 N is independent of N (120 vs 240 rpm): ratio of theta95",
                    "turbulent scaling [common practice]", "1", 2.0, 0.01, true,
                    "integrator tolerance on the band crossing", [] {
                      return theta95(single_impeller("rushton", 1.0 / 3.0, 120.0)) /
                             theta95(single_impeller("rushton", 1.0 / 3.0, 240.0));
                    }));
  v.push_back(make_check(K::verification, "kLa", "coalescing kLa at P/V = 1000 W/m3, vs = 0.01 m/s",
                    "van 't Riet 1979: 0.026 (P/V)^0.4 vs^0.5, evaluated [sec]", "1/s",
                    0.026 * std::pow(1000.0, 0.4) * 0.1, 1e-12, true, "round-off", [] {
                      return vant_riet_kla(vant_riet_constants(Coalescence::coalescing, {}), 1000.0, 0.01);
                    }));
  v.push_back(make_check(K::verification, "kLa", "non-coalescing kLa at P/V = 1000 W/m3, vs = 0.01 m/s",
                    "van 't Riet 1979 via Humbird et al. 2017: 0.002 (P/V)^0.7 vs^0.2, evaluated [pub]", "1/s",
                    0.002 * std::pow(1000.0, 0.7) * std::pow(0.01, 0.2), 1e-12, true, "round-off", [] {
                      return vant_riet_kla(vant_riet_constants(Coalescence::non_coalescing, {}), 1000.0, 0.01);
                    }));
  v.push_back(make_check(K::verification, "conservation", "O2 balance (in - out - sum OTR V) / in, 12 x 40 zones",
                    "exact conservation [analytic]", "1", 0.0, 1e-9, false, "Newton converged to 1e-12 of the O2 fed",
                    [] { return run_case(gassed(12, 40), {false}).field->o2_balance_error; }));
  v.push_back(make_check(K::verification, "conservation", "largest zone imbalance of the liquid flow, 12 x 40 zones",
                    "exact (stream function) [analytic]", "1", 0.0, 1e-12, false, "round-off", [] {
                      const Case c = gassed(12, 40);
                      const auto net = build_zone_geometry(c);
                      return max_zone_imbalance(net, compute_hydrodynamics(c, net).face_flow);
                    }));
  v.push_back(make_check(K::verification, "limits", "single zone: C - (C* - OUR/kLa)", "single-tank balance [analytic]",
                    "mol/m3", 0.0, 1e-12, false, "Newton tolerance", [] {
                      const Case c = gassed(1, 1);
                      const auto f = *run_case(c, {false}).field;
                      const double our = c.culture.q_o2_max_mol_kg_s * c.culture.biomass_kg_m3 * f.do_mol_m3[0] /
                                         (c.culture.k_o2_mol_m3 + f.do_mol_m3[0]);
                      return f.do_mol_m3[0] - (f.cstar_mol_m3[0] - our / f.kla_1_s[0]);
                    }));
  return v;
}

}  // namespace oxystrat::detail
