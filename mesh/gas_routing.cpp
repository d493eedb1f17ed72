#include "gas_routing.hpp"

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
  // Swept zones of non-flooded impellers spread their gas uniformly (by area) over their row out
  // to the impeller's reach; the swept columns' part keeps rising from the swept zones themselves.
  for (int k = 0; k < nz; ++k) {
    const int m = net.region[k].discharge;
    if (m < 0) continue;
    const auto regime = h.impellers[m].regime;
    if (regime == GasRegime::flooded || regime == GasRegime::ungassed) continue;
    // Loaded and completely dispersed both carry the gas to the wall above the impeller; the
    // recirculation below it in complete dispersion is not routed (a conservative choice).
    const double reach = net.shape.radius();
    std::vector<GasLink> links{{g.out[k].front().to, 0.0}};
    double total = 0.0;
    for (int col = 0; col < net.columns(); ++col) {
      const int z = net.zone_at(col, net.row[k]);
      if (z < 0 || net.r0[z] >= reach - 1e-12) continue;
      total += g.area[z];
      if (net.region[z].discharge == m) {
        links.front().share += g.area[z];
      } else {
        links.push_back({z, g.area[z]});
      }
    }
    for (auto& l : links) l.share /= total;
    g.out[k] = links;
  }
  // Order: rows from the bottom; within a row, swept zones (which feed their row) first.
  g.order.resize(nz);
  std::iota(g.order.begin(), g.order.end(), 0);
  std::stable_sort(g.order.begin(), g.order.end(), [&](int a, int b) {
    if (net.row[a] != net.row[b]) return net.row[a] < net.row[b];
    return (net.region[a].discharge >= 0) > (net.region[b].discharge >= 0);
  });
  return g;
}

}  // namespace oxystrat
