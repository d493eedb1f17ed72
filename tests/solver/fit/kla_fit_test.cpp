// kLa from gassing-out traces: recovery of kLa and tau_p from synthetic traces with seeded noise
// (the intervals must contain the true values), the fixed-lag, no-lag and uptake modes, and the
// traces the fit refuses.
#include <fmt/format.h>
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

#include "fit/probe_ode.hpp"
#include "input/errors.hpp"
#include "solver/fit/do_trace.hpp"
#include "solver/fit/kla_fit.hpp"

namespace oxystrat {
namespace {

using ::testing::HasSubstr;
using test::rk4_probe;

// Gaussian noise from a seeded 64-bit Mersenne twister through Box-Muller, so the traces are the
// same with any standard library (std::normal_distribution is implementation-defined).
class Noise {
 public:
  explicit Noise(std::uint64_t seed) : gen_(seed) {}
  double operator()(double sd) {
    const double u1 = (static_cast<double>(gen_() >> 11) + 0.5) * 0x1.0p-53;
    const double u2 = (static_cast<double>(gen_() >> 11) + 0.5) * 0x1.0p-53;
    return sd * std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * M_PI * u2);
  }

 private:
  std::mt19937_64 gen_;
};

struct Synthetic {
  double kla = 0.03;      // [1/s]
  double tau = 8.0;       // [s]
  double cstar = 0.20;    // [mol/m3]
  double c0 = 0.01;       // [mol/m3]
  double our = 0.0;       // [mol/(m3 s)]
  double lead_in = 0.0;   // rows before the step [s]
  double dt = 1.0;        // sampling [s]
  double duration = 0.0;  // after the step [s]; 0: 8/kLa + 5 tau
  double noise = 0.0006;  // standard deviation [mol/m3] (0.3 % of C*)
  std::uint64_t seed = 1;
};

// A trace in mol/m3: flat at c0 during the lead-in, then the lagged rise, plus noise.
DoTrace make_trace(const Synthetic& s) {
  const double duration = s.duration > 0.0 ? s.duration : 8.0 / s.kla + 5.0 * s.tau;
  const auto rise = rk4_probe(s.kla, s.tau, s.cstar, s.c0, s.our, 0.01, s.dt, duration);
  DoTrace tr;
  tr.file_name = "synthetic.csv";
  tr.scale = DoScale::concentration;
  tr.do_unit = "mmol/L";
  Noise noise(s.seed);
  const int lead = static_cast<int>(std::lround(s.lead_in / s.dt));
  for (int i = 0; i < lead; ++i) {
    tr.time_s.push_back(i * s.dt);
    tr.value.push_back(s.c0 + noise(s.noise));
  }
  for (size_t k = 0; k < rise.size(); ++k) {
    tr.time_s.push_back(s.lead_in + static_cast<double>(k) * s.dt);
    tr.value.push_back(rise[k] + noise(s.noise));
  }
  tr.line.assign(tr.time_s.size(), 0);
  return tr;
}

bool contains(double lo, double hi, double v) { return lo <= v && v <= hi; }

// ---------------------------------------------------------------------------------------------
// Recovery from synthetic traces

struct Recovery {
  double ratio;  // kLa tau_p
  std::uint64_t seed;
};

void PrintTo(const Recovery& r, std::ostream* os) { *os << "kLa tau_p " << r.ratio << ", seed " << r.seed; }

class KlaFitLagRatio : public ::testing::TestWithParam<Recovery> {};

// kLa = 0.03 1/s, noise 0.3 % of C*, 1 s sampling; the 95 % intervals must contain the true kLa
// and tau_p. With one seed per case a miss has a 5 % chance per interval; the seeds are fixed, and
// the coverage over many seeds is checked below. The point estimate must also lie within 3 % (kLa)
// of the truth: its standard error here is ~0.5 %.
TEST_P(KlaFitLagRatio, IntervalsContainTheTrueKlaAndLag) {
  const auto [ratio, seed] = GetParam();
  Synthetic s;
  s.tau = ratio / s.kla;
  s.seed = seed;
  const auto fit = fit_kla(make_trace(s), {});
  // The achieved numbers go into the XML report (--gtest_output=xml).
  RecordProperty("kla", ::testing::PrintToString(fit.kla_1_s));
  RecordProperty("kla_ci", ::testing::PrintToString(std::vector<double>{fit.kla_ci_low_1_s, fit.kla_ci_high_1_s}));
  RecordProperty("tau", ::testing::PrintToString(fit.probe_lag_s));
  RecordProperty("tau_ci", ::testing::PrintToString(std::vector<double>{fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s}));
  EXPECT_TRUE(contains(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, s.kla))
      << fit.kla_ci_low_1_s << " .. " << fit.kla_ci_high_1_s;
  EXPECT_TRUE(contains(fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s, s.tau))
      << fit.probe_lag_ci_low_s << " .. " << fit.probe_lag_ci_high_s;
  EXPECT_NEAR(fit.kla_1_s, s.kla, 0.03 * s.kla);
  EXPECT_NEAR(fit.cstar, s.cstar, 5 * s.noise);
  // The residuals are the noise: RMS within 20 % of its standard deviation (n ~ 300).
  EXPECT_NEAR(fit.rms, s.noise, 0.2 * s.noise);
}

INSTANTIATE_TEST_SUITE_P(KlaFit, KlaFitLagRatio, ::testing::Values(Recovery{0.05, 11}, Recovery{0.3, 12}, Recovery{0.6, 13}),
                         [](const auto& info) { return "ratio_" + std::to_string(static_cast<int>(100 * info.param.ratio)); });

// The intervals are honest: over 40 seeded traces at kLa tau_p = 0.3 at least 34 (85 %) of the
// 95 % intervals contain the truth (binomial: expected 38, sd 1.4; 34 is ~3 sd below).
TEST(KlaFitRecovery, CoverageOverManySeeds) {
  int kla_hits = 0, tau_hits = 0;
  const int runs = 40;
  for (int i = 0; i < runs; ++i) {
    Synthetic s;
    s.tau = 0.3 / s.kla;
    s.seed = 1000 + static_cast<std::uint64_t>(i);
    const auto fit = fit_kla(make_trace(s), {});
    kla_hits += contains(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, s.kla);
    tau_hits += contains(fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s, s.tau);
  }
  RecordProperty("kla_hits", kla_hits);
  RecordProperty("tau_hits", tau_hits);
  EXPECT_GE(kla_hits, 34);
  EXPECT_GE(tau_hits, 34);
}

// At kLa tau_p = 1 the response is the double root (1 + kLa t) e^{-kLa t}: kLa and tau_p can no
// longer be told apart to first order, so a fitted lag leaves kLa undetermined and the fit is
// refused; with the lag given, kLa is sharp again.
TEST(KlaFitRecovery, AtKlaTimesLagOneTheLagMustBeGiven) {
  Synthetic s;
  s.tau = 1.0 / s.kla;
  s.seed = 21;
  const auto trace = make_trace(s);
  // With the lag fitted, kLa and 1/tau_p cannot be told apart here: kLa has no interval, and
  // the fit is refused rather than reported (it used to exit 0 with a warning).
  try {
    const auto fitted = fit_kla(trace, {});
    ADD_FAILURE() << "kLa " << fitted.kla_1_s << " 1/s reported although kLa tau_p = 1 with the lag fitted";
  } catch (const SolveError& e) {
    EXPECT_THAT(e.what(), HasSubstr("kLa is not determined by this trace"));
    EXPECT_THAT(e.what(), HasSubstr("--probe-lag"));
  }
  KlaFitOptions given;
  given.lag_mode = ProbeLagMode::fixed;
  given.probe_lag_s = s.tau;
  const auto fixed = fit_kla(trace, given);
  EXPECT_TRUE(contains(fixed.kla_ci_low_1_s, fixed.kla_ci_high_1_s, s.kla));
  EXPECT_NEAR(fixed.kla_1_s, s.kla, 0.02 * s.kla);
  EXPECT_LT(fixed.kla_ci_high_1_s - fixed.kla_ci_low_1_s, 0.05 * s.kla);
}

// 11 rows ending at 10 % of the rise (the true kLa 0.03 1/s, C* 100 %): the start of a rise fixes
// only kLa (C* - C0), so with C* fitted kLa is not determined and the fit is refused; it used to
// report 155.7 1/h (truth 108) with exit 0.
TEST(KlaFitRecovery, ATraceEndingEarlyInTheRiseIsRefusedWithCstarFitted) {
  std::string text = "time [s],DO [%]\n";
  const double kla = 0.03, end = -std::log(0.9) / kla;
  const double noise[11] = {0.02, -0.04, 0.05, -0.01, 0.03, -0.05, 0.04, 0.0, -0.03, 0.05, -0.02};  // %
  for (int i = 0; i <= 10; ++i) {
    const double t = end * i / 10.0;
    text += fmt::format("{:.3f},{:.3f}\n", t, 100.0 - 95.0 * std::exp(-kla * t) + noise[i]);
  }
  const auto trace = parse_do_trace(text, "short.csv");
  KlaFitOptions no_lag;
  no_lag.lag_mode = ProbeLagMode::none;
  try {
    const auto fit = fit_kla(trace, no_lag);
    ADD_FAILURE() << "kLa " << 3600.0 * fit.kla_1_s << " 1/h reported from 10 % of the rise";
  } catch (const SolveError& e) {
    EXPECT_THAT(e.what(), HasSubstr("short.csv: kLa is not determined by this trace"));
    EXPECT_THAT(e.what(), HasSubstr("--saturation"));
  }
}

// A short lag sampled coarsely through noise: with rows 5 s apart a 1.7 s lag is a dead time,
// the same Jacobian column as the step time. The fit must say tau_p is poorly determined (its
// interval undetermined, or wide enough to hold the truth), while kLa, which the tail fixes, keeps
// a finite interval. In this regime (55 rows, 2 % noise) kLa's standard error is ~3 % and the
// linearised 95 % interval covered the truth in 91 of 100 seeded traces when we tried, so the
// point estimate is checked to 10 % (~3 standard errors) rather than by its interval.
TEST(KlaFitRecovery, PoorlyDeterminedLagIsFlagged) {
  Synthetic s;
  s.tau = 0.05 / s.kla;  // 1.7 s
  s.dt = 5.0;
  s.noise = 0.004;  // 2 % of C*
  s.seed = 22;
  const auto fit = fit_kla(make_trace(s), {});
  RecordProperty("fit", ::testing::PrintToString(std::vector<double>{fit.kla_1_s, fit.kla_ci_low_1_s, fit.kla_ci_high_1_s,
                                                                     fit.probe_lag_s, fit.probe_lag_ci_low_s,
                                                                     fit.probe_lag_ci_high_s}));
  EXPECT_THAT(::testing::PrintToString(fit.warnings), HasSubstr("tau_p = "));
  EXPECT_THAT(::testing::PrintToString(fit.warnings), HasSubstr("poorly determined"));
  EXPECT_TRUE(std::isfinite(fit.kla_ci_low_1_s) && std::isfinite(fit.kla_ci_high_1_s));
  EXPECT_NEAR(fit.kla_1_s, s.kla, 0.1 * s.kla);
  if (!std::isnan(fit.probe_lag_ci_low_s)) {
    EXPECT_TRUE(contains(fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s, s.tau));
  }
}

// ---------------------------------------------------------------------------------------------
// Modes

TEST(KlaFitModes, GivenLagNarrowsTheInterval) {
  Synthetic s;  // kLa tau_p = 0.24
  s.seed = 31;
  const auto trace = make_trace(s);
  const auto fitted = fit_kla(trace, {});
  KlaFitOptions o;
  o.lag_mode = ProbeLagMode::fixed;
  o.probe_lag_s = s.tau;
  const auto fixed = fit_kla(trace, o);
  EXPECT_EQ(fixed.probe_lag_s, s.tau);
  EXPECT_TRUE(contains(fixed.kla_ci_low_1_s, fixed.kla_ci_high_1_s, s.kla));
  EXPECT_LT(fixed.kla_ci_high_1_s - fixed.kla_ci_low_1_s, fitted.kla_ci_high_1_s - fitted.kla_ci_low_1_s);
  EXPECT_EQ(fixed.parameters, fitted.parameters - 1);
  EXPECT_TRUE(fixed.warnings.empty()) << ::testing::PrintToString(fixed.warnings);
}

TEST(KlaFitModes, NoLagRecoversAnInstantProbeQuietly) {
  Synthetic s;
  s.tau = 0.0;
  s.seed = 41;
  KlaFitOptions o;
  o.lag_mode = ProbeLagMode::none;
  const auto fit = fit_kla(make_trace(s), o);
  EXPECT_EQ(fit.probe_lag_s, 0.0);
  EXPECT_TRUE(contains(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, s.kla));
  EXPECT_TRUE(fit.warnings.empty()) << ::testing::PrintToString(fit.warnings);
  // Trace starting at the step: t0 and C0 are interchangeable without a lag, so t0 is held on
  // the first row and C0 fitted.
  EXPECT_TRUE(fit.step_at_first_row);
  EXPECT_NEAR(fit.c0, s.c0, 5 * s.noise);
}

TEST(KlaFitModes, NoLagOnALaggedTraceWarnsAndIsBiasedLow) {
  Synthetic s;
  s.tau = 10.0;  // kLa tau_p = 0.3
  s.seed = 42;
  KlaFitOptions o;
  o.lag_mode = ProbeLagMode::none;
  const auto fit = fit_kla(make_trace(s), o);
  EXPECT_LT(fit.kla_1_s, s.kla);
  EXPECT_THAT(::testing::PrintToString(fit.warnings), HasSubstr("no probe lag was fitted or given"));
}

TEST(KlaFitModes, LeadInBeforeTheStepIsFoundAsTheStepTime) {
  Synthetic s;
  s.lead_in = 20.0;
  s.seed = 51;
  const auto fit = fit_kla(make_trace(s), {});
  EXPECT_NEAR(fit.step_time_s, 20.0, 2.0);
  EXPECT_TRUE(contains(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, s.kla));
  EXPECT_TRUE(contains(fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s, s.tau));
}

// With uptake the trace levels off at C* - OUR/kLa (here 70 % of C*).
TEST(KlaFitModes, UptakeWithGivenSaturation) {
  Synthetic s;
  s.our = 0.3 * s.kla * s.cstar;  // 1.8e-3 mol/(m3 s) = 6.5 mmol/(L h)
  s.seed = 61;
  KlaFitOptions o;
  o.uptake = s.our;
  o.saturation = s.cstar;
  const auto fit = fit_kla(make_trace(s), o);
  EXPECT_TRUE(contains(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, s.kla));
  EXPECT_TRUE(contains(fit.probe_lag_ci_low_s, fit.probe_lag_ci_high_s, s.tau));
  EXPECT_NEAR(fit.steady, 0.7 * s.cstar, 5 * s.noise);
  EXPECT_EQ(fit.cstar, s.cstar);
}

TEST(KlaFitModes, UptakeWithFittedSaturation) {
  Synthetic s;
  s.our = 0.3 * s.kla * s.cstar;
  s.seed = 62;
  KlaFitOptions o;
  o.uptake = s.our;
  const auto fit = fit_kla(make_trace(s), o);
  EXPECT_TRUE(contains(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, s.kla));
  EXPECT_TRUE(contains(fit.cstar_ci_low, fit.cstar_ci_high, s.cstar));
  // C* = steady + OUR/kLa exactly, by construction of the model.
  EXPECT_NEAR(fit.cstar, fit.steady + s.our / fit.kla_1_s, 1e-12);
}

TEST(KlaFitModes, GivenSaturationWithoutUptake) {
  Synthetic s;
  s.seed = 63;
  KlaFitOptions o;
  o.saturation = s.cstar;
  const auto fit = fit_kla(make_trace(s), o);
  EXPECT_TRUE(contains(fit.kla_ci_low_1_s, fit.kla_ci_high_1_s, s.kla));
  EXPECT_EQ(fit.free_parameters, (std::vector<std::string>{"kLa", "C0", "tau_p", "t0"}));
}

TEST(KlaFitModes, RefusesWhenTheFitDoesNotConverge) {
  Synthetic s;
  s.seed = 71;
  KlaFitOptions o;
  o.max_iterations = 1;
  EXPECT_THROW(fit_kla(make_trace(s), o), SolveError);
}

TEST(KlaFitModes, RefusesAFallingTrace) {
  Synthetic s;
  s.seed = 72;
  auto tr = make_trace(s);
  for (auto& v : tr.value) v = 0.3 - v;
  try {
    fit_kla(tr, {});
    FAIL() << "a falling trace was accepted";
  } catch (const CaseError& e) {
    EXPECT_THAT(e.what(), HasSubstr("synthetic.csv: the DO falls"));
    EXPECT_THAT(e.what(), HasSubstr("give the trace from where aeration resumes"));
  }
}

TEST(KlaFitModes, RefusesAFlatTrace) {
  Synthetic s;
  s.seed = 73;
  auto tr = make_trace(s);
  for (auto& v : tr.value) v = 0.1;
  try {
    fit_kla(tr, {});
    FAIL() << "a flat trace was accepted";
  } catch (const CaseError& e) {
    EXPECT_THAT(e.what(), HasSubstr("synthetic.csv: the DO does not rise"));
  }
}

TEST(KlaFitTrace, AWholeRunIsFittedFromItsMinimum) {
  // A logger's record of the whole run: 60 s of stripping (the DO falls from C* towards C0), then
  // the lagged rise of make_trace. The stripping part is left out with a note and kLa comes from
  // the rise; the rise alone is left as it is.
  Synthetic s;
  s.seed = 81;
  const DoTrace rise = make_trace(s);
  DoTrace whole = rise;
  whole.time_s.clear(), whole.value.clear();
  Noise noise(82);
  for (double t = 0.0; t < 60.0 - 1e-9; t += s.dt) {
    whole.time_s.push_back(t);
    whole.value.push_back(s.c0 + (s.cstar - s.c0) * std::exp(-0.1 * t) + noise(s.noise));
  }
  for (size_t k = 0; k < rise.time_s.size(); ++k) {
    whole.time_s.push_back(60.0 + rise.time_s[k]);
    whole.value.push_back(rise.value[k]);
  }
  whole.line.assign(whole.time_s.size(), 0);
  std::string note;
  const DoTrace cut = rise_from_minimum(whole, note);
  EXPECT_THAT(note, HasSubstr("before it rises"));
  EXPECT_GE(cut.time_s.front(), 50.0);  // at most the stripping's noisy tail is kept
  const auto fit = fit_kla(cut, {});
  // The flat lead-in that pins C0 and t0 is gone, so kLa rests on the rise alone: measured
  // 0.6 % off; 5 % leaves room for another noise seed.
  EXPECT_NEAR(fit.kla_1_s / s.kla, 1.0, 0.05);
  EXPECT_GE(fit.c0, 0.0);  // never below the lowest reading or zero
  std::string none;
  EXPECT_EQ(rise_from_minimum(rise, none).time_s.size(), rise.time_s.size());
  EXPECT_EQ(none, "");
}

TEST(KlaFitTrace, ShortRiseIsRejected) {
  // 12 rows, but the rise happens between two samples: no point between 10 % and 90 %.
  std::string text = "time [s],DO [%]\n";
  for (int i = 0; i < 12; ++i) text += std::to_string(i) + "," + (i < 6 ? "5" : "95") + "\n";
  try {
    fit_kla(parse_do_trace(text, "step.csv"), {});
    FAIL() << "a step without samples in the rise was accepted";
  } catch (const CaseError& e) {
    EXPECT_THAT(e.what(), HasSubstr("step.csv: too few points in the rise"));
  }
}

}  // namespace
}  // namespace oxystrat
