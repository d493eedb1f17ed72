#include "postproc/report/oxygen_output.hpp"
#include "postproc/io/file_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <stdexcept>

#include "physics/solubility.hpp"
#include "input/errors.hpp"
#include "postproc/report/limits_output.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

std::vector<double> zero_where_nan(std::vector<double> v) {
  for (auto& x : v) x = std::isnan(x) ? 0.0 : x;
  return v;
}

std::vector<double> scaled(const std::vector<double>& v, double factor) {
  std::vector<double> out(v.size());
  std::transform(v.begin(), v.end(), out.begin(), [factor](double x) { return x * factor; });
  return out;
}

// Mean C* over the gassed zones of the lowest gassed row and of the top row [mol/m3].
std::pair<double, double> cstar_bottom_top(const ZoneNetwork& net, const OxygenField& f) {
  std::vector<double> sum(net.rows(), 0.0), vol(net.rows(), 0.0);
  for (int k = 0; k < net.size(); ++k) {
    if (f.holdup[k] < gas_free_holdup) continue;
    sum[net.row[k]] += f.cstar_mol_m3[k] * net.volume[k];
    vol[net.row[k]] += net.volume[k];
  }
  double bottom = 0.0, top = 0.0;
  for (int j = 0; j < net.rows(); ++j) {
    if (vol[j] > 0.0) {
      bottom = sum[j] / vol[j];
      break;
    }
  }
  for (int j = net.rows(); j-- > 0;) {
    if (vol[j] > 0.0) {
      top = sum[j] / vol[j];
      break;
    }
  }
  return {bottom, top};
}

}  // namespace

