#include "solver/studies/lifeline_chain.hpp"

#include <algorithm>
#include <bit>
#include <limits>
#include <stdexcept>
#include <utility>

#include "solver/random/alias_table.hpp"
#include "solver/random/exponential_ziggurat.hpp"

namespace oxystrat::lifelines_detail {

Chain build_chain(const ZoneNetwork& net, const Hydrodynamics& h, const std::vector<LifelineField>& fields,
                  const LifelineRegimes& regimes) {
  const int n = net.size();
  if (static_cast<std::uint64_t>(n) >= kChangeBit) throw std::invalid_argument("lifelines: too many zones");
  std::vector<std::vector<std::pair<int, double>>> out(n);
  for (size_t f = 0; f < net.faces.size(); ++f) {
    const int a = net.faces[f].zone_a, b = net.faces[f].zone_b;
    const double q = h.face_flow[f], e = h.face_exchange[f];
    const double ab = (q > 0.0 ? q : 0.0) + e, ba = (q < 0.0 ? -q : 0.0) + e;
    if (ab > 0.0) out[a].push_back({b, ab});
    if (ba > 0.0) out[b].push_back({a, ba});
  }
  size_t degree = 1;
  for (const auto& o : out) degree = std::max(degree, o.size());
  static_assert(kCoinBits + 8 <= 64 - ExponentialZiggurat::kLayerBits - 32, "coin, column and ziggurat bits overlap");
  if (degree > 256) throw std::invalid_argument("lifelines: a zone with more than 256 neighbours");
  Chain c;
  c.zones = n;
  c.key.assign(n, 0u);
  if (!regimes.names.empty()) {
    if (regimes.names.size() > 256 || static_cast<int>(regimes.of_zone.size()) != n) {
      throw std::invalid_argument("lifelines: regimes need one label per zone, at most 256 labels");
    }
    for (int k = 0; k < n; ++k) c.key[k] = static_cast<std::uint32_t>(regimes.of_zone[k]);
  }
  if (fields.size() > 24) throw std::invalid_argument("lifelines: at most 24 fields");
  for (size_t f = 0; f < fields.size(); ++f) {
    if (static_cast<int>(fields[f].value.size()) != n) throw std::invalid_argument("lifelines: field '" + fields[f].name + "' needs one value per zone");
    for (int k = 0; k < n; ++k) {
      const double v = fields[f].value[k];
      const bool outside = fields[f].below ? v < fields[f].threshold : v > fields[f].threshold;
      if (outside) c.key[k] |= 1u << (8 + f);
    }
  }
  c.log_columns = std::bit_width(std::bit_ceil(degree)) - 1;
  const int columns = 1 << c.log_columns;
  c.slots.resize(static_cast<size_t>(n) << c.log_columns);
  c.threshold.resize(c.slots.size());
  c.mean_dwell.resize(n);
  for (int k = 0; k < n; ++k) {
    const size_t row = static_cast<size_t>(k) << c.log_columns;
    std::vector<double> w;
    double total = 0.0;
    for (const auto& [j, flow] : out[k]) w.push_back(flow), total += flow;
    if (out[k].empty()) {
      c.mean_dwell[k] = std::numeric_limits<double>::infinity();  // the cell stays to the end
      w = {1.0}, out[k] = {{k, 1.0}};
    } else {
      c.mean_dwell[k] = net.volume[k] / total;
    }
    auto target = [&](int outcome) {
      const int z = out[k][outcome].first;
      return static_cast<std::uint32_t>(z) | (c.key[z] != c.key[k] ? kChangeBit : 0u);
    };
    const AliasTable t(w, columns);
    for (int j = 0; j < columns; ++j) {
      c.threshold[row + j] = t.threshold[j];
      c.slots[row + j] = {{target(t.alias[j]), target(t.own[j])}};
    }
  }
  c.start_cdf.resize(n);
  double acc = 0.0;
  for (int k = 0; k < n; ++k) c.start_cdf[k] = (acc += net.volume[k]);
  for (auto& v : c.start_cdf) v /= acc;
  return c;
}

}  // namespace oxystrat::lifelines_detail
