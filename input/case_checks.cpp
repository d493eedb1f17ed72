#include "input/case_sections.hpp"

#include <fmt/format.h>

#include <utility>

#include "physics/vessel_shape.hpp"

namespace oxystrat::detail {

void check_geometry(const TomlSource& src, const Case& c, std::vector<std::string>& notes) {
  const VesselShape shape(c.vessel.diameter_m, c.vessel.bottom);
  const double t = c.vessel.diameter_m;
  const double h = c.vessel.liquid_height_m;
  const double free_width = t - 2.0 * (c.vessel.baffles > 0 ? c.vessel.baffle_width_m : 0.0);
  for (size_t i = 0; i < c.impellers.size(); ++i) {
    const auto& imp = c.impellers[i];
    const std::string p = fmt::format("impeller.{}.", i);
    if (imp.diameter_m >= free_width) {
      src.fail(p + "diameter", fmt::format("impeller diameter {:.4g} m does not fit inside the baffles: it must be "
                                           "less than T - 2 x baffle width = {:.4g} m",
                                           imp.diameter_m, free_width));
    }
    const double band_lo = imp.blades_from_m();
    const double band_hi = imp.blades_to_m();
    const bool uncovered = band_lo >= h;
    if (c.vessel.shell_top_m > 0.0 && imp.elevation_m > c.vessel.shell_top_m) {
      src.fail(p + "elevation", fmt::format("the impeller at {:.4g} m is above the top of the vessel's shell at {:.4g} m "
                                            "(bottom head {:.4g} m + vessel.straight_side)",
                                            imp.elevation_m, c.vessel.shell_top_m, shape.head_depth()));
    }
    if (uncovered && c.vessel.shell_top_m <= 0.0) {
      src.fail(p + "elevation", fmt::format("the impeller blades reach {:.4g} m, above the liquid surface at {:.4g} m; "
                                            "an impeller above the liquid (a vessel filled below it) is left out of "
                                            "the model only when vessel.straight_side gives the shell it must fit in",
                                            band_hi, h));
    }
    if (band_hi >= h && !uncovered) {
      src.fail(p + "elevation", fmt::format("the impeller blades reach {:.4g} m, above the liquid surface at {:.4g} m, "
                                            "which cuts them ({:.4g}-{:.4g} m): a partly submerged impeller is not "
                                            "modelled (its power and pumping are not a submerged one's); raise the "
                                            "liquid above {:.4g} m, or lower it below {:.4g} m to leave the impeller out",
                                            band_hi, h, band_lo, band_hi, band_hi, band_lo));
    }
    const double dt = imp.diameter_m / t;
    if ((dt < 0.15 || dt > 0.7) && !uncovered) {
      notes.push_back(fmt::format("{}: D/T = {:.3g} is outside 0.15-0.7, where the power and flow numbers were "
                                  "measured",
                                  src.where(p + "diameter"), dt));
    }
    const double floor = shape.bottom_height(0.5 * imp.diameter_m);
    if (band_lo <= floor) {
      src.fail(p + "elevation", fmt::format("the impeller blades reach down to {:.4g} m, into the vessel bottom "
                                            "(the head surface is {:.4g} m high at the blade-tip radius); raise it",
                                            band_lo, floor));
    }
    if (i > 0) {
      const auto& below = c.impellers[i - 1];
      if (imp.elevation_m <= below.elevation_m) {
        src.fail(p + "elevation", fmt::format("impellers must be listed bottom to top: {:.4g} m is not above the "
                                              "previous impeller at {:.4g} m",
                                              imp.elevation_m, below.elevation_m));
      }
      if (band_lo < below.blades_to_m()) {
        src.fail(p + "elevation", fmt::format("overlaps impeller {}: its blades span {:.4g}-{:.4g} m and the one "
                                              "below reaches {:.4g} m",
                                              i - 1, band_lo, band_hi, below.blades_to_m()));
      }
      const double spacing = imp.elevation_m - below.elevation_m;
      if (spacing < below.diameter_m && c.model.multiple_impeller_factor == 1.0 && !uncovered) {
        notes.push_back(fmt::format("{}: spacing {:.3g} m is less than the lower impeller's diameter; powers add "
                                    "less than fully (set model.multiple_impeller_factor)",
                                    src.where(p + "elevation"), spacing));
      }
    }
  }
  if (c.has_sparger) {
    const double rs = 0.5 * c.sparger.diameter_m;
    if (c.sparger.elevation_m >= c.vessel.liquid_height_m) {
      src.fail("sparger.elevation", fmt::format("the sparger at {:.4g} m is not below the liquid surface at {:.4g} m",
                                                c.sparger.elevation_m, c.vessel.liquid_height_m));
    }
    if (c.sparger.elevation_m <= shape.bottom_height(rs)) {
      src.fail("sparger.elevation", fmt::format("the sparger at {:.4g} m lies in the vessel bottom (the head surface "
                                                "is at {:.4g} m at its radius {:.4g} m)",
                                                c.sparger.elevation_m, shape.bottom_height(rs), rs));
    }
    if (c.sparger.diameter_m >= free_width) {
      src.fail("sparger.diameter", fmt::format("sparger diameter must be less than {:.4g} m (inside the baffles)", free_width));
    }
    if (c.sparger.elevation_m > c.impellers.front().elevation_m) {
      notes.push_back(fmt::format("{}: the sparger is above the lowest impeller; gas will bypass it",
                                  src.where("sparger.elevation")));
    }
  }
  if (c.vessel.baffles == 0) {
    // Name what is still missing: a case that gives the power number from its supplier's curve
    // was told to give it again.
    std::string missing;
    for (size_t i = 0; i < c.impellers.size(); ++i) {
      const auto& imp = c.impellers[i];
      if (!imp.power_number) missing += fmt::format("{}impeller.{}.power_number", missing.empty() ? "" : ", ", i);
      if (!imp.flow_number) missing += fmt::format("{}impeller.{}.flow_number", missing.empty() ? "" : ", ", i);
    }
    if (!missing.empty()) {
      notes.push_back("unbaffled vessel: the default power and flow numbers are for a baffled vessel; give " + missing +
                      " from your own data");
    }
  }
}

void leave_out_uncovered_impellers(const TomlSource& src, Case& c, std::vector<std::string>& notes) {
  const double h = c.vessel.liquid_height_m;
  const auto uncovered = [h](const Impeller& imp) { return imp.blades_from_m() >= h; };
  // Listed bottom to top without overlap (check_geometry), so the uncovered ones are the top ones.
  size_t covered = c.impellers.size();
  while (covered > 0 && uncovered(c.impellers[covered - 1])) --covered;
  if (covered == c.impellers.size()) return;
  if (covered == 0) {
    const auto& lowest = c.impellers.front();
    src.fail(src.has("vessel.liquid_height") ? "vessel.liquid_height" : "vessel.working_volume",
             fmt::format("every impeller is above the liquid surface at {:.4g} m: nothing stirs the broth; the "
                         "lowest needs more than {:.4g} m of liquid",
                         h, lowest.blades_to_m()));
  }
  for (size_t i = covered; i < c.impellers.size(); ++i) {
    notes.push_back(fmt::format("{}: impeller {} at {:.4g} m is above the liquid surface at {:.4g} m and is left out "
                                "(no power, flow or mixing from it). An impeller turning in the headspace can whip "
                                "foam and load the shaft unevenly: check with the agitator's maker that it may run "
                                "uncovered",
                                src.where(fmt::format("impeller.{}.elevation", i)), i, c.impellers[i].elevation_m, h));
  }
  c.impellers_above_liquid.assign(c.impellers.begin() + static_cast<long>(covered), c.impellers.end());
  c.impellers.resize(covered);
}

void note_ignored_keys(const TomlSource& src, const Case& c, std::vector<std::string>& notes) {
  const auto kind = c.broth.rheology.kind;
  const bool power = kind == RheologyKind::power_law || kind == RheologyKind::herschel_bulkley;
  const bool yield = kind == RheologyKind::herschel_bulkley || kind == RheologyKind::casson;
  for (const auto& [key, used] : {std::pair{"broth.consistency", power}, std::pair{"broth.flow_index", power},
                                  std::pair{"broth.yield_stress", yield}, std::pair{"broth.viscosity", !power}}) {
    if (!used && src.has(key)) notes.push_back(fmt::format("{} is ignored: it does not apply to a {} broth", key, to_string(kind)));
  }
  // Read and range-checked so that older case files still load, but no model uses it: a value
  // given must not look as if it had an effect.
  if (src.has("model.mixing_length_ratio")) {
    notes.push_back("model.mixing_length_ratio is ignored: the current exchange model does not use a mixing length "
                    "(model.exchange_constant sets the exchange between zones)");
  }
}

}  // namespace oxystrat::detail
