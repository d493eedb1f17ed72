// Constant-time draws from a discrete distribution: the next zone of a lifeline.
#pragma once

#include <cstdint>
#include <vector>

namespace oxystrat {

//! Walker's alias method (Walker 1977, ACM TOMS 3(3); the robust set-up of Vose 1991, IEEE TSE
//! 17(9)) over `weights.size()` outcomes padded to `columns` (a power of two, >= size, <= 256):
//! a draw picks column c uniformly and a uniform 64-bit coin below `threshold[c]` keeps the
//! column's own outcome, else its alias. A column whose own outcome is certain has alias == own.
struct AliasTable {
  int columns = 1;
  std::vector<std::uint64_t> threshold;  //!< per column, probability of the own outcome in units of 2^-64
  std::vector<int> own, alias;           //!< per column: outcome index
  AliasTable(const std::vector<double>& weights, int columns);
  int draw(std::uint64_t column_draw, std::uint64_t coin) const {
    const int c = static_cast<int>(column_draw & static_cast<std::uint64_t>(columns - 1));
    return coin < threshold[c] ? own[c] : alias[c];
  }
};

}  // namespace oxystrat
