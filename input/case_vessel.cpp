#include "input/case_sections.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <numbers>

#include "physics/impeller_types.hpp"
#include "physics/vessel_shape.hpp"

namespace oxystrat::detail {

void read_vessel(TomlSource& src, Case& c) {
  src.allow_table("vessel");
  if (!src.has("vessel")) src.missing("vessel", "the [vessel] table");
  auto& v = c.vessel;
  v.diameter_m = src.require_quantity("vessel.diameter", Dimension::length, {0.05, 20.0}, "3.2 m");
  const auto bottom = src.choice("vessel.bottom", {"flat", "ellipsoidal", "hemispherical"}).value_or("ellipsoidal");
  v.bottom = bottom == "flat" ? BottomShape::flat
             : bottom == "hemispherical" ? BottomShape::hemispherical
                                         : BottomShape::ellipsoidal;
  const VesselShape shape(v.diameter_m, v.bottom);
  const auto height = src.quantity("vessel.liquid_height", Dimension::length, {0.0, 120.0, true});
  const auto volume = src.quantity("vessel.working_volume", Dimension::volume, {0.0, 5000.0, true});
  if (height && volume) {
    src.fail("vessel.working_volume", "give either liquid_height or working_volume, not both");
  }
  if (!height && !volume) {
    src.missing("vessel.liquid_height", "or vessel.working_volume; e.g. liquid_height = \"8 m\"");
  }
  v.liquid_height_m = height ? *height : shape.height_for_volume(*volume);
  v.working_volume_m3 = shape.volume_below(v.liquid_height_m);
  const double ht = v.liquid_height_m / v.diameter_m;
  if (ht < 0.5 || ht > 6.0) {
    src.fail(height ? "vessel.liquid_height" : "vessel.working_volume",
             fmt::format("liquid height / diameter H/T = {:.3g} (H = {:.4g} m, T = {:.4g} m) is outside the "
                         "supported 0.5 to 6",
                         ht, v.liquid_height_m, v.diameter_m));
  }
  v.baffles = src.integer("vessel.baffles", 0, 8).value_or(4);
  v.baffle_width_m = src.quantity("vessel.baffle_width", Dimension::length, {0.0, 0.2 * v.diameter_m})
                         .value_or(v.baffles > 0 ? 0.1 * v.diameter_m : 0.0);
  if (v.baffles > 0 && v.baffle_width_m <= 0.0) {
    src.fail("vessel.baffle_width", "must be more than 0 m when baffles > 0");
  }
  v.head_pressure_pa = src.quantity_or("vessel.head_pressure", Dimension::pressure, {0.2e5, 20e5},
                                       units::standard_atmosphere_pa);
  v.pressure_rating_pa = src.quantity_or("vessel.pressure_rating", Dimension::pressure, {1e5, 200e5}, 0.0);
  v.temperature_k = src.quantity_or("vessel.temperature", Dimension::temperature, {273.15, 353.15}, 310.15);
  if (const auto side = src.quantity("vessel.straight_side", Dimension::length, {0.0, 150.0, true})) {
    v.shell_top_m = shape.head_depth() + *side;
    if (v.shell_top_m <= v.liquid_height_m) {
      src.fail("vessel.straight_side", fmt::format("the shell ends at {:.4g} m, at or below the liquid surface at "
                                                   "{:.4g} m; give the length of the cylindrical shell",
                                                   v.shell_top_m, v.liquid_height_m));
    }
  }
}

void read_impellers(TomlSource& src, Case& c) {
  src.allow_table("impeller");
  const size_t n = src.array_size("impeller");
  if (n == 0) src.missing("impeller", "at least one [[impeller]] table, listed bottom to top");
  if (n > 12) src.fail("impeller", fmt::format("{} impellers; at most 12 are supported", n));
  const double t = c.vessel.diameter_m;
  for (size_t i = 0; i < n; ++i) {
    const std::string p = fmt::format("impeller.{}.", i);
    Impeller imp;
    std::vector<std::string> names;
    for (const auto& d : impeller_types()) names.emplace_back(d.name);
    const auto type = src.choice(p + "type", names);
    if (!type) src.missing(p + "type", impeller_type_names());
    impeller_type_from_name(*type, imp.type);
    const auto& def = impeller_data(imp.type);
    imp.diameter_m = src.require_quantity(p + "diameter", Dimension::length, {0.0, t, true}, "1.1 m");
    // Up to the tallest liquid read_vessel accepts (H/T = 6) or the shell's top: check_geometry
    // says what is wrong with an impeller above the liquid or the shell.
    const double top = std::max(6.0 * t, c.vessel.shell_top_m);
    imp.elevation_m = src.require_quantity(p + "elevation", Dimension::length, {0.0, top, true}, "1.2 m");
    imp.blades = src.integer(p + "blades", 2, 12).value_or(def.blades);
    imp.blade_height_m = src.quantity(p + "blade_height", Dimension::length, {0.0, imp.diameter_m, true})
                             .value_or(def.band_height_ratio * imp.diameter_m);
    imp.power_number = src.number(p + "power_number", {0.05, 20.0});
    imp.flow_number = src.number(p + "flow_number", {0.05, 3.0});
    imp.gassed_power_factor = src.number(p + "gassed_power_factor", {0.05, 1.0});
    imp.circulation_factor = src.number(p + "circulation_factor", {1.0, 6.0});
    c.impellers.push_back(imp);
  }
}

void read_sparger(TomlSource& src, Case& c) {
  src.allow_table("sparger");
  c.has_sparger = src.has("sparger");
  if (!c.has_sparger) return;
  const auto type = src.choice("sparger.type", {"ring", "pipe", "porous"});
  if (!type) src.missing("sparger.type", "ring | pipe | porous");
  auto& s = c.sparger;
  s.type = *type == "ring" ? SpargerType::ring : *type == "pipe" ? SpargerType::pipe : SpargerType::porous;
  s.elevation_m = src.require_quantity("sparger.elevation", Dimension::length, {0.0, c.vessel.liquid_height_m, true},
                                       "0.6 m");
  s.diameter_m = src.require_quantity("sparger.diameter", Dimension::length, {0.0, c.vessel.diameter_m, true}, "0.9 m");
  if (s.type == SpargerType::porous) {
    s.pore_diameter_m = src.require_quantity("sparger.pore_diameter", Dimension::length, {1e-7, 1e-3, false},
                                             "20 um");
  } else {
    s.hole_diameter_m = src.quantity("sparger.hole_diameter", Dimension::length, {1e-4, 0.1, false}).value_or(0.0);
    // Without a count: holes about ten hole diameters apart round a ring, one open pipe end.
    const int spaced = s.hole_diameter_m > 0.0 && s.type == SpargerType::ring
                           ? static_cast<int>(std::numbers::pi * s.diameter_m / (10.0 * s.hole_diameter_m))
                           : 1;
    s.holes = src.integer("sparger.holes", 1, 100000).value_or(std::max(1, spaced));
  }
}

}  // namespace oxystrat::detail
