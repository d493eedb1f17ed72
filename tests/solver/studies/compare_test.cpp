// Cases side by side: the parallel comparison equals each case run on its own, bit for bit and for
// any thread count; mixing times and uncertainty quantiles appear only when asked for.
#include <gtest/gtest.h>

#include <cmath>
#include <cstring>
#include <string>
#include <vector>

#include "case_fixtures.hpp"
#include "solver/flow/mixing_time.hpp"
#include "solver/studies/compare.hpp"
#include "solver/studies/constraints.hpp"

namespace oxystrat {
namespace {

// The pilot case on a coarse grid at two speeds: two configurations that differ.
std::vector<LoadedCase> two_speeds() {
  std::vector<LoadedCase> cases;
  for (const char* speed : {"operation.speed=300 rpm", "operation.speed=450 rpm"}) {
    cases.push_back(read_case_file(fixtures::source_dir() + "/cases/pilot-300L.toml",
                                   {parse_override("grid.radial=4"), parse_override("grid.axial=12"), parse_override(speed)}));
  }
  return cases;
}

bool bit_identical(const std::vector<SummaryValue>& a, const std::vector<SummaryValue>& b) {
  if (a.size() != b.size()) return false;
  for (size_t q = 0; q < a.size(); ++q) {
    if (a[q].name != b[q].name || std::memcmp(&a[q].value, &b[q].value, sizeof(double)) != 0) return false;
  }
  return true;
}

TEST(Compare, EqualsEachCaseRunOnItsOwnInCaseOrder) {
  const auto cases = two_speeds();
  int done = 0;
  CaseComparisonOptions o;
  o.threads = 2;
  o.on_case_done = [&done] { ++done; };
  const auto runs = compare_cases(cases, o);
  ASSERT_EQ(runs.size(), 2u);
  EXPECT_EQ(done, 2);
  for (size_t i = 0; i < cases.size(); ++i) {
    const auto run = run_case(cases[i].data);
    const double theta = tracer_mixing_time(run.net, run.hydro, {}).theta_s;
    ASSERT_TRUE(runs[i].theta95_s.has_value());
    EXPECT_EQ(*runs[i].theta95_s, theta);  // the same computation: bit for bit
    EXPECT_TRUE(bit_identical(runs[i].values, summary_values(cases[i].data, run, theta))) << "case " << i;
    EXPECT_EQ(runs[i].feasible, feasible(check_constraints(cases[i].data, run)));
    EXPECT_EQ(runs[i].checks.size(), check_constraints(cases[i].data, run).size());
  }
  // The faster impeller transfers more: the cases did not trade places.
  EXPECT_GT(summary_value(runs[1].values, "do_min"), summary_value(runs[0].values, "do_min"));
  EXPECT_LT(*runs[1].theta95_s, *runs[0].theta95_s);
}

TEST(Compare, OneAndTwoThreadsGiveBitIdenticalResults) {
  const auto cases = two_speeds();
  CaseComparisonOptions o;
  o.with_mixing = false;
  o.threads = 1;
  const auto one = compare_cases(cases, o);
  o.threads = 2;
  const auto two = compare_cases(cases, o);
  for (size_t i = 0; i < cases.size(); ++i) {
    EXPECT_FALSE(one[i].theta95_s.has_value());
    EXPECT_THROW(summary_value(one[i].values, "theta95"), std::out_of_range);  // not computed: absent, not 0 or NaN
    EXPECT_TRUE(bit_identical(one[i].values, two[i].values)) << "case " << i;
  }
}

TEST(Compare, UncertaintyAddsOrderedQuantilesAfterTheSummary) {
  const auto cases = two_speeds();
  CaseComparisonOptions o;
  o.with_mixing = false;
  o.uncertainty_samples = 4;
  o.seed = 5;
  const auto runs = compare_cases(cases, o);
  const auto plain = summary_values(cases[0].data, run_case(cases[0].data), std::nullopt);
  ASSERT_GT(runs[0].values.size(), plain.size());
  for (size_t q = 0; q < plain.size(); ++q) EXPECT_EQ(runs[0].values[q].name, plain[q].name);
  const double p10 = summary_value(runs[0].values, "do_min_p10"), p50 = summary_value(runs[0].values, "do_min_p50"),
               p90 = summary_value(runs[0].values, "do_min_p90");
  EXPECT_LE(p10, p50);
  EXPECT_LE(p50, p90);
  // Without mixing no theta95 quantiles either.
  for (const auto& v : runs[0].values) EXPECT_NE(v.name.rfind("theta95_", 0), 0u) << v.name;
}

}  // namespace
}  // namespace oxystrat
