#include "solver/oxygen/summary_values.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "solver/oxygen/limit_values.hpp"

namespace oxystrat {

std::vector<SummaryValue> summary_values(const Case& c, const CaseRun& run, std::optional<double> theta95_s) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double v = c.vessel.working_volume_m3;
  double tip = 0.0;
  int flooded = 0;
  for (const auto& i : run.hydro.impellers) {
    tip = std::max(tip, i.tip_speed_m_s);
    flooded += i.regime == GasRegime::flooded ? 1 : 0;
  }
  const auto* f = run.field ? &*run.field : nullptr;
  const auto* one = run.single_zone ? &*run.single_zone : nullptr;
  const double mm = 1.0;  // mol/m3 = mmol/L
  std::vector<SummaryValue> out{
      {"power_ungassed", "kW", run.hydro.power_ungassed_w / 1e3, "P ungassed"},
      {"power_gassed", "kW", run.hydro.power_gassed_w / 1e3, "P gassed"},
      {"power_per_volume", "kW/m3", run.hydro.power_gassed_w / v / 1e3, "Pg/V"},
      {"tip_speed", "m/s", tip, "max tip speed"},
      {"flooded_impellers", "1", static_cast<double>(flooded), "flooded impellers"},
      {"kla_mean", "1/h", f ? 3600 * f->kla_mean_1_s : nan, "kLa (volume mean)"},
      {"do_min", "mmol/L", f ? f->do_min * mm : nan, "DO min (zones)"},
      {"do_mean", "mmol/L", f ? f->do_mean * mm : nan, "DO mean (zones)"},
      {"do_single_zone", "mmol/L", one ? one->do_min * mm : nan, "DO (single zone)"},
      {"do_min_saturation", "%", f ? 100 * f->do_min / f->air_saturation_mol_m3 : nan, "DO min / air saturation"},
      {"volume_below_critical", "%", f ? 100 * f->volume_fraction_below_critical : nan, "volume below critical DO"},
      {"max_biomass", "g/L", f ? run.max_biomass_kg_m3 : nan, "max biomass (zones)"},
      {"max_biomass_single_zone", "g/L", f ? run.max_biomass_single_zone_kg_m3 : nan, "max biomass (single zone)"},
      {"offgas_o2", "%", f ? 100 * f->offgas_y_o2 : nan, "off-gas O2 (dry)"},
      {"offgas_co2", "%", f ? 100 * f->offgas_y_co2 : nan, "off-gas CO2 (dry)"},
      {"pco2_max", "mmHg", f ? f->pco2_max_pa / 133.322387415 : nan, "pCO2 max"},
      {"otr_total", "mmol/(L h)", f ? 3600 * f->otr_total_mol_s / run.net.total_volume() : nan, "OTR (vessel mean)"},
      {"cautions", "1", static_cast<double>(run.cautions.size()), "cautions"},
  };
  // Not computed is not there: no column of NaN (docs/outputs.md).
  if (theta95_s) out.insert(out.begin() + 5, {"theta95", "s", *theta95_s, "mixing time theta95"});
  append_limit_values(c, run, out);  // heat, shear, cost: only the values that apply
  return out;
}

std::vector<std::string> summary_value_names(bool with_theta95) {
  // A case with no gas still gives every name (its oxygen values are then NaN).
  std::vector<std::string> names{"power_ungassed", "power_gassed", "power_per_volume", "tip_speed",
                                 "flooded_impellers", "kla_mean", "do_min", "do_mean", "do_single_zone",
                                 "do_min_saturation", "volume_below_critical", "max_biomass",
                                 "max_biomass_single_zone", "offgas_o2", "offgas_co2", "pco2_max", "otr_total",
                                 "cautions"};
  if (with_theta95) names.insert(names.begin() + 5, "theta95");
  return names;
}

double summary_value(const std::vector<SummaryValue>& values, const std::string& name) {
  for (const auto& v : values) {
    if (v.name == name) return v.value;
  }
  throw std::out_of_range("no summary value named " + name);
}

}  // namespace oxystrat
