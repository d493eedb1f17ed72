// Validation: the model against values measured in published experiments, or against a
// correlation fitted to measured data (said so in the source). Each row gives its conditions and
// an acceptance band chosen from the measurement's own scatter, not from the model's result; a
// miss stays in the table with its reason (known_miss), because it is information.
#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "input/case_reader.hpp"
#include "physics/impeller_types.hpp"
#include "physics/solubility.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/mixing_time.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/reference_cases.hpp"
#include "solver/studies/validation.hpp"

namespace oxystrat::detail {
namespace {

ValidationCheck row(std::string group, std::string quantity, std::string conditions, std::string source,
                    std::string unit, double measured, double band, std::string why, std::function<double()> model) {
  auto c = make_check(CheckKind::validation, std::move(group), std::move(quantity), std::move(source), std::move(unit),
                      measured, band, true, std::move(why), std::move(model));
  c.conditions = std::move(conditions);
  return c;
}

double saturation_mg_l(double t_c) {
  return physics::o2_saturation_air_1atm(t_c + 273.15) * physics::molar_mass_o2 * 1e3;
}

// Heat released per mol O2 taken up, from the model's heat balance on a gassed culture [kJ/mol].
double model_heat_per_mol_o2() {
  const auto run = run_case(reference_gassed_vessel(8, 24, 10.0), {false});
  return run.limits.heat.metabolic_w / run.field->our_total_mol_s / 1e3;
}

double theta95_single(const std::string& type, double d_over_t) {
  const Case c = reference_single_impeller(type, d_over_t, 27, 54);
  const auto net = build_zone_geometry(c);
  return tracer_mixing_time(net, compute_hydrodynamics(c, net), {}).theta_s;
}

// The model's volume-mean holdup over the correlation evaluated at the model's gassed P/V and the
// superficial gas velocity at the sparger's temperature (normal flow taken at 0 degC, 1 atm).
double holdup_over_correlation(double rpm, double vvm) {
  const Case c = reference_gassed_single_rushton(rpm, vvm);
  const auto run = run_case(c, {false});
  const double v = c.vessel.working_volume_m3;
  const double pv = run.hydro.power_gassed_w / v;
  const double area = std::numbers::pi * 0.25 * c.vessel.diameter_m * c.vessel.diameter_m;
  const double vs = vvm * v / 60.0 * (c.vessel.temperature_k / 273.15) / area;
  return run.field->holdup_mean / (0.13 * std::pow(pv, 0.33) * std::pow(vs, 0.67));
}

}  // namespace

std::vector<ValidationCheck> measured_checks() {
  std::vector<ValidationCheck> v;
  // O2 solubility: printed tables, read as printed (not recomputed from any equation).
  const std::string sat = "water in equilibrium with water-saturated air at 101.325 kPa";
  const std::string sat_band = "band 1 %: the tables are printed to 3-4 digits (up to 0.4 %) and measured data sets "
                               "differ by about 0.5 % [common practice]";
  for (const auto& [t, mg] : {std::pair{0.0, 14.6}, {10.0, 11.3}, {20.0, 9.09}, {25.0, 8.26}, {30.0, 7.56}}) {
    v.push_back(row("O2 solubility", fmt::format("O2 saturation at {:g} degC", t), sat,
                    "ISO 5814 (EN 25814) saturation table, as printed in a DO-sensor manual's appendix [sec]", "mg/L",
                    mg, 0.01, sat_band, [t = t] { return saturation_mg_l(t); }));
  }
  for (const auto& [t, mg] :
       {std::pair{0.0, 14.63}, {10.0, 11.28}, {20.0, 9.08}, {25.0, 8.26}, {30.0, 7.57}, {35.0, 6.98}}) {
    v.push_back(row("O2 solubility", fmt::format("O2 saturation at {:g} degC", t), sat + ", 100 % relative humidity",
                    "Montgomery, Thom & Cockburn 1964, measured table as reproduced in a published table [sec]", "mg/L",
                    mg, 0.01, sat_band, [t = t] { return saturation_mg_l(t); }));
  }
  for (const auto& [t, mg] : {std::pair{40.0, 6.5}, {50.0, 5.6}}) {
    v.push_back(row("O2 solubility", fmt::format("O2 saturation at {:g} degC", t), sat,
                    "a printed engineering table of O2 solubility in fresh water (it names no primary source) [sec]",
                    "mg/L", mg, 0.015, "band 1.5 %: printed to 2 digits (up to 0.9 %) plus the spread between data sets",
                    [t = t] { return saturation_mg_l(t); }));
    if (t > 45.0) {
      v.back().known_miss = "1.9 % below this table at 50 degC: Benson & Krause's fit was made on data up to about "
                            "40 degC (from memory), and the table's own source is unknown";
    }
  }
  // Heat of aerobic growth per mol O2: calorimetry of growing cultures. The model's default is
  // Cordier et al.'s mean, so that row shows the calibration; the others test it.
  const std::string heat_band = "band 10 %: the sources report their constant as independent of organism and "
                                "substrate to within about that";
  auto heat = row("heat of growth", "heat released per mol O2 consumed (culture.heat_yield default)",
                  "aerobic cultures, several organisms and substrates, calorimetry",
                  "Cordier, Butsch, Birou & von Stockar 1987, Biotechnol. Bioeng. 30:650 (abstract) [pub]", "kJ/mol",
                  440.0, 0.10, heat_band, model_heat_per_mol_o2);
  heat.kind = CheckKind::calibration;
  v.push_back(heat);
  v.push_back(row("heat of growth", "heat released per mol O2 consumed",
                  "fermentations under oxygen limitation, 3.38 kcal per g O2 'irrespective of substrate and "
                  "microorganism'",
                  "Minkevich & Eroshin 1973, Folia Microbiol. 18:376 (abstract; authors from memory) [pub]", "kJ/mol",
                  3.38 * 4.184 * 31.9988, 0.10, heat_band, model_heat_per_mol_o2));
  v.push_back(row("heat of growth", "heat released per mol O2 consumed",
                  "aerobic pathways dominant, 106 kcal/mol O2",
                  "J. Chem. Technol. Biotechnol. 26 (1976), doi:10.1002/jctb.5020260179 (abstract) [pub]", "kJ/mol",
                  106.0 * 4.184, 0.10, heat_band, model_heat_per_mol_o2));
  auto cooney = row("heat of growth", "heat released per mol O2 consumed",
                    "E. coli, B. subtilis, C. intermedia, A. niger on glucose, molasses, soy-bean meal; 0.12 kcal/mmol",
                    "Cooney, Wang & Mateles 1969, Biotechnol. Bioeng. 11:269 (value from memory)", "kJ/mol",
                    0.12 * 4.184 * 1000.0, 0.10, heat_band, model_heat_per_mol_o2);
  cooney.known_miss = "the model's 440 kJ/mol is 12 % below this value (from memory); complex substrates may "
                      "release more: set culture.heat_yield for such a broth";
  v.push_back(cooney);
  // Mixing time: the correlation of Grenville's conductivity measurements for several impeller
  // types (the exchange constant was fitted to the Rushton points only, see verification).
  for (const auto& [type, dt] : {std::pair{"pitched-blade-down", 0.4}, {"hydrofoil-down", 0.4}, {"pitched-blade-down", 0.5}}) {
    ImpellerType t{};
    impeller_type_from_name(type, t);
    const double np = impeller_data(t).power_number;
    const double ref = 5.20 * std::pow(np, -1.0 / 3.0) / (dt * dt) / 2.0;  // at N = 2 rps
    v.push_back(row("mixing time", fmt::format("theta95 of a single {} impeller", type),
                    fmt::format("H = T = 1 m, D/T = {:g}, C = T/3, 120 rpm, water, turbulent", dt),
                    "N theta95 = 5.20 Np^-1/3 (T/D)^2, correlation of Grenville's (1992) measurements, Handbook of "
                    "Industrial Mixing 2004, ch. 9 [sec]",
                    "s", ref, 0.25, "band 25 %: the correlation's own scatter is about 20 % [sec]",
                    [type = std::string(type), dt = dt] { return theta95_single(type, dt); }));
  }
  // Gas holdup: the coalescing air-water correlation of stirred tanks.
  for (double rpm : {200.0, 300.0, 400.0}) {
    v.push_back(row("gas holdup", "volume-mean gas holdup / correlation at the model's Pg/V and vs",
                    fmt::format("T = H = 1 m, D = T/3, air-water 20 degC, 1 vvm, {:g} rpm", rpm),
                    "eps_G = 0.13 (P/V)^0.33 vs^0.67, correlation of measured data attributed to Smith, van 't Riet & "
                    "Middleton 1977 (constants from memory)",
                    "1", 1.0, 0.35, "band 35 %: the correlation's scatter, about 25 % (from memory), and the model's",
                    [rpm] { return holdup_over_correlation(rpm, 1.0); }));
  }
  return v;
}

}  // namespace oxystrat::detail
