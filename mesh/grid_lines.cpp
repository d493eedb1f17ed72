#include "mesh/grid_lines.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

namespace oxystrat {

std::vector<double> aligned_lines(double lo, double hi, std::vector<double> required, int target) {
  const double tol = 1e-9 * (hi - lo);
  std::vector<double> knots{lo};
  std::sort(required.begin(), required.end());
  for (double x : required) {
    if (x > lo + tol && x < hi - tol && x > knots.back() + tol) knots.push_back(x);
  }
  knots.push_back(hi);
  const size_t segments = knots.size() - 1;
  const size_t total = std::max<size_t>(static_cast<size_t>(std::max(target, 1)), segments);

  // Largest-remainder apportionment of the cells beyond one per segment, by segment length.
  std::vector<size_t> count(segments, 1);
  const size_t spare = total - segments;
  std::vector<double> remainder(segments);
  size_t given = 0;
  for (size_t s = 0; s < segments; ++s) {
    const double share = spare * (knots[s + 1] - knots[s]) / (hi - lo);
    const auto whole = static_cast<size_t>(std::floor(share));
    count[s] += whole;
    given += whole;
    remainder[s] = share - whole;
  }
  std::vector<size_t> order(segments);
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](size_t a, size_t b) { return remainder[a] > remainder[b]; });
  for (size_t k = 0; given < spare; ++k, ++given) ++count[order[k % segments]];

  std::vector<double> lines{lo};
  for (size_t s = 0; s < segments; ++s) {
    for (size_t k = 1; k < count[s]; ++k) {
      lines.push_back(knots[s] + (knots[s + 1] - knots[s]) * static_cast<double>(k) / count[s]);
    }
    lines.push_back(knots[s + 1]);
  }
  return lines;
}

}  // namespace oxystrat
