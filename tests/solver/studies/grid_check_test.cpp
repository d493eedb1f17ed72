// The grid check's verdict: a GCI is an error estimate only in the asymptotic range, where the
// observed order is near the scheme's (first order for the zone network).
#include <gtest/gtest.h>

#include <cmath>

#include "solver/studies/grid_check.hpp"

namespace oxystrat {
namespace {

// Three grids 1.5 apart of f(h) = 3 + 0.7 h^p.
GridConvergence sequence(double p) {
  const auto f = [p](double h) { return 3.0 + 0.7 * std::pow(h, p); };
  return grid_convergence(f(0.1), f(0.15), f(0.225), 0.1, 0.15, 0.225);
}

TEST(GridCheckVerdict, FarFromTheSchemesOrderIsNotAdequate) {
  // 4.27 and 6.28: the observed orders of the demo cases that were called "adequate" before.
  for (double p : {4.27, 6.28, 0.3}) {
    const auto v = grid_check_verdict(sequence(p), false, "%");
    EXPECT_NE(v.find("not in the asymptotic range"), std::string::npos) << p << ": " << v;
    EXPECT_NE(v.find("refine"), std::string::npos) << p;
    EXPECT_EQ(v.find("adequate"), std::string::npos) << p;
  }
}

TEST(GridCheckVerdict, NearTheSchemesOrderTheGciDecides) {
  const auto first_order = [](double coefficient) {
    const auto f = [coefficient](double h) { return 3.0 + coefficient * h; };
    return grid_convergence(f(0.1), f(0.15), f(0.225), 0.1, 0.15, 0.225);
  };
  EXPECT_NE(grid_check_verdict(first_order(20.0), false, "%").find("too coarse"), std::string::npos);  // GCI 50 %
  EXPECT_NE(grid_check_verdict(first_order(0.01), false, "%").find("adequate"), std::string::npos);    // GCI 0.08 %
}

TEST(GridCheckVerdict, AsymptoticBandAroundTheFormalOrder) {
  EXPECT_TRUE(in_asymptotic_range(1.0, 1.0));
  EXPECT_TRUE(in_asymptotic_range(0.5, 1.0));
  EXPECT_TRUE(in_asymptotic_range(2.0, 1.0));
  EXPECT_FALSE(in_asymptotic_range(2.1, 1.0));
  EXPECT_FALSE(in_asymptotic_range(0.49, 1.0));
}

}  // namespace
}  // namespace oxystrat
