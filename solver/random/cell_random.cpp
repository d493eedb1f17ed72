#include "solver/random/cell_random.hpp"

namespace oxystrat {

std::uint64_t splitmix64(std::uint64_t& x) {
  std::uint64_t z = (x += 0x9e3779b97f4a7c15ull);
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ull;
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebull;
  return z ^ (z >> 31);
}

CellRandom::CellRandom(std::uint64_t seed, std::uint64_t stream) {
  // Seed and stream go through SplitMix64 separately, so that (seed, stream) pairs that differ
  // in either give unrelated states.
  std::uint64_t x = seed;
  std::uint64_t y = splitmix64(x) ^ (stream * 0xd1b54a32d192ed03ull);
  hi_ = splitmix64(y);
  lo_ = splitmix64(y) | 1u;  // odd: the multiplicative group's full period
}

}  // namespace oxystrat
