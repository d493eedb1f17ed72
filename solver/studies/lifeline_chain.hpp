// Inside the lifelines (solver/studies/lifelines.hpp): the zone network as the Markov chain the
// cells draw from: per zone its mean dwell, an alias table over its outflows, and its key (regime
// and field sides). The hot loop lays it out anew, one record per zone. Not a public interface.
#pragma once

#include <cstdint>
#include <vector>

#include "mesh/zone_network.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/studies/lifelines.hpp"

namespace oxystrat::lifelines_detail {

// A move uses one 64-bit draw r: bits 21-63 go to the ziggurat (the dwell), bits 13 .. 13+b-1
// pick one of the 2^b alias columns of the zone, and bits 0-12 are the top bits of the column's
// 64-bit coin. Only when they equal the top bits of the column's threshold (probability 2^-13)
// does the comparison need the coin's other bits: a further draw. So the pick is exact to 2^-64,
// like a comparison of two 64-bit uniforms.
// Zones: [0] the alias, [1] the column's own outcome, each with kChangeBit set when entering it
// changes the key (so the common move reads no key). The full threshold of slot s is
// Chain::threshold[s].
constexpr std::uint32_t kChangeBit = 1u << 31;
constexpr int kCoinBits = 13;
struct Slot {
  std::uint32_t to[2];
};

struct Chain {
  int zones = 0;
  int log_columns = 0;
  std::vector<Slot> slots;           // zones << log_columns
  std::vector<std::uint64_t> threshold;
  std::vector<double> mean_dwell;    // V / outflow [s]; +inf without outflow
  std::vector<std::uint32_t> key;    // regime | (outside mask << 8)
  std::vector<double> start_cdf;     // V_i / V cumulative
};

Chain build_chain(const ZoneNetwork& net, const Hydrodynamics& h, const std::vector<LifelineField>& fields,
                  const LifelineRegimes& regimes);


}  // namespace oxystrat::lifelines_detail
