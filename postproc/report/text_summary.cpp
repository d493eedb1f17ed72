#include "postproc/report/text_summary.hpp"

#include <fmt/format.h>

#include "input/units.hpp"
#include "physics/constants.hpp"

namespace oxystrat {

std::string geometry_summary(const LoadedCase& loaded, const ZoneNetwork& net) {
  using units::Dimension;
  const Case& c = loaded.data;
  const auto& v = c.vessel;
  std::string s;
  s += fmt::format("{}\n  case file {}\n", c.title, loaded.file_name);
  s += fmt::format("Vessel  T = {:.4g} m, H = {:.4g} m, H/T = {:.3g}, V = {:.4g} m3 ({} bottom, head depth {:.3g} m)\n",
                   v.diameter_m, v.liquid_height_m, v.liquid_height_m / v.diameter_m, v.working_volume_m3,
                   to_string(v.bottom), net.shape.head_depth());
  s += fmt::format("        {} baffles x {:.3g} m, head pressure {}, bottom pressure {}, {}\n", v.baffles,
                   v.baffle_width_m, units::format(Dimension::pressure, v.head_pressure_pa),
                   units::format(Dimension::pressure, v.head_pressure_pa + c.broth.density_kg_m3 * kG * v.liquid_height_m),
                   units::format(Dimension::temperature, v.temperature_k));
  if (v.pressure_rating_pa > 0.0) {
    s += fmt::format("        pressure rating {}\n", units::format(Dimension::pressure, v.pressure_rating_pa));
  }
  s += "Impellers (bottom to top)\n";
  s += fmt::format("  {:>2}  {:<19} {:>7} {:>6} {:>10} {:>9} {:>8}\n", "#", "type", "D [m]", "D/T", "elev. [m]",
                   "C/T [-]", "gap [m]");
  for (size_t i = 0; i < c.impellers.size(); ++i) {
    const auto& imp = c.impellers[i];
    const std::string gap =
        i + 1 < c.impellers.size() ? fmt::format("{:.3g}", c.impellers[i + 1].elevation_m - imp.elevation_m) : "-";
    s += fmt::format("  {:>2}  {:<19} {:>7.3g} {:>6.3f} {:>10.3g} {:>9.3f} {:>8}\n", i, to_string(imp.type),
                     imp.diameter_m, imp.diameter_m / v.diameter_m, imp.elevation_m, imp.elevation_m / v.diameter_m, gap);
  }
  if (c.has_sparger) {
    s += fmt::format("Sparger {} of diameter {:.3g} m at {:.3g} m\n", to_string(c.sparger.type), c.sparger.diameter_m,
                     c.sparger.elevation_m);
  } else {
    s += "Sparger none (no gas)\n";
  }
  s += fmt::format("Grid    {} x {} (radial x axial; asked {} x {}), {} zones, {} faces, zone volumes sum to {:.6g} m3\n",
                   net.columns(), net.rows(), c.grid.radial, c.grid.axial, net.size(), net.faces.size(),
                   net.total_volume());
  return s;
}

}  // namespace oxystrat
