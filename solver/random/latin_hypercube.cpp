#include "solver/random/latin_hypercube.hpp"

#include <cstddef>
#include <numeric>
#include <utility>

#include "solver/random/cell_random.hpp"

namespace oxystrat {
namespace {

// Uniform integer in [0, bound) without modulo bias (Lemire 2019, ACM TOMACS 29(1), from memory).
std::uint64_t below(CellRandom& rng, std::uint64_t bound) {
  __extension__ typedef unsigned __int128 Wide;
  Wide m = static_cast<Wide>(rng.next()) * bound;
  auto low = static_cast<std::uint64_t>(m);
  if (low < bound) {
    const std::uint64_t threshold = -bound % bound;
    while (low < threshold) {
      m = static_cast<Wide>(rng.next()) * bound;
      low = static_cast<std::uint64_t>(m);
    }
  }
  return static_cast<std::uint64_t>(m >> 64);
}

}  // namespace

std::vector<std::vector<double>> latin_hypercube_unit(int n, int dimensions, std::uint64_t seed) {
  std::vector<std::vector<double>> points(static_cast<std::size_t>(n), std::vector<double>(static_cast<std::size_t>(dimensions)));
  CellRandom rng(seed, 0x6c68735f73747261ull);  // a stream of its own
  std::vector<int> strata(static_cast<std::size_t>(n));
  for (int d = 0; d < dimensions; ++d) {
    std::iota(strata.begin(), strata.end(), 0);
    for (int i = n - 1; i > 0; --i) std::swap(strata[i], strata[below(rng, static_cast<std::uint64_t>(i) + 1)]);
    for (int i = 0; i < n; ++i) points[i][d] = (strata[i] + rng.uniform()) / n;
  }
  return points;
}

}  // namespace oxystrat
