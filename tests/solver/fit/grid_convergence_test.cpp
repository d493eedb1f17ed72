// GCI and observed order on manufactured sequences with a known order (Celik et al. 2008 procedure).
#include <gtest/gtest.h>

#include <cmath>

#include "solver/fit/grid_convergence.hpp"

namespace oxystrat {
namespace {

TEST(GridConvergence, RecoversAKnownOrderWithConstantRatio) {
  // f(h) = 3 + 0.7 h^p: the observed order is p and the extrapolation is the exact 3 (round-off).
  for (double p : {1.0, 1.5, 2.0, 3.0}) {
    const auto f = [p](double h) { return 3.0 + 0.7 * std::pow(h, p); };
    const auto g = grid_convergence(f(0.1), f(0.15), f(0.225), 0.1, 0.15, 0.225);
    EXPECT_NEAR(g.observed_order, p, 1e-9);
    EXPECT_NEAR(g.extrapolated, 3.0, 1e-9);
    EXPECT_FALSE(g.oscillatory);
    // GCI bounds the fine grid's true error (it has the 1.25 safety factor).
    EXPECT_GE(g.gci_fine_absolute, std::abs(f(0.1) - 3.0) * (1.0 - 1e-9));
  }
}

TEST(GridConvergence, RecoversAKnownOrderWithUnequalRatios) {
  // Ratios 1.4 and 1.7: the fixed-point iteration of the procedure is needed.
  const auto f = [](double h) { return -2.0 + 5.0 * h * h; };
  const auto g = grid_convergence(f(0.05), f(0.07), f(0.119), 0.05, 0.07, 0.119);
  EXPECT_NEAR(g.observed_order, 2.0, 1e-8);
  EXPECT_NEAR(g.extrapolated, -2.0, 1e-9);
}

TEST(GridConvergence, FlagsOscillationAndExactAgreement) {
  EXPECT_TRUE(grid_convergence(1.0, 1.1, 0.95, 1.0, 1.5, 2.25).oscillatory);
  EXPECT_TRUE(grid_convergence(2.0, 2.0, 2.0, 1.0, 1.5, 2.25).converged_already);
}

}  // namespace
}  // namespace oxystrat