void write_oxygen_h5(H5Writer& h5, const Case& c, const CaseRun& run) {
  h5.write("/cautions", run.cautions);
  h5.write("/notes", run.notes);
  write_limits_h5(h5, c, run);  // heat, shear, cost
  if (!run.field) return;
  const auto& f = *run.field;
  h5.write("/fields/do", f.do_mol_m3, "mol/m3");
  h5.write("/fields/co2", f.co2_mol_m3, "mol/m3");
  h5.write("/fields/cstar", f.cstar_mol_m3, "mol/m3");
  h5.write("/fields/kla", f.kla_1_s, "1/s");
  h5.write("/fields/otr", f.otr_mol_m3_s, "mol/(m3 s)");
  h5.write("/fields/our", f.our_mol_m3_s, "mol/(m3 s)");
  h5.write("/fields/gas_holdup", f.holdup, "1");
  h5.write("/fields/superficial_gas_velocity", f.superficial_gas_m_s, "m/s");
  h5.write("/fields/y_o2", f.y_o2, "1");
  h5.write("/fields/y_co2", f.y_co2, "1");
  h5.write("/fields/pco2", f.pco2_pa, "Pa");
  h5.write("/fields/pressure", f.pressure_pa, "Pa");
  h5.write("/fields/do_saturation", f.do_saturation, "1");
  h5.attribute("/fields/do_saturation", "meaning", "DO over the DO that reads 100 %: " + c.do_percent.label);
  h5.write("/fields/bubble_diameter", run.routing.sauter_m, "m");
  h5.attribute("/fields/bubble_diameter", "meaning", "Sauter mean bubble diameter d32");
  h5.write("/fields/slip_velocity", run.routing.slip_m_s, "m/s");
  h5.write("/summary/holdup_mean", f.holdup_mean, "1");
  h5.write("/summary/holdup_max", f.holdup_max, "1");
  h5.write("/summary/gas_volume", f.gas_volume_m3, "m3");
  h5.write("/summary/gassed_level", f.gassed_level_m, "m");
  h5.attribute("/summary/gassed_level", "meaning", "height of the gassed broth surface above the lowest point");
  h5.write("/summary/do_percent_reference", c.do_percent.reference_mol_m3, "mol/m3");
  h5.attribute("/summary/do_percent_reference", "meaning", "the DO that reads 100 %: " + c.do_percent.label);
  h5.write("/summary/kla_model", std::vector<std::string>{kla_model_description(c)});
  if (!run.single_zone) throw std::logic_error("write_oxygen_h5 needs the single-zone field (run_case with single_zone)");
  const auto& s = *run.single_zone;
  h5.write("/summary/kla_mean", f.kla_mean_1_s, "1/s");
  h5.write("/summary/kla_vessel_correlation", f.kla_vessel_1_s, "1/s");
  h5.write("/summary/do_min", f.do_min, "mol/m3");
  h5.write("/summary/do_min_zone", std::vector<int>{f.do_min_zone}, "1");
  h5.write("/summary/do_mean", f.do_mean, "mol/m3");
  h5.write("/summary/do_single_zone", s.do_min, "mol/m3");
  h5.write("/summary/kla_single_zone", s.kla_mean_1_s, "1/s");
  h5.write("/summary/volume_fraction_below_critical", f.volume_fraction_below_critical, "1");
  h5.write("/summary/critical_do", c.culture.critical_do_mol_m3, "mol/m3");
  h5.write("/summary/offgas_y_o2", f.offgas_y_o2, "1");
  h5.write("/summary/offgas_y_co2", f.offgas_y_co2, "1");
  h5.write("/summary/otr_total", f.otr_total_mol_s, "mol/s");
  h5.write("/summary/our_total", f.our_total_mol_s, "mol/s");
  h5.write("/summary/otr_mean", f.otr_total_mol_s / run.net.total_volume(), "mol/(m3 s)");
  h5.attribute("/summary/otr_mean", "meaning", "otr_total per liquid volume (the OTR row of compare and sweep)");
  h5.write("/summary/do_min_saturation", f.do_min / f.air_saturation_mol_m3, "1");
  h5.attribute("/summary/do_min_saturation", "meaning", "do_min over air saturation at 1 atm and broth temperature");
  h5.write("/summary/o2_balance_error", f.o2_balance_error, "1");
  h5.write("/summary/pco2_max", f.pco2_max_pa, "Pa");
  h5.write("/summary/max_biomass", run.max_biomass_kg_m3, "kg/m3");
  h5.write("/summary/max_biomass_single_zone", run.max_biomass_single_zone_kg_m3, "kg/m3");
  h5.write("/summary/max_our", run.max_biomass_kg_m3 * c.culture.q_o2_max_mol_kg_s, "mol/(m3 s)");
  h5.attribute("/summary/max_our", "meaning", "q_O2,max times max_biomass: the uptake capacity at that biomass");
  const auto [bottom, top] = cstar_bottom_top(run.net, f);
  h5.write("/summary/cstar_bottom", bottom, "mol/m3");
  h5.write("/summary/cstar_top", top, "mol/m3");
  const auto p = height_profile(run.net, f.do_mol_m3);
  h5.write("/profile/z", p.z, "m");
  h5.write("/profile/do_min", p.min, "mol/m3");
  h5.write("/profile/do_mean", p.mean, "mol/m3");
  h5.write("/profile/do_max", p.max, "mol/m3");
  const std::vector<bool> gassed = gassed_zones(f);
  const auto ps = height_profile(run.net, f.cstar_mol_m3, gassed);
  h5.write("/profile/cstar_mean", zero_where_nan(ps.mean), "mol/m3");
  h5.attribute("/profile/cstar_mean", "meaning", "mean over the gassed zones of each level (0 where none is gassed)");
  const auto pk = height_profile(run.net, f.kla_1_s);
  h5.write("/profile/kla_mean", pk.mean, "1/s");
}

void write_profile_csv(const std::string& path, const CaseRun& run) {
  if (!run.field) return;
  const auto& f = *run.field;
  const auto p = height_profile(run.net, f.do_mol_m3);
  const std::vector<bool> gassed = gassed_zones(f);
  const auto ps = height_profile(run.net, f.cstar_mol_m3, gassed);
  const auto pk = height_profile(run.net, f.kla_1_s);
  const auto pe = height_profile(run.net, run.hydro.epsilon);
  std::ofstream out(path);
  out << "z [m],DO min [mmol/L],DO mean [mmol/L],DO max [mmol/L],C* mean over gassed zones [mmol/L],kLa mean [1/h],"
         "epsilon mean [W/kg]\n";
  for (size_t j = 0; j < p.z.size(); ++j) {
    out << fmt::format("{:.5g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g},{:.6g}\n", p.z[j], p.min[j], p.mean[j], p.max[j],
                       std::isnan(ps.mean[j]) ? 0.0 : ps.mean[j], 3600.0 * pk.mean[j], pe.mean[j]);
  }
  finish_file(out, path);
}

