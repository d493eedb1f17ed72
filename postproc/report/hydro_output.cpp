#include "postproc/report/hydro_output.hpp"
#include "postproc/report/mixing_output.hpp"
#include "postproc/io/file_output.hpp"
#include "solver/flow/viscous_flow.hpp"
#include "input/errors.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <stdexcept>

namespace oxystrat {

void write_hydrodynamics_h5(H5Writer& h5, const Case& c, const Hydrodynamics& h) {
  std::vector<double> p0, pg, tip, fl, np, nq, re, ratio, qg, circ, flood, disp;
  std::vector<std::string> regime, type;
  for (size_t m = 0; m < h.impellers.size(); ++m) {
    const auto& s = h.impellers[m];
    p0.push_back(s.power_ungassed_w);
    pg.push_back(s.power_gassed_w);
    tip.push_back(s.tip_speed_m_s);
    fl.push_back(s.aeration_number);
    np.push_back(s.power_number);
    nq.push_back(s.flow_number);
    re.push_back(s.reynolds);
    ratio.push_back(s.gassed_ratio);
    qg.push_back(s.gas_flow_m3_s);
    circ.push_back(s.circulation_m3_s);
    flood.push_back(s.flooding_aeration);
    disp.push_back(s.dispersion_aeration);
    regime.push_back(to_string(s.regime));
    type.push_back(to_string(c.impellers[m].type));
  }
  h5.write("/impellers/type", type);
  h5.write("/impellers/power_ungassed", p0, "W");
  h5.write("/impellers/power_gassed", pg, "W");
  h5.write("/impellers/gassed_power_ratio", ratio, "1");
  h5.write("/impellers/tip_speed", tip, "m/s");
  h5.write("/impellers/aeration_number", fl, "1");
  h5.write("/impellers/flooding_aeration_number", flood, "1");
  h5.write("/impellers/dispersion_aeration_number", disp, "1");
  h5.write("/impellers/gas_flow", qg, "m3/s");
  h5.write("/impellers/power_number", np, "1");
  h5.write("/impellers/flow_number", nq, "1");
  h5.write("/impellers/reynolds", re, "1");
  h5.write("/impellers/circulation", circ, "m3/s");
  h5.write("/impellers/regime", regime);
  std::vector<std::string> flow_regime;
  for (size_t m = 0; m < h.impellers.size(); ++m) flow_regime.push_back(impeller_flow_regime(h.impellers[m]));
  h5.write("/impellers/flow_regime", flow_regime);
  h5.attribute("/impellers/flow_regime", "meaning", "laminar (Re < 10), transitional or turbulent (Re Np^(1/3) > 6370)");
  if (c.broth.rheology.yield_stress_pa > 0.0) {
    std::vector<double> dc, hc;
    for (const auto& s : h.impellers) dc.push_back(s.cavern_diameter_m), hc.push_back(s.cavern_height_m);
    h5.write("/impellers/cavern_diameter", dc, "m");
    h5.write("/impellers/cavern_height", hc, "m");
    h5.attribute("/impellers/cavern_diameter", "meaning", "cylindrical cavern of Elson et al. (1986), centred on the impeller plane");
  }
  h5.write("/summary/stagnant_volume_fraction", h.stagnant_volume_fraction, "1");
  h5.attribute("/summary/stagnant_volume_fraction", "meaning", "share of the volume outside every cavern (0 without a yield stress)");
  h5.write("/fields/shear_rate", h.shear_rate, "1/s");
  h5.attribute("/fields/shear_rate", "meaning", "shear rate whose viscous dissipation equals the zone's dissipation");
  h5.write("/fields/apparent_viscosity", h.apparent_viscosity, "Pa s");
  h5.write("/faces/flow", h.face_flow, "m3/s");
  h5.attribute("/faces/flow", "meaning", "convective flow from zone_a to zone_b (negative: b to a)");
  h5.write("/faces/exchange", h.face_exchange, "m3/s");
  h5.attribute("/faces/exchange", "meaning", "turbulent exchange flow, equal both ways");
  h5.write("/fields/epsilon", h.epsilon, "W/kg");
  h5.write("/fields/velocity_r", h.velocity_r, "m/s");
  h5.write("/fields/velocity_z", h.velocity_z, "m/s");
  h5.write("/summary/power_ungassed", h.power_ungassed_w, "W");
  h5.write("/summary/power_gassed", h.power_gassed_w, "W");
  h5.write("/summary/power_per_volume", h.power_gassed_w / c.vessel.working_volume_m3, "W/m3");
  h5.attribute("/summary/power_per_volume", "meaning", "gassed power per ungassed working volume");
  h5.write("/summary/power_per_volume_ungassed", h.power_ungassed_w / c.vessel.working_volume_m3, "W/m3");
  h5.write("/summary/exchange_constant", h.exchange_constant, "1");
  // Also rows of compare and sweep: the same name and unit in every file (format 2.0).
  double tip_max = 0.0;
  int flooded = 0;
  for (const auto& i : h.impellers) {
    tip_max = std::max(tip_max, i.tip_speed_m_s);
    flooded += i.regime == GasRegime::flooded ? 1 : 0;
  }
  h5.write("/summary/tip_speed", tip_max, "m/s");
  h5.attribute("/summary/tip_speed", "meaning", "largest impeller tip speed");
  h5.write("/summary/flooded_impellers", static_cast<double>(flooded), "1");
}

std::string impeller_flow_regime(const ImpellerState& s) {
  if (s.reynolds < 10.0) return "laminar";
  return s.reynolds * std::cbrt(s.power_number) > turbulent_mixing_reynolds ? "turbulent" : "transitional";
}

std::vector<CellArray> hydrodynamics_cell_arrays(const Hydrodynamics& h) {
  return {{"epsilon", h.epsilon, {}},
          {"velocity", h.velocity_r, h.velocity_z},
          {"apparent_viscosity_Pa_s", h.apparent_viscosity, {}},
          {"shear_rate", h.shear_rate, {}}};
}

std::string power_table(const Case& c, const Hydrodynamics& h) {
  std::string s = "Impeller power\n";
  s += fmt::format("  {:>2}  {:<19} {:>6} {:>6} {:>9} {:>9} {:>6} {:>7} {:<21} {:>8}\n", "#", "type", "D/T", "Np",
                   "P0 [kW]", "Pg [kW]", "Pg/P0", "Fl_G", "regime", "tip [m/s]");
  for (size_t m = 0; m < h.impellers.size(); ++m) {
    const auto& i = h.impellers[m];
    s += fmt::format("  {:>2}  {:<19} {:>6.3f} {:>6.3g} {:>9.4g} {:>9.4g} {:>6.3f} {:>7.4f} {:<21} {:>8.3g}\n", m,
                     to_string(c.impellers[m].type), c.impellers[m].diameter_m / c.vessel.diameter_m, i.power_number,
                     i.power_ungassed_w / 1e3, i.power_gassed_w / 1e3, i.gassed_ratio, i.aeration_number,
                     to_string(i.regime), i.tip_speed_m_s);
  }
  const double v = c.vessel.working_volume_m3;
  s += fmt::format("  total  P0 = {:.4g} kW ({:.3g} kW/m3), Pg = {:.4g} kW ({:.3g} kW/m3)\n", h.power_ungassed_w / 1e3,
                   h.power_ungassed_w / v / 1e3, h.power_gassed_w / 1e3, h.power_gassed_w / v / 1e3);
  return s;
}

void write_mixing_h5(H5Writer& h5, const MixingResult& m, double homogeneity) {
  const std::string band = homogeneity_percent(1.0 - homogeneity);
  h5.write("/mixing/homogeneity", homogeneity, "1");
  h5.attribute("/mixing/homogeneity", "meaning", "degree of homogeneity x of the mixing time theta_x");
  h5.write("/mixing/theta", m.theta_s, "s");
  h5.attribute("/mixing/theta", "meaning",
               "time after which every zone the flow reaches stays within +-" + band + " % of the final value");
  h5.write("/mixing/theta_probe", m.theta_probe_s, "s");
  if (std::abs(homogeneity - 0.95) < 1e-12) {
    h5.write("/mixing/theta95", m.theta_s, "s");
    h5.attribute("/mixing/theta95", "meaning", "time after which every zone the flow reaches stays within +-5 % of the final value");
    h5.write("/mixing/theta95_probe", m.theta_probe_s, "s");
  }
  h5.write("/mixing/judged_volume_fraction", m.judged_volume_fraction, "1");
  h5.attribute("/mixing/judged_volume_fraction", "meaning",
               "share of the volume theta judges: 1, or less where broth outside every cavern is stagnant");
  h5.write("/mixing/time", m.time_s, "s");
  h5.write("/mixing/probe", m.probe, "1");
  h5.attribute("/mixing/probe", "meaning", "tracer concentration at the probe zone over its final value");
  h5.write("/mixing/max_deviation", m.max_deviation, "1");
  h5.write("/mixing/inject_zone", std::vector<int>{m.inject_zone}, "1");
  h5.write("/mixing/probe_zone", std::vector<int>{m.probe_zone}, "1");
  h5.write("/mixing/snapshot_time", m.snapshot_time_s, "s");
  std::vector<double> field;
  const size_t n = m.snapshots.empty() ? 0 : static_cast<size_t>(m.snapshots.front().size());
  for (const auto& s : m.snapshots) field.insert(field.end(), s.data(), s.data() + s.size());
  h5.write("/mixing/field", field, m.snapshots.size(), n, "1");
  h5.attribute("/mixing/field", "meaning", "tracer over its final value, one row per snapshot_time, one column per zone");
}

void write_mixing_csv(const std::string& path, const MixingResult& m) {
  std::ofstream out(path);
  out << "time [s],probe c/c_final [-],max deviation |c/c_final - 1| [-]\n";
  for (size_t i = 0; i < m.time_s.size(); ++i) {
    out << fmt::format("{:.6g},{:.6g},{:.6g}\n", m.time_s[i], m.probe[i], m.max_deviation[i]);
  }
  finish_file(out, path);
}

}  // namespace oxystrat
