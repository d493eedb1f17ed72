#include "solver/oxygen/cautions.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "physics/mass_transfer.hpp"
#include "physics/solubility.hpp"
#include "solver/flow/viscous_flow.hpp"
#include "physics/constants.hpp"

namespace oxystrat {

std::string pco2_caution(CultureKind kind, double pco2_pa) {
  if (!(pco2_pa > pco2_inhibition_pa)) return "";
  if (kind == CultureKind::cell) {
    return fmt::format("pCO2 reaches {:.0f} mmHg, above the ~150 mmHg known to inhibit cell cultures (Gray et al. 1996).",
                       pco2_pa / kMmHgPa);
  }
  return fmt::format("pCO2 reaches {:.0f} mmHg: dissolved CO2 slows the growth and product formation of many bacteria "
                     "and fungi from about 0.1-0.3 bar (75-225 mmHg), with wide differences between organisms [from "
                     "memory]; check your strain's tolerance.",
                     pco2_pa / kMmHgPa);
}

namespace {

// The O2 solubility fit and the kLa temperature factor hold near room temperature; a thermophile
// or a cold culture takes both beyond their data.
std::string temperature_caution(double temperature_k) {
  const double celsius = temperature_k - 273.15;
  const std::string factor = fmt::format(
      "the kLa temperature factor 1.024^(T - 20 degC) of the van 't Riet correlation, common practice in aeration "
      "testing near 10-30 degC [from memory], here x{:.2g}",
      kla_temperature_factor(temperature_k));
  if (celsius > 40.0) {
    return fmt::format("model range: at {:.0f} degC the O2 solubility of Benson & Krause (1984), fitted to data up to "
                       "about 40 degC [from memory] (1.9 % below a handbook table at 50 degC, `oxystrat validate`), "
                       "and {}, are extrapolated; measure kLa and the O2 saturation at the process temperature.",
                       celsius, factor);
  }
  if (celsius < 10.0) {
    return fmt::format("model range: at {:.0f} degC {} is extrapolated; measure kLa at the process temperature.", celsius,
                       factor);
  }
  return "";
}

}  // namespace

std::vector<std::string> cautions(const Case& c, const Hydrodynamics& h, const OxygenField* field) {
  std::vector<std::string> out;
  const auto& v = c.vessel;
  const double bar = 1e5;
  if (v.pressure_rating_pa > 0.0) {
    const double bottom = v.head_pressure_pa + c.broth.density_kg_m3 * kG * v.liquid_height_m;
    if (v.head_pressure_pa > v.pressure_rating_pa) {
      out.push_back(fmt::format("PRESSURE: head pressure {:.3g} bar(a) is ABOVE the vessel rating {:.3g} bar(a). Do not "
                                "operate; the rating and relief settings of the certified vessel govern.",
                                v.head_pressure_pa / bar, v.pressure_rating_pa / bar));
    } else if (v.head_pressure_pa > 0.9 * v.pressure_rating_pa || bottom > v.pressure_rating_pa) {
      out.push_back(fmt::format("pressure: head pressure {:.3g} bar(a) (bottom {:.3g} bar(a)) is near the vessel rating "
                                "{:.3g} bar(a); check relief settings and the rating's reference point with the vessel's "
                                "documentation and local codes.",
                                v.head_pressure_pa / bar, bottom / bar, v.pressure_rating_pa / bar));
    }
  } else if (v.head_pressure_pa > 1.5 * bar) {
    out.push_back("pressure: no vessel.pressure_rating given; back pressure must stay within the certified rating.");
  }
  if (c.operation.oxygen_fraction > physics::air_o2_fraction + 0.005 && c.operation.gas_flow_normal_m3_s > 0.0) {
    out.push_back(fmt::format("OXYGEN-ENRICHED gas ({:.1f} % O2): fire and oxidation hazard. Equipment, seals, filters "
                              "and lubricants must be cleaned and rated for oxygen service; follow local codes and your "
                              "site's oxygen-safety practice.",
                              100.0 * c.operation.oxygen_fraction));
  }
  for (size_t m = 0; m < h.impellers.size(); ++m) {
    if (h.impellers[m].regime == GasRegime::flooded) {
      // The criterion is the Rushton turbine's; other types carry it scaled by their capacity.
      const ImpellerType type = c.impellers[m].type;
      const std::string criterion =
          type == ImpellerType::rushton
              ? "criterion for Rushton turbines, Nienow et al. 1985"
              : fmt::format("the Rushton turbine's criterion of Nienow et al. 1985 times {:.3g}, the {} type's gas "
                            "capacity relative to it [from memory]",
                            impeller_data(type).flooding_capacity, to_string(type));
      out.push_back(fmt::format("impeller {} is FLOODED (Fl_G = {:.3g} > {:.3g}): gas rises as a plume past it; raise "
                                "the speed or lower the gas flow ({}).",
                                m, h.impellers[m].aeration_number, h.impellers[m].flooding_aeration, criterion));
    }
  }
  if (!c.impellers.empty()) {
    // Below about half a diameter of cover an impeller draws gas from the surface (common practice).
    const auto& top = c.impellers.back();
    const double cover = v.liquid_height_m - top.elevation_m;
    if (cover < 0.5 * top.diameter_m) {
      out.push_back(fmt::format("model range: impeller {} has {:.2g} m of liquid above it ({:.2g} of its diameter): so "
                                "near the surface it can draw gas in from the headspace and form a vortex, drawing "
                                "less power and dispersing gas differently from the submerged impeller the model "
                                "assumes. Half a diameter of cover or more is usual (common practice).",
                                c.impellers.size() - 1, cover, cover / top.diameter_m));
    }
  }
  for (size_t m = 0; m < h.impellers.size(); ++m) {
    const auto& s = h.impellers[m];
    const double x = s.reynolds * std::cbrt(s.power_number);
    if (s.reynolds < 10.0 || x < turbulent_mixing_reynolds) {
      out.push_back(fmt::format("impeller {} runs {} (Re = {:.3g}{}): its power number follows the {} branch of the power "
                                "curve and turbulent exchange is damped (Grenville 1992); kLa and mixing correlations of "
                                "turbulent vessels do not hold there.",
                                m, s.reynolds < 10.0 ? "LAMINAR" : "transitional", s.reynolds,
                                c.broth.rheology.newtonian() ? "" : ", Metzner-Otto", s.reynolds < 10.0 ? "laminar" : "transitional"));
    }
    if (s.cavern_diameter_m > 0.0 && s.cavern_diameter_m < c.vessel.diameter_m) {
      out.push_back(fmt::format("impeller {} clears a cavern of {:.2g} m x {:.2g} m only (Elson et al. 1986) in a {:.2g} m "
                                "vessel: the yield-stress broth outside it stands still, fed with O2 by molecular "
                                "diffusion only ({:.0f} % of the volume stagnant). Raise the speed or use a larger impeller.",
                                m, s.cavern_diameter_m, s.cavern_height_m, c.vessel.diameter_m, 100.0 * h.stagnant_volume_fraction));
    }
  }
  if (field != nullptr) {
    if (auto w = temperature_caution(v.temperature_k); !w.empty()) out.push_back(std::move(w));
    // Over the moving broth: stagnant broth outside the caverns is at the zero-shear limit, and
    // its kLa hardly matters (it is fed by diffusion, said in the cavern caution).
    double mu_max = 0.0;
    for (size_t k = 0; k < h.apparent_viscosity.size(); ++k) {
      if (h.epsilon[k] > 0.0) mu_max = std::max(mu_max, h.apparent_viscosity[k]);
    }
    if (mu_max > water_like_viscosity_pa_s && c.model.kla_model == KlaModel::local_correlation) {
      out.push_back(fmt::format("model range: the broth's apparent viscosity reaches {:.3g} Pa s; kLa is the water-based "
                                "correlation times (5 mPa s / mu_a)^0.4 (Yagi & Yoshida 1975), whose data reach a few "
                                "Pa s [mem]; measure kLa in the broth where you can.",
                                mu_max));
    }
    if (auto w = pco2_caution(c.culture.kind, field->pco2_max_pa); !w.empty()) out.push_back(std::move(w));
    if (field->volume_fraction_churning > widespread_churning_share) {
      // Not a plume but the vessel's gas flow: a tall vessel at a high superficial velocity.
      const double vs_max = *std::max_element(field->superficial_gas_m_s.begin(), field->superficial_gas_m_s.end());
      out.push_back(fmt::format(
          "model range: gas holdup (gas volume per liquid volume) reaches {:.0f} % ({:.0f} % of the gassed dispersion) "
          "and exceeds {:.0f} % in {:.0f} % of the volume: not a sparger plume but the gas flow itself. At a superficial "
          "gas velocity of up to {:.2g} m/s the vessel runs towards the churn-turbulent regime (from ~0.05 m/s in "
          "bubble columns, Shah et al. 1982 [mem]), where large, fast bubbles carry much of the gas; one bubble size per "
          "zone then overstates the holdup and the gassed level, and holdup, kLa and pressure are rough. Less gas, more "
          "back pressure or O2 enrichment lower the velocity.",
          100.0 * field->holdup_max, 100.0 * field->holdup_max / (1.0 + field->holdup_max), 100.0 * bubbly_flow_holdup,
          100.0 * field->volume_fraction_churning, vs_max));
    } else if (field->volume_fraction_churning > 0.0) {
      // A single small zone may hold under 0.05 % of the volume: never print it as "0.0 %".
      const double share = 100.0 * field->volume_fraction_churning;
      out.push_back(fmt::format("model range: gas holdup reaches {:.0f} % ({} of the volume above {:.0f} %), beyond "
                                "bubbly flow: churning gas plumes there (typically the sparger plume) are not described "
                                "by the zone model; holdup, kLa and pressure there are rough.",
                                100.0 * field->holdup_max, share < 0.05 ? "under 0.1 %" : fmt::format("{:.1f} %", share),
                                100.0 * bubbly_flow_holdup));
    }
    for (size_t i = 0; i < c.impellers_above_liquid.size(); ++i) {
      const auto& imp = c.impellers_above_liquid[i];
      const double blades_from = imp.blades_from_m();
      if (field->gassed_level_m > blades_from) {
        out.push_back(fmt::format("model range: the gassed broth rises to {:.3g} m, into the blades ({:.3g} m up) of "
                                  "impeller {}, which the model leaves out as above the ungassed liquid at {:.3g} m: in "
                                  "operation it turns in the gassed broth, draws some power and beats it into foam. "
                                  "Cover it (fill higher), or keep the gassed broth below it (less liquid or gas).",
                                  field->gassed_level_m, blades_from, c.impellers.size() + i, c.vessel.liquid_height_m));
      }
    }
    if (c.vessel.shell_top_m > 0.0 && field->gassed_level_m >= c.vessel.shell_top_m) {
      out.push_back(fmt::format("LEVEL: the gassed broth rises to {:.3g} m, at or above the top of the straight side at "
                                "{:.3g} m ({:.3g} m3 of gas held): foam and broth may reach the head, the exhaust and "
                                "its filter; lower the volume or the gas flow, or check the head space with the vessel's "
                                "documentation.",
                                field->gassed_level_m, c.vessel.shell_top_m, field->gas_volume_m3));
    }
    const double v_m3 = c.vessel.working_volume_m3;
    const double pv = h.power_gassed_w / v_m3;
    if (c.model.kla_model == KlaModel::local_correlation && (v_m3 > 4.0 || pv < 500.0 || pv > 10000.0)) {
      out.push_back(fmt::format("model range: the van 't Riet kLa correlation was fitted up to ~4 m3 and 0.5-10 kW/m3 "
                                "(here {:.3g} m3, {:.2g} kW/m3); expect +-20-40 % scatter, more outside the range. "
                                "Calibrate with your own kLa data where you can{}.",
                                v_m3, pv / 1e3,
                                pv < 500.0 ? ", or set model.kla_model = \"mechanistic\" (kL from the local dissipation, "
                                             "area from the holdup and the bubble size), which holds at low P/V"
                                           : ""));
    }
  }
  return out;
}

}  // namespace oxystrat
