// Exact unit exponential variates, fast: the dwell times of the lifelines.
#pragma once

#include <array>
#include <cstdint>

#include "solver/random/cell_random.hpp"

namespace oxystrat {

//! Unit exponential variates by the ziggurat method of Marsaglia & Tsang (2000, J. Stat. Softw.
//! 5(8)) with 32-bit abscissae, as published, but 2048 layers instead of 256 (their set-up, with
//! the base layer's edge r found for that count: base_edge), so that 99.66 % of the draws take the
//! fast path instead of 97.8 %. The layer comes from bits 53-63 and the abscissa from bits 21-52
//! of a draw (disjoint bits, so they are independent; bits 0-20 stay free for the caller). The
//! fast path is one compare and one multiply; the rest test the wedge (first against the chord
//! and the tangents of the convex exp(-x), so that exp is rarely evaluated) or sample the tail
//! exactly, with further draws.
class ExponentialZiggurat {
 public:
  static constexpr int kLayerBits = 11;
  static constexpr int kLayers = 1 << kLayerBits;
  ExponentialZiggurat();
  //! The right edge r of the base layer for `layers` layers of equal area under exp(-x) (for 256:
  //! Marsaglia & Tsang's r = 7.69711747013104972).
  static double base_edge(int layers);
  double operator()(CellRandom& rng) const { return from_draw(rng.next(), rng); }
  double from_draw(std::uint64_t r, CellRandom& rng) const {
    const unsigned i = layer(r);
    const std::uint32_t j = abscissa(r);
    if (j < k_[i]) [[likely]] return static_cast<double>(j) * w_[i];
    return slow(rng, i, j);
  }
  //! The same for a generator held as words: the rare slow path takes and returns them by value.
  [[gnu::always_inline]] double from_draw(std::uint64_t r, CellRandom::Words& s) const {
    const unsigned i = layer(r);
    const std::uint32_t j = abscissa(r);
    if (j < k_[i]) [[likely]] return static_cast<double>(j) * w_[i];
    const Slow d = slow_words(s, i, j);
    s = d.words;
    return d.x;
  }

 private:
  static unsigned layer(std::uint64_t r) { return static_cast<unsigned>(r >> (64 - kLayerBits)); }
  static std::uint32_t abscissa(std::uint64_t r) { return static_cast<std::uint32_t>(r >> (32 - kLayerBits)); }
  double slow(CellRandom& rng, unsigned i, std::uint32_t j) const;
  struct Slow {
    double x;
    CellRandom::Words words;
  };
  [[gnu::noinline]] Slow slow_words(CellRandom::Words s, unsigned i, std::uint32_t j) const;
  double r_;  //!< right edge of the base layer; the tail lies beyond it
  // The fast path's tables first (they are read on every draw).
  std::array<std::uint32_t, kLayers> k_{};
  std::array<double, kLayers> w_{}, f_{};
  // Wedge squeeze of layer i (exp(-x) is convex): the right edge x_i, 1 / (x_i - x_{i-1}), and the
  // slopes of the tangents at both ends relative to the chord.
  std::array<double, kLayers> x_{}, inv_width_{}, tangent_right_{}, tangent_left_{};
};

}  // namespace oxystrat
