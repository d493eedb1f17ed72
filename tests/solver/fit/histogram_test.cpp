// Logarithmic histograms: each value lands in the bin its edges give, and every value counts.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "solver/fit/histogram.hpp"
#include "solver/random/cell_random.hpp"

namespace oxystrat {
namespace {

TEST(Histogram, LogHistogramPutsEachValueInTheBinItsEdgesGive) {
  // Values over six decades (bins wide enough for the guess from the bits) and over 1 % (bins too
  // narrow for it: the logarithm guesses), with values placed exactly on edges; each count must
  // equal a count by comparison with the edges the histogram reports (exact: no tolerance).
  for (const double spread : {1e6, 1.01}) {
    CellRandom rng(11, 2);
    std::vector<double> v;
    for (int i = 0; i < 200000; ++i) v.push_back(std::pow(spread, rng.uniform()));
    const auto first = log_histogram(v, 20);
    for (double e : first.edges) v.push_back(e);  // the edges of the same range (min and max unchanged)
    const auto h = log_histogram(v, 20, 2);
    ASSERT_EQ(h.edges, first.edges);
    std::vector<double> expected(20, 0.0);
    for (double x : v) {
      int b = 0;
      while (b + 1 < 20 && x >= h.edges[b + 1]) ++b;
      expected[b] += 1.0;
    }
    EXPECT_EQ(h.counts, expected) << "spread " << spread;
  }
}

TEST(Histogram, LogHistogramCountsEveryValue) {
  const auto h = log_histogram({0.1, 1.0, 10.0, 10.0}, 4);
  ASSERT_EQ(h.counts.size(), 4u);
  EXPECT_DOUBLE_EQ(h.counts[0] + h.counts[1] + h.counts[2] + h.counts[3], 4.0);
  EXPECT_NEAR(h.edges.front(), 0.1, 1e-12);
  EXPECT_NEAR(h.edges.back(), 10.0, 1e-9);
}

}  // namespace
}  // namespace oxystrat
