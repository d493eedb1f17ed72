#include "physics/solubility.hpp"

#include <cmath>
#include <stdexcept>

namespace oxystrat::physics {

double water_vapour_pressure(double temperature_k) {
  // IAPWS-IF97 region 4 coefficients n1..n10.
  constexpr double n[10] = {0.11670521452767e4,  -0.72421316598320e6, -0.17073846940092e2,
                            0.12020824702470e5,  -0.32325550322333e7, 0.14915108613530e2,
                            -0.48232657361591e4, 0.40511340542057e6,  -0.23855557567849,
                            0.65017534844798e3};
  const double t = temperature_k;
  const double theta = t + n[8] / (t - n[9]);
  const double a = theta * theta + n[0] * theta + n[1];
  const double b = n[2] * theta * theta + n[3] * theta + n[4];
  const double c = n[5] * theta * theta + n[6] * theta + n[7];
  const double x = 2.0 * c / (-b + std::sqrt(b * b - 4.0 * a * c));
  return x * x * x * x * 1e6;  // MPa -> Pa
}

double water_viscosity(double temperature_k) {
  return 2.414e-5 * std::pow(10.0, 247.8 / (temperature_k - 140.0));
}

double o2_saturation_air_1atm(double temperature_k) {
  const double t = temperature_k;
  const double ln_c = -139.34411 + 1.575701e5 / t - 6.642308e7 / (t * t) + 1.243800e10 / (t * t * t) -
                      8.621949e11 / (t * t * t * t);
  const double mg_per_l = std::exp(ln_c);
  return mg_per_l * 1e-3 / molar_mass_o2;  // mg/L = g/m3 -> mol/m3
}

double henry_o2(double temperature_k) {
  const double p_o2 = air_o2_fraction * (101325.0 - water_vapour_pressure(temperature_k));
  return o2_saturation_air_1atm(temperature_k) / p_o2;
}

double henry_co2(double temperature_k) {
  return 3.3e-4 * std::exp(2400.0 * (1.0 / temperature_k - 1.0 / 298.15));
}

namespace {
// Ion-specific parameters h_i [m3/kmol], Weisenberger & Schumpe (1996) table 1 (via docs/method.md,
// [sec]); K+ uses 0.0922, the value of the original table as we read it (0.0992 appears elsewhere).
const std::map<std::string, double>& ion_parameters() {
  static const std::map<std::string, double> h{
      {"Na+", 0.1143},  {"Cl-", 0.0318},    {"SO4--", 0.1117}, {"NH4+", 0.0556},
      {"H2PO4-", 0.0906}, {"HPO4--", 0.1499}, {"Mg++", 0.1694},  {"K+", 0.0922}};
  return h;
}
}  // namespace

bool known_ion(const std::string& ion) { return ion_parameters().count(ion) > 0; }

std::string known_ions() {
  std::string out;
  for (const auto& [name, h] : ion_parameters()) out += (out.empty() ? "" : ", ") + name;
  return out;
}

double salting_out_factor(Gas gas, double temperature_k, const std::map<std::string, double>& ions_mol_m3) {
  // Gas-specific parameter h_G = h_G0 + h_T (T - 298.15) [m3/kmol].
  const double h_g0 = gas == Gas::o2 ? 0.0 : -0.0172;
  const double h_t = gas == Gas::o2 ? -3.34e-4 : -3.38e-4;
  const double h_g = h_g0 + h_t * (temperature_k - 298.15);
  double sum = 0.0;
  for (const auto& [ion, c_mol_m3] : ions_mol_m3) {
    const auto it = ion_parameters().find(ion);
    if (it == ion_parameters().end()) throw std::invalid_argument("unknown ion " + ion);
    sum += (it->second + h_g) * c_mol_m3 * 1e-3;  // mol/m3 -> kmol/m3
  }
  return std::pow(10.0, -sum);
}

}  // namespace oxystrat::physics
