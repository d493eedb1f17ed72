// The generator of every random draw in oxystrat: seeded, portable (the same numbers with any
// compiler and standard library), cheap enough for the lifelines' hot loop.
#pragma once

#include <cstdint>

namespace oxystrat {

//! A 128-bit multiplicative congruential generator (Lehmer 1951) returning the upper 64 bits of
//! its state: x <- a x mod 2^128 with the 64-bit multiplier a = 0xda942042e4dd58b5 (listed as
//! spectrally good for this modulus by Steele & Vigna 2022, Softw. Pract. Exp. 52(2) [mem]). The
//! upper half of such a generator passes the BigCrush battery (L'Ecuyer & Simard 2007's TestU01)
//! [mem]. Two words of state and one 64x128-bit product per draw: the cheapest good generator we
//! know for a hot loop that draws once per move. The period is 2^126; (seed, stream) pairs start at
//! unrelated points of it (state filled by SplitMix64, Steele, Lea & Flood 2014), so cells do not
//! share stretches of their sequences in any run of practical length.
class CellRandom {
 public:
  CellRandom(std::uint64_t seed, std::uint64_t stream);
  //! The state as two words, for loops that keep several generators as plain values.
  struct Words {
    std::uint64_t lo, hi;
  };
  explicit CellRandom(Words w) : lo_(w.lo), hi_(w.hi) {}
  Words words() const { return {lo_, hi_}; }
  [[gnu::always_inline]] static std::uint64_t next(Words& s) {
    // (hi 2^64 + lo) a = (hi a + high(lo a)) 2^64 + low(lo a), mod 2^128.
    const auto p = static_cast<Wide>(s.lo) * kMultiplier;
    s.lo = static_cast<std::uint64_t>(p);
    s.hi = s.hi * kMultiplier + static_cast<std::uint64_t>(p >> 64);
    return s.hi;
  }
  std::uint64_t next() {
    Words s{lo_, hi_};
    const std::uint64_t r = next(s);
    lo_ = s.lo, hi_ = s.hi;
    return r;
  }
  //! Uniform on [0, 1) with 53 random bits.
  double uniform() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }

 private:
  __extension__ typedef unsigned __int128 Wide;
  static constexpr std::uint64_t kMultiplier = 0xda942042e4dd58b5ull;
  std::uint64_t lo_ = 1, hi_ = 0;  //!< the state, odd
};

//! SplitMix64 (Steele, Lea & Flood 2014): advances x and returns a well-mixed 64-bit value; used
//! to turn seeds into generator states.
std::uint64_t splitmix64(std::uint64_t& x);

}  // namespace oxystrat
