#include "solver/flow/gas_routing.hpp"

#include <algorithm>
#include <numbers>
#include <numeric>

namespace oxystrat {

GasRouting route_gas(const Case& /*c*/, const ZoneNetwork& net, const Hydrodynamics& h) {
  const int nz = net.size();
  GasRouting g;
  g.out.assign(nz, {});
  g.area.resize(nz);
  const double pi = std::numbers::pi;
  for (int k = 0; k < nz; ++k) {
    g.area[k] = pi * (net.r1[k] * net.r1[k] - net.r0[k] * net.r0[k]);
    const int above = net.row[k] + 1 < net.rows() ? net.zone_at(net.column[k], net.row[k] + 1) : -1;
    g.out[k].push_back({above, 1.0});
  }
  // A non-flooded impeller (loaded or completely dispersed) draws the gas rising into its lowest
  // blade row and disperses it to the wall: every zone of that row sends its gas to the row above,
  // spread uniformly by area. The recirculation below a completely dispersing impeller is not
  // routed (a conservative choice for the bottom region).
  std::vector<int> lowest_row(h.impellers.size(), net.rows());
  for (int k = 0; k < nz; ++k) {
    const int m = net.region[k].discharge;
    if (m >= 0) lowest_row[m] = std::min(lowest_row[m], net.row[k]);
  }
  for (size_t m = 0; m < h.impellers.size(); ++m) {
    const auto regime = h.impellers[m].regime;
    const int row = lowest_row[m];
    if (regime == GasRegime::flooded || regime == GasRegime::ungassed || row + 1 >= net.rows()) continue;
    std::vector<GasLink> spread;
    double total = 0.0;
    for (int col = 0; col < net.columns(); ++col) {
      const int above = net.zone_at(col, row + 1);
      if (above < 0) continue;
      spread.push_back({above, g.area[above]});
      total += g.area[above];
    }
    for (auto& l : spread) l.share /= total;
    for (int col = 0; col < net.columns(); ++col) {
      const int k = net.zone_at(col, row);
      if (k >= 0) g.out[k] = spread;
    }
  }
  // Order: rows from the bottom (gas only moves up).
  g.order.resize(nz);
  std::iota(g.order.begin(), g.order.end(), 0);
  std::stable_sort(g.order.begin(), g.order.end(), [&](int a, int b) { return net.row[a] < net.row[b]; });
  return g;
}

}  // namespace oxystrat