std::vector<CellArray> oxygen_cell_arrays(const CaseRun& run) {
  if (!run.field) return {};
  const auto& f = *run.field;
  const double mg_l = physics::molar_mass_o2 * 1e3;  // mol/m3 -> mg/L
  return {{"do", f.do_mol_m3, {}},
          {"do_mg_L", scaled(f.do_mol_m3, mg_l), {}},
          {"do_percent_saturation", scaled(f.do_saturation, 100.0), {}},
          {"cstar", f.cstar_mol_m3, {}},
          {"kla", f.kla_1_s, {}},
          {"kla_1_h", scaled(f.kla_1_s, 3600.0), {}},
          {"otr", f.otr_mol_m3_s, {}},
          {"our", f.our_mol_m3_s, {}},
          {"gas_holdup", f.holdup, {}},
          {"y_o2", f.y_o2, {}},
          {"y_co2", f.y_co2, {}},
          {"pco2", f.pco2_pa, {}},
          {"pco2_mmHg", scaled(f.pco2_pa, 1.0 / kMmHgPa), {}},
          {"co2", f.co2_mol_m3, {}},
          {"pressure_gassed", f.pressure_pa, {}}};
}

std::string kla_model_description(const Case& c) {
  if (c.model.kla_model == KlaModel::mechanistic) {
    return "mechanistic: kL from the local dissipation (Linek et al. 2004) x area 6 holdup / d32 per zone";
  }
  return c.model.kla_normalise ? "van 't Riet (1979) per zone, scaled so that its volume mean is the vessel-level value"
                               : "van 't Riet (1979) per zone at the zone's P/V and gas flux";
}

std::string gas_summary(const CaseRun& run) {
  const auto& f = *run.field;
  const auto& g = run.routing;
  const auto [d_lo, d_hi] = std::minmax_element(g.sauter_m.begin(), g.sauter_m.end());
  const auto [u_lo, u_hi] = std::minmax_element(g.slip_m_s.begin(), g.slip_m_s.end());
  std::string s = fmt::format("  gas            holdup {:.3g} % mean, {:.2g} % max (of the liquid volume); bubbles {:.2g}-{:.2g} mm",
                              100 * f.holdup_mean, 100 * f.holdup_max, 1e3 * *d_lo, 1e3 * *d_hi);
  if (g.sparger_bubble_m > 0.0) s += fmt::format(" (sparger forms {:.2g} mm)", 1e3 * g.sparger_bubble_m);
  s += fmt::format(", rising {:.2g}-{:.2g} m/s; gassed level {:.3g} m\n", *u_lo, *u_hi, f.gassed_level_m);
  return s;
}

