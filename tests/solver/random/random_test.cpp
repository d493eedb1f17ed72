// The random room: the cell generator is seeded per stream, the exponential ziggurat and the
// alias table reproduce their distributions, Latin hypercubes fill every stratum once.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <vector>

#include "solver/random/alias_table.hpp"
#include "solver/random/cell_random.hpp"
#include "solver/random/exponential_ziggurat.hpp"
#include "solver/random/latin_hypercube.hpp"

namespace oxystrat {
namespace {

TEST(Random, ZigguratExponentialHasTheExponentialDistribution) {
  const ExponentialZiggurat zig;
  CellRandom rng(7, 3);
  const int n = 2'000'000;
  const std::vector<double> x{0.05, 0.5, 1.0, 2.0, 4.0, 7.5, 9.0};  // 7.5 / 9: either side of the tail start
  std::vector<double> above(x.size(), 0.0);
  double sum = 0.0, sum2 = 0.0;
  for (int i = 0; i < n; ++i) {
    const double e = zig(rng);
    sum += e, sum2 += e * e;
    for (size_t k = 0; k < x.size(); ++k) above[k] += e > x[k] ? 1.0 : 0.0;
  }
  // Mean 1, second moment 2; standard errors 1/sqrt(n) = 7e-4 and sqrt(20/n) = 3e-3: 5 sigma.
  EXPECT_NEAR(sum / n, 1.0, 3.5e-3);
  EXPECT_NEAR(sum2 / n, 2.0, 1.6e-2);
  for (size_t k = 0; k < x.size(); ++k) {
    const double p = std::exp(-x[k]);
    const double sigma = std::sqrt(p * (1 - p) / n);
    EXPECT_NEAR(above[k] / n, p, 5 * sigma + 1e-7) << "P(X > " << x[k] << ")";  // binomial, 5 sigma
  }
}

TEST(Random, ZigguratSetUpGivesMarsagliaAndTsangsBaseEdge) {
  // Marsaglia & Tsang (2000, J. Stat. Softw. 5(8)), exponential ziggurat with 256 layers: r =
  // 7.69711747013104972 and v = 3.949659822581572e-3, as printed in their code. The bisection
  // stops at 1e-15 relative; the published digits and the recursion's round-off (255 steps of a
  // logarithm) leave ~1e-12.
  const double r = ExponentialZiggurat::base_edge(256);
  EXPECT_NEAR(r, 7.69711747013104972, 1e-11);
  EXPECT_NEAR((r + 1.0) * std::exp(-r), 3.949659822581572e-3, 1e-14);
  // More layers, narrower ones: the base edge moves out (the tail holds less).
  EXPECT_GT(ExponentialZiggurat::base_edge(ExponentialZiggurat::kLayers), r);
}

TEST(Random, AliasTableDrawsInProportionToTheWeights) {
  const std::vector<double> w{0.1, 0.5, 0.0, 2.4, 1.0};
  const AliasTable t(w, 8);
  CellRandom rng(11, 0);
  const int n = 1'000'000;
  std::vector<double> count(w.size(), 0.0);
  for (int i = 0; i < n; ++i) count[t.draw(rng.next(), rng.next())] += 1.0;
  const double total = 4.0;
  EXPECT_EQ(count[2], 0.0);  // a zero weight is never drawn
  for (size_t k = 0; k < w.size(); ++k) {
    const double p = w[k] / total;
    EXPECT_NEAR(count[k] / n, p, 5 * std::sqrt(p * (1 - p) / n) + 1e-12) << "outcome " << k;  // binomial, 5 sigma
  }
  // The exact probabilities: per column own share plus what the aliases bring.
  std::vector<double> exact(w.size(), 0.0);
  for (int c = 0; c < t.columns; ++c) {
    const double own = t.alias[c] == t.own[c] ? 1.0 : std::ldexp(static_cast<double>(t.threshold[c]), -64);
    exact[t.own[c]] += own / t.columns;
    exact[t.alias[c]] += (1.0 - own) / t.columns;
  }
  for (size_t k = 0; k < w.size(); ++k) EXPECT_NEAR(exact[k], w[k] / total, 1e-15) << "outcome " << k;  // round-off
  EXPECT_THROW(AliasTable({1.0, 2.0, 3.0}, 2), std::invalid_argument);
  EXPECT_THROW(AliasTable({0.0, 0.0}, 2), std::invalid_argument);
}

TEST(Random, CellGeneratorIsSeededPerStream) {
  CellRandom a(5, 9), b(5, 9), c(5, 10), d(6, 9);
  bool differ_c = false, differ_d = false;
  double sum = 0.0;
  for (int i = 0; i < 100000; ++i) {
    const auto x = a.next();
    EXPECT_EQ(x, b.next());
    differ_c |= x != c.next();
    differ_d |= x != d.next();
    sum += std::ldexp(static_cast<double>(x >> 11), -53);
  }
  EXPECT_TRUE(differ_c);
  EXPECT_TRUE(differ_d);
  EXPECT_NEAR(sum / 100000, 0.5, 5 * std::sqrt(1.0 / 12 / 100000));  // uniform mean, 5 sigma
}

TEST(Random, LatinHypercubePutsOnePointInEachStratumOfEachDimension) {
  const int n = 37, dims = 5;
  const auto p = latin_hypercube_unit(n, dims, 42);
  ASSERT_EQ(p.size(), static_cast<size_t>(n));
  for (int d = 0; d < dims; ++d) {
    std::vector<int> seen(n, 0);
    for (int i = 0; i < n; ++i) {
      ASSERT_GE(p[i][d], 0.0);
      ASSERT_LT(p[i][d], 1.0);
      ++seen[static_cast<int>(p[i][d] * n)];
    }
    EXPECT_TRUE(std::all_of(seen.begin(), seen.end(), [](int c) { return c == 1; })) << d;
  }
  EXPECT_EQ(latin_hypercube_unit(n, dims, 42), p);  // seeded: the same points again
  EXPECT_NE(latin_hypercube_unit(n, dims, 43), p);
  // The dimensions are paired by independent permutations, not by the same one: two random
  // permutations of 37 agree in about one place (fixed points of their quotient).
  int same = 0;
  for (int i = 0; i < n; ++i) same += static_cast<int>(p[i][0] * n) == static_cast<int>(p[i][1] * n);
  EXPECT_LT(same, n / 2);
}

}  // namespace
}  // namespace oxystrat
