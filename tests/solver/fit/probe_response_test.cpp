// The lagged step response of a DO probe against a numerical integration of its two ODEs, its
// symmetry in kLa and 1/tau_p, its two evaluation branches and its analytic derivatives.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <string>

#include "fit/probe_ode.hpp"
#include "solver/fit/probe_response.hpp"

namespace oxystrat {
namespace {

using test::rk4_probe;

std::string fmt_name(double kla, double tau) {
  return "worst_kla_" + std::to_string(kla) + "_tau_" + std::to_string(tau);
}

// Tolerance 1e-9 (of a unit step): RK4 with h max(kLa, 1/tau_p) <= 0.01 has a global error of
// order (h lambda)^4 / 120 * lambda T ~ 1e-11 here; the closed form is exact to round-off. A
// wrong sign or factor in the closed form shows at the 1e-2 level.
TEST(KlaFitStepResponse, MatchesRk4OfTheTwoOdes) {
  struct P {
    double kla, tau;
  };
  // kLa tau_p = 0.24, exactly 1 (the limit form), within 1e-7 of 1 (the series branch), 0.05,
  // 2 (a probe slower than the transfer) and 0 (no lag).
  for (const auto& p : {P{0.03, 8.0}, P{0.03, 1.0 / 0.03}, P{0.03, (1.0 + 1e-7) / 0.03}, P{0.05, 1.0},
                        P{0.05, 40.0}, P{0.03, 0.0}}) {
    SCOPED_TRACE(::testing::Message() << "kLa " << p.kla << ", tau_p " << p.tau);
    const double rate = std::max(p.kla, p.tau > 0.0 ? 1.0 / p.tau : 0.0);
    const double h = 0.01 / rate;
    const double every = 100 * h;
    const double duration = 10.0 / std::min(p.kla, p.tau > 0.0 ? 1.0 / p.tau : p.kla);
    // Unit step: C* = 1, C0 = 0, so g = 1 - Cp.
    const auto cp = rk4_probe(p.kla, p.tau, 1.0, 0.0, 0.0, h, every, duration);
    double worst = 0.0;
    for (size_t k = 0; k < cp.size(); ++k) {
      const double g = probe_step_response(static_cast<double>(k) * every, p.kla, p.tau);
      worst = std::max(worst, std::abs((1.0 - g) - cp[k]));
    }
    RecordProperty(fmt_name(p.kla, p.tau), ::testing::PrintToString(worst));
    EXPECT_LT(worst, 1e-9);
  }
}

TEST(KlaFitStepResponse, StartsFlatAndIsSymmetricInKlaAndInverseLag) {
  EXPECT_EQ(probe_step_response(0.0, 0.03, 8.0), 1.0);
  EXPECT_EQ(probe_step_response(-5.0, 0.03, 8.0), 1.0);
  // Two first-order processes in series: swapping kLa and 1/tau_p leaves the response unchanged
  // (to round-off, 1e-14), which is why a fitted lag cannot be told from kLa by the shape alone.
  for (double s : {1.0, 10.0, 50.0, 200.0}) {
    EXPECT_NEAR(probe_step_response(s, 0.03, 8.0), probe_step_response(s, 0.125, 1.0 / 0.03), 1e-14);
  }
}

// The two evaluation branches (a series near kLa tau_p = 1, the textbook form elsewhere) against
// the textbook form in long double (64-bit mantissa: its cancellation error eps b/|b - a| stays
// below 1e-15 at |b - a| >= 1e-3 a). Tolerance 1e-13: the double branches are good to ~1e-15.
TEST(KlaFitStepResponse, BranchesAgreeWithExtendedPrecision) {
  const double a = 0.03;
  auto reference = [a](double s, double tau) {
    const long double b = 1.0L / tau, la = a, ls = s;
    return static_cast<double>((b * std::exp(-la * ls) - la * std::exp(-b * ls)) / (b - la));
  };
  // 1/tau_p on both sides of the branch switch |1/tau_p - kLa| = 0.1 max, and close to kLa.
  for (double b : {a / 0.9 * (1 - 1e-9), a / 0.9 * (1 + 1e-9), 0.9 * a * (1 - 1e-9), 0.9 * a * (1 + 1e-9),
                   a * (1 + 1e-3), a * (1 - 1e-3)}) {
    for (double s : {2.0, 20.0, 100.0, 400.0}) {
      EXPECT_NEAR(probe_step_response(s, a, 1.0 / b), reference(s, 1.0 / b), 1e-13) << "s " << s << " b " << b;
    }
  }
}

// Analytic partial derivatives against central differences; relative step 1e-6 gives truncation
// ~1e-12 and round-off ~1e-10 relative, so 1e-6 (relative to the largest derivative) is safe.
TEST(KlaFitStepResponse, DerivativesMatchFiniteDifferences) {
  struct P {
    double s, kla, tau;
  };
  for (const auto& p : {P{5.0, 0.03, 8.0}, P{40.0, 0.03, 8.0}, P{30.0, 0.03, 1.0 / 0.03}, P{30.0, 0.03, 31.0},
                        P{3.0, 0.05, 0.2}, P{60.0, 0.02, 80.0}, P{12.0, 0.04, 0.0}}) {
    SCOPED_TRACE(::testing::Message() << "s " << p.s << ", kLa " << p.kla << ", tau_p " << p.tau);
    const auto d = probe_step_response_derivatives(p.s, p.kla, p.tau);
    EXPECT_DOUBLE_EQ(d.g, probe_step_response(p.s, p.kla, p.tau));
    auto central = [](auto f, double x) {
      const double h = 1e-6 * std::max(std::abs(x), 1e-3);
      return (f(x + h) - f(x - h)) / (2.0 * h);
    };
    const double ds = central([&](double s) { return probe_step_response(s, p.kla, p.tau); }, p.s);
    const double dk = central([&](double k) { return probe_step_response(p.s, k, p.tau); }, p.kla);
    const double scale = std::max({std::abs(ds), std::abs(dk), 1e-3});
    EXPECT_NEAR(d.d_s, ds, 1e-6 * scale);
    EXPECT_NEAR(d.d_kla, dk, 1e-6 * std::max(std::abs(dk), 1e-3));
    if (p.tau > 0.0) {
      const double dt = central([&](double t) { return probe_step_response(p.s, p.kla, t); }, p.tau);
      EXPECT_NEAR(d.d_tau, dt, 1e-6 * std::max(std::abs(dt), 1e-6));
    } else {
      // One-sided at tau_p = 0: forward difference, truncation O(h) -> looser 1e-4.
      const double h = 1e-7;
      const double fwd = (probe_step_response(p.s, p.kla, h) - probe_step_response(p.s, p.kla, 0.0)) / h;
      EXPECT_NEAR(d.d_tau, fwd, 1e-4 * std::abs(fwd));
    }
  }
}

}  // namespace
}  // namespace oxystrat