std::string oxygen_summary(const Case& c, const CaseRun& run) {
  std::string s;
  for (const auto& n : run.notes) s += "Note: " + n + "\n";
  if (run.field) {
    const auto& f = *run.field;
    if (!run.single_zone) throw std::logic_error("oxygen_summary needs the single-zone field (run_case with single_zone)");
    const auto& one = *run.single_zone;
    const double sat = f.air_saturation_mol_m3;
    const auto pct = [sat](double c_mol) { return 100.0 * c_mol / sat; };
    s += "Oxygen            zone model                 single zone (one average kLa)\n";
    s += fmt::format("  kLa            {:7.1f} 1/h (volume mean)   {:7.1f} 1/h   [vessel correlation {:.1f} 1/h]\n",
                     3600 * f.kla_mean_1_s, 3600 * one.kla_mean_1_s, 3600 * f.kla_vessel_1_s);
    s += fmt::format("  kLa model      {}\n", kla_model_description(c));
    s += gas_summary(run);
    s += fmt::format("  DO min         {:7.4f} mmol/L ({:4.1f} %)   {:7.4f} mmol/L ({:4.1f} %)\n", f.do_min, pct(f.do_min),
                     one.do_min, pct(one.do_min));
    s += fmt::format("  DO mean        {:7.4f} mmol/L ({:4.1f} %)   (% = {})\n", f.do_mean, pct(f.do_mean), c.do_percent.label);
    const int k = f.do_min_zone;
    s += fmt::format("  DO min at      r = {:.2f} m, z = {:.2f} m (zone {})\n", run.net.r[k], run.net.z[k], k);
    s += fmt::format("  below critical {:5.1f} % of the volume (critical DO {:.4f} mmol/L)   {}\n",
                     100 * f.volume_fraction_below_critical, c.culture.critical_do_mol_m3,
                     one.do_min < c.culture.critical_do_mol_m3 ? "below" : "above");
    if (run.hydro.stagnant_volume_fraction > 0.0) {
      // Broth outside every cavern: no flow, no dissipation, O2 by diffusion only.
      double v = 0.0, sum = 0.0, lo = 1e300;
      for (int z = 0; z < run.net.size(); ++z) {
        if (run.hydro.epsilon[z] > 0.0) continue;
        v += run.net.volume[z], sum += f.do_mol_m3[z] * run.net.volume[z], lo = std::min(lo, f.do_mol_m3[z]);
      }
      if (v > 0.0) {
        s += fmt::format("  stagnant broth {:5.1f} % of the volume outside the caverns: DO mean {:.4f}, min {:.4f} mmol/L\n",
                         100.0 * run.hydro.stagnant_volume_fraction, sum / v, lo);
      }
    }
    const auto p = height_profile(run.net, f.do_mol_m3);
    s += "  DO by height   ";
    const size_t step = std::max<size_t>(1, p.z.size() / 6);
    for (size_t j = 0; j < p.z.size(); j += step) s += fmt::format("{:.1f} m: {:.3f}  ", p.z[j], p.mean[j]);
    s += "mmol/L (mean)\n";
    const auto [bottom, top] = cstar_bottom_top(run.net, f);
    s += fmt::format("  C* bottom/top  {:.4f} / {:.4f} mmol/L   {:.4f} mmol/L\n", bottom, top, one.cstar_mol_m3[0]);
    s += fmt::format("  off-gas        O2 {:.2f} %, CO2 {:.2f} % (dry)    O2 {:.2f} %, CO2 {:.2f} %\n", 100 * f.offgas_y_o2,
                     100 * f.offgas_y_co2, 100 * one.offgas_y_o2, 100 * one.offgas_y_co2);
    s += fmt::format("  OTR total      {:.4g} mol/s ({:.1f} mmol/(L h)); O2 balance residual {:.1e}\n", f.otr_total_mol_s,
                     3600 * f.otr_total_mol_s / run.net.total_volume(), f.o2_balance_error);
    s += fmt::format("  pCO2 max       {:.0f} mmHg\n", f.pco2_max_pa / kMmHgPa);
    if (c.culture.q_o2_max_mol_kg_s > 0.0) {
      s += fmt::format("  max biomass    {:7.1f} g/L (OUR {:.0f} mmol/(L h))   {:7.1f} g/L (OUR {:.0f} mmol/(L h))\n",
                       run.max_biomass_kg_m3, 3600 * run.max_biomass_kg_m3 * c.culture.q_o2_max_mol_kg_s,
                       run.max_biomass_single_zone_kg_m3,
                       3600 * run.max_biomass_single_zone_kg_m3 * c.culture.q_o2_max_mol_kg_s);
      s += fmt::format("                 (every zone above critical DO; case biomass {:.1f} g/L)\n", c.culture.biomass_kg_m3);
    }
  }
  s += limits_summary(c, run);
  if (!run.cautions.empty()) {
    s += "Cautions (defer to local codes, the vessel's certification and licensed practice)\n";
    for (const auto& w : run.cautions) s += "  - " + w + "\n";
  }
  return s;
}

}  // namespace oxystrat
