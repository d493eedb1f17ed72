#include "solver/studies/validation.hpp"

#include <fmt/format.h>

#include <cmath>
#include <limits>

#include "input/case_reader.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "physics/impeller_power.hpp"
#include "physics/mass_transfer.hpp"
#include "solver/flow/mixing_time.hpp"
#include "physics/solubility.hpp"
#include "solver/studies/reference_cases.hpp"

namespace oxystrat {
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

std::vector<ValidationCheck> build() {
  std::vector<ValidationCheck> v;
  // Solubility: Benson & Krause (1984) values computed from their equation (docs/method.md, section 8 [calc]).
  const std::pair<double, double> bk[] = {{0, 14.621}, {10, 11.288}, {20, 9.092}, {25, 8.263},
                                          {30, 7.559}, {35, 6.949},  {37, 6.727}, {40, 6.413}};
  for (const auto& [t, mg] : bk) {
    v.push_back({"solubility", fmt::format("O2 saturation, moist air 1 atm, {:g} degC", t),
                 "Benson & Krause 1984, Limnol. Oceanogr. 29:620 (equation; MODEL.md table) [calc]", "mg/L", mg, 0.003,
                 false, "table rounded to 0.001 mg/L",
                 [t = t] { return physics::o2_saturation_air_1atm(t + 273.15) * physics::molar_mass_o2 * 1e3; }});
  }
  v.push_back({"solubility", "water vapour pressure at 300 K", "IAPWS-IF97 (Wagner et al. 2000), table 35 check value [pub]",
               "Pa", 3536.58941, 1e-8, true, "round-off of the closed form",
               [] { return physics::water_vapour_pressure(300.0); }});
  v.push_back({"solubility", "O2 solubility ratio in 0.15 M NaCl, 25 degC",
               "Weisenberger & Schumpe 1996, AIChE J. 42:298 (ion parameters via MODEL.md [sec]) [calc]", "1", 0.951, 0.001,
               false, "value rounded to 3 digits",
               [] { return physics::salting_out_factor(physics::Gas::o2, 298.15, {{"Na+", 150.0}, {"Cl-", 150.0}}); }});
  // Power.
  v.push_back({"power", "Rushton turbine, D = 0.5 m, 60 rpm, water: ungassed power",
               "Np = 5.0 (MODEL.md table [sec]); P = Np rho N^3 D^5", "W", 156.25, 1e-9, true, "round-off",
               [] {
                 const Case c = single_impeller("rushton", 0.5, 60.0);
                 return compute_hydrodynamics(c, build_zone_geometry(c)).impellers[0].power_ungassed_w;
               }});
  v.push_back({"gassed power", "Rushton Pg/P0 at Fl_G = 0.02", "Cui, van der Lans & Luyben 1996 [mem form]", "1", 0.748,
               1e-12, false, "round-off", [] { return cui_gassed_power_ratio(0.02); }});
  v.push_back({"gassed power", "Rushton Pg/P0 at Fl_G = 0.10", "Cui, van der Lans & Luyben 1996 [mem form]", "1", 0.435,
               1e-12, false, "round-off", [] { return cui_gassed_power_ratio(0.10); }});
  v.push_back({"flooding", "Rushton flooding aeration number at Fr = 1, D/T = 0.5",
               "Nienow, Warmoeskerken, Smith & Konno 1985: 30 Fr (D/T)^3.5 [mem form]", "1", 30.0 * std::pow(0.5, 3.5),
               1e-12, false, "round-off", [] { return flooding_aeration_number(1.0, 0.5); }});
  v.push_back({"flooding", "Rushton complete-dispersion aeration number at Fr = 1, D/T = 0.5",
               "Nienow et al. 1985: 0.2 Fr^0.5 (D/T)^0.5 [mem form]", "1", 0.2 * std::sqrt(0.5), 1e-12, false, "round-off",
               [] { return complete_dispersion_aeration_number(1.0, 0.5); }});
  // Mixing time: N theta95 = 5.20 Np^-1/3 (T/D)^2 (Grenville/Nienow form, Handbook of Industrial
  // Mixing 2004 ch. 9 [sec]); the Rushton points calibrated c_t, the pitched blade validates it.
  const struct {
    const char* type;
    double dt, np;
    const char* role;
  } mix[] = {{"rushton", 0.25, 5.0, "calibration"},
             {"rushton", 1.0 / 3.0, 5.0, "calibration"},
             {"rushton", 0.5, 5.0, "calibration"},
             {"pitched-blade-down", 0.4, 1.27, "validation"}};
  for (const auto& m : mix) {
    const double ref = 5.20 * std::pow(m.np, -1.0 / 3.0) / (m.dt * m.dt) / 2.0;  // at N = 2 rps
    v.push_back({"mixing time", fmt::format("theta95, single {} at H = T, D/T = {:.3g}, 120 rpm ({})", m.type, m.dt, m.role),
                 "Grenville/Nienow, Handbook of Industrial Mixing 2004, ch. 9 [sec]", "s", ref, 0.25, true,
                 "the correlation's own scatter is about +-20 %",
                 [m] { return theta95(single_impeller(m.type, m.dt)); }});
  }
  v.push_back({"mixing time", "theta95 N is independent of N (120 vs 240 rpm): ratio of theta95", "turbulent scaling [common practice]",
               "1", 2.0, 0.01, true, "integrator tolerance on the band crossing",
               [] { return theta95(single_impeller("rushton", 1.0 / 3.0, 120.0)) / theta95(single_impeller("rushton", 1.0 / 3.0, 240.0)); }});
  // kLa.
  v.push_back({"kLa", "coalescing kLa at P/V = 1000 W/m3, vs = 0.01 m/s", "van 't Riet 1979 [sec]: 0.026 (P/V)^0.4 vs^0.5",
               "1/s", 0.026 * std::pow(1000.0, 0.4) * 0.1, 1e-12, true, "round-off",
               [] { return vant_riet_kla(vant_riet_constants(Coalescence::coalescing, {}), 1000.0, 0.01); }});
  v.push_back({"kLa", "non-coalescing kLa at P/V = 1000 W/m3, vs = 0.01 m/s",
               "van 't Riet 1979 via Humbird et al. 2017 [pub]: 0.002 (P/V)^0.7 vs^0.2", "1/s",
               0.002 * std::pow(1000.0, 0.7) * std::pow(0.01, 0.2), 1e-12, true, "round-off",
               [] { return vant_riet_kla(vant_riet_constants(Coalescence::non_coalescing, {}), 1000.0, 0.01); }});
  // Conservation and analytic limits.
  v.push_back({"conservation", "O2 balance (in - out - sum OTR V) / in, 12 x 40 zones", "exact conservation [analytic]", "1", 0.0,
               1e-9, false, "Newton converged to 1e-12 of the O2 fed",
               [] { return run_case(gassed(12, 40), {false}).field->o2_balance_error; }});
  v.push_back({"conservation", "largest zone imbalance of the liquid flow, 12 x 40 zones", "exact (stream function) [analytic]",
               "1", 0.0, 1e-12, false, "round-off",
               [] {
                 const Case c = gassed(12, 40);
                 const auto net = build_zone_geometry(c);
                 return max_zone_imbalance(net, compute_hydrodynamics(c, net).face_flow);
               }});
  v.push_back({"limits", "single zone: C - (C* - OUR/kLa)", "textbook single-tank balance [analytic]", "mol/m3", 0.0, 1e-12,
               false, "Newton tolerance",
               [] {
                 const Case c = gassed(1, 1);
                 const auto f = *run_case(c, {false}).field;
                 const double our = c.culture.q_o2_max_mol_kg_s * c.culture.biomass_kg_m3 * f.do_mol_m3[0] /
                                    (c.culture.k_o2_mol_m3 + f.do_mol_m3[0]);
                 return f.do_mol_m3[0] - (f.cstar_mol_m3[0] - our / f.kla_1_s[0]);
               }});
  return v;
}

}  // namespace

const std::vector<ValidationCheck>& validation_checks() {
  static const std::vector<ValidationCheck> checks = build();
  return checks;
}

ValidationResult run_check(const ValidationCheck& c) {
  ValidationResult r;
  r.check = &c;
  try {
    r.model = c.model();
  } catch (const std::exception&) {
    r.model = std::numeric_limits<double>::quiet_NaN();
  }
  r.error = c.relative ? (r.model - c.reference) / c.reference : r.model - c.reference;
  r.passed = std::isfinite(r.model) && std::abs(r.error) <= c.tolerance;
  return r;
}

}  // namespace oxystrat
