#include "postproc/io/network_output.hpp"

namespace oxystrat {

void write_case_h5(H5Writer& h5, const LoadedCase& loaded) {
  h5.write("/case/text", loaded.effective_text);
  h5.write("/case/source_text", loaded.source_text);
  h5.write("/case/overrides", loaded.overrides);
  h5.write("/case/notes", loaded.notes);
  h5.attribute("/case/text", "file", loaded.file_name);
  h5.attribute("/case/text", "title", loaded.data.title);
}

void write_network_h5(H5Writer& h5, const ZoneNetwork& net) {
  const auto n = static_cast<size_t>(net.size());
  std::vector<int> domain(n), discharge(n), sparger(n);
  for (size_t k = 0; k < n; ++k) {
    domain[k] = net.region[k].domain;
    discharge[k] = net.region[k].discharge;
    sparger[k] = net.region[k].sparger ? 1 : 0;
  }
  h5.write("/zones/volume", net.volume, "m3");
  h5.write("/zones/r", net.r, "m");
  h5.write("/zones/z", net.z, "m");
  h5.write("/zones/r_inner", net.r0, "m");
  h5.write("/zones/r_outer", net.r1, "m");
  h5.write("/zones/z_bottom", net.z0, "m");
  h5.write("/zones/z_top", net.z1, "m");
  h5.write("/zones/depth", net.depth, "m");
  h5.write("/zones/pressure", net.pressure, "Pa");
  h5.write("/zones/region", domain, "1");
  h5.attribute("/zones/region", "meaning", "0-based index of the impeller whose domain holds the zone");
  h5.write("/zones/discharge", discharge, "1");
  h5.attribute("/zones/discharge", "meaning", "index of the impeller whose swept volume holds the zone, -1 if none");
  h5.write("/zones/sparger", sparger, "1");
  h5.attribute("/zones/sparger", "meaning", "1 where sparged gas enters the zone");
  h5.write("/zones/sparger_share", net.sparger_share, "1");
  h5.write("/zones/column", net.column, "1");
  h5.write("/zones/row", net.row, "1");
  h5.write("/grid/r_lines", net.r_lines, "m");
  h5.write("/grid/z_lines", net.z_lines, "m");

  std::vector<int> a, b, orient;
  std::vector<double> area, spacing;
  for (const auto& f : net.faces) {
    a.push_back(f.zone_a);
    b.push_back(f.zone_b);
    orient.push_back(f.orientation == FaceOrientation::radial ? 0 : 1);
    area.push_back(f.area);
    spacing.push_back(f.spacing);
  }
  h5.write("/faces/zone_a", a, "1");
  h5.write("/faces/zone_b", b, "1");
  h5.write("/faces/area", area, "m2");
  h5.write("/faces/orientation", orient, "1");
  h5.attribute("/faces/orientation", "meaning", "0: radial face (cylinder r = const, zone_a inside), "
                                                "1: axial face (disc z = const, zone_a below)");
  h5.write("/faces/spacing", spacing, "m");
}

std::vector<CellArray> network_cell_arrays(const ZoneNetwork& net) {
  const auto n = static_cast<size_t>(net.size());
  std::vector<double> id(n), domain(n), discharge(n), sparger(n);
  for (size_t k = 0; k < n; ++k) {
    id[k] = static_cast<double>(k);
    domain[k] = net.region[k].domain;
    discharge[k] = net.region[k].discharge;
    sparger[k] = net.region[k].sparger ? 1.0 : 0.0;
  }
  return {{"zone", id, {}},           {"volume", net.volume, {}},     {"depth", net.depth, {}},
          {"pressure", net.pressure, {}}, {"region", domain, {}},     {"discharge", discharge, {}},
          {"sparger", sparger, {}}};
}

}  // namespace oxystrat
