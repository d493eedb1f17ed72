#include "solver/random/alias_table.hpp"

#include <algorithm>
#include <bit>
#include <cmath>
#include <stdexcept>

namespace oxystrat {

AliasTable::AliasTable(const std::vector<double>& weights, int cols) : columns(cols) {
  const int n = static_cast<int>(weights.size());
  if (n < 1 || cols < n || !std::has_single_bit(static_cast<unsigned>(cols)) || cols > 256) {
    throw std::invalid_argument("AliasTable: columns must be a power of two, at least the outcomes and at most 256");
  }
  double total = 0.0;
  for (double w : weights) {
    if (!(w >= 0.0)) throw std::invalid_argument("AliasTable: weights must be non-negative");
    total += w;
  }
  if (!(total > 0.0)) throw std::invalid_argument("AliasTable: weights must have a positive sum");
  std::vector<double> p(cols, 0.0);
  for (int i = 0; i < n; ++i) p[i] = weights[i] / total * cols;
  own.resize(cols);
  alias.resize(cols);
  std::vector<double> prob(cols, 1.0);
  std::vector<int> small, large;
  for (int i = 0; i < cols; ++i) (p[i] < 1.0 ? small : large).push_back(i);
  while (!small.empty() && !large.empty()) {
    const int s = small.back(), l = large.back();
    small.pop_back();
    prob[s] = p[s];
    alias[s] = l;
    p[l] = (p[l] + p[s]) - 1.0;
    if (p[l] < 1.0) large.pop_back(), small.push_back(l);
  }
  // Left over (only by round-off): their own outcome for sure.
  for (int i : small) prob[i] = 1.0, alias[i] = i;
  for (int i : large) prob[i] = 1.0, alias[i] = i;
  const int heaviest = static_cast<int>(std::max_element(weights.begin(), weights.end()) - weights.begin());
  threshold.resize(cols);
  for (int i = 0; i < cols; ++i) {
    own[i] = i;
    if (i >= n) own[i] = alias[i] < n ? alias[i] : heaviest, prob[i] = 0.0;  // padding: never its own (empty) outcome
    if (alias[i] >= n) alias[i] = heaviest;
    if (prob[i] >= 1.0 || alias[i] == own[i]) {
      alias[i] = own[i];
      threshold[i] = ~0ull;
    } else {
      threshold[i] = static_cast<std::uint64_t>(std::ldexp(prob[i], 64));  // prob < 1, so below 2^64
    }
  }
}

}  // namespace oxystrat
