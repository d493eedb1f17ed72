#include "solver/oxygen/summary_values.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>
#include <utility>

#include "input/display_units.hpp"
#include "solver/oxygen/limit_values.hpp"

namespace oxystrat {

SummaryValue summary_entry(std::string name, double value_si, const std::string& si_unit,
                           const std::string& display_unit, std::string label) {
  return {std::move(name), si_unit, value_si, std::move(label), display_unit,
          units::display_per_si(si_unit, display_unit)};
}

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
  const auto e = summary_entry;
  std::vector<SummaryValue> out{
      e("power_ungassed", run.hydro.power_ungassed_w, "W", "kW", "P ungassed"),
      e("power_gassed", run.hydro.power_gassed_w, "W", "kW", "P gassed"),
      e("power_per_volume", run.hydro.power_gassed_w / v, "W/m3", "kW/m3", "Pg/V"),
      e("tip_speed", tip, "m/s", "m/s", "max tip speed"),
      e("flooded_impellers", static_cast<double>(flooded), "1", "1", "flooded impellers"),
      e("kla_mean", f ? f->kla_mean_1_s : nan, "1/s", "1/h", "kLa (volume mean)"),
      e("do_min", f ? f->do_min : nan, "mol/m3", "mmol/L", "DO min (zones)"),
      e("do_mean", f ? f->do_mean : nan, "mol/m3", "mmol/L", "DO mean (zones)"),
      e("do_single_zone", one ? one->do_min : nan, "mol/m3", "mmol/L", "DO (single zone)"),
      e("do_min_saturation", f ? f->do_min / f->air_saturation_mol_m3 : nan, "1", "%", "DO min / air saturation"),
      e("volume_fraction_below_critical", f ? f->volume_fraction_below_critical : nan, "1", "%",
        "volume below critical DO"),
      // Not searched for (a sweep's --no-biomass): no value, rather than a supportable biomass of 0.
      e("max_biomass", f && run.biomass_searched ? run.max_biomass_kg_m3 : nan, "kg/m3", "g/L", "max biomass (zones)"),
      e("max_biomass_single_zone", f && run.biomass_searched ? run.max_biomass_single_zone_kg_m3 : nan, "kg/m3", "g/L",
        "max biomass (single zone)"),
      e("offgas_y_o2", f ? f->offgas_y_o2 : nan, "1", "%", "off-gas O2 (dry)"),
      e("offgas_y_co2", f ? f->offgas_y_co2 : nan, "1", "%", "off-gas CO2 (dry)"),
      e("pco2_max", f ? f->pco2_max_pa : nan, "Pa", "mmHg", "pCO2 max"),
      // Per liquid volume, not /summary/otr_total (mol/s): a mean rate compares across vessel sizes.
      e("otr_mean", f ? f->otr_total_mol_s / run.net.total_volume() : nan, "mol/(m3 s)", "mmol/(L h)",
        "OTR (vessel mean)"),
      e("cautions", static_cast<double>(run.cautions.size()), "1", "1", "cautions"),
  };
  // Not computed is not there: no column of NaN (docs/outputs.md).
  if (theta95_s) out.insert(out.begin() + 5, e("theta95", *theta95_s, "s", "s", "mixing time theta95"));
  append_limit_values(c, run, out);  // heat, shear, cost: only the values that apply
  return out;
}

std::vector<std::string> summary_value_names(bool with_theta95) {
  // A case with no gas still gives every name (its oxygen values are then NaN).
  std::vector<std::string> names{"power_ungassed", "power_gassed", "power_per_volume", "tip_speed",
                                 "flooded_impellers", "kla_mean", "do_min", "do_mean", "do_single_zone",
                                 "do_min_saturation", "volume_fraction_below_critical", "max_biomass",
                                 "max_biomass_single_zone", "offgas_y_o2", "offgas_y_co2", "pco2_max", "otr_mean",
                                 "cautions"};
  if (with_theta95) names.insert(names.begin() + 5, "theta95");
  return names;
}

namespace {

const SummaryValue& find(const std::vector<SummaryValue>& values, const std::string& name) {
  for (const auto& v : values) {
    if (v.name == name) return v;
  }
  throw std::out_of_range("no summary value named " + name);
}

}  // namespace

double summary_value(const std::vector<SummaryValue>& values, const std::string& name) {
  return find(values, name).value;
}

double summary_display(const std::vector<SummaryValue>& values, const std::string& name) {
  return find(values, name).display();
}

std::string current_summary_name(const std::string& name) {
  // Renamed in format 2.0 so that compare and sweep use /summary's names (CHANGELOG).
  static const std::pair<const char*, const char*> renamed[] = {
      {"volume_below_critical", "volume_fraction_below_critical"},
      {"offgas_o2", "offgas_y_o2"},
      {"offgas_co2", "offgas_y_co2"},
      {"kolmogorov_min", "kolmogorov_length_min"},
      {"otr_total", "otr_mean"},
  };
  for (const auto& [old_name, new_name] : renamed) {
    if (name == old_name) return new_name;
    // The uncertainty quantiles carry the value's name: "volume_below_critical_p90".
    for (const char* q : {"_p10", "_p50", "_p90"}) {
      if (name == std::string(old_name) + q) return new_name + std::string(q);
    }
  }
  return name;
}

}  // namespace oxystrat
