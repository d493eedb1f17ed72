// End to end: oxystrat transient on the bundled fed-batch demo (shortened, coarse grid).
#include <gmock/gmock.h>

#include <chrono>

#include "cli_runner.hpp"
#include "h5_read.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class TransientCli : public CliTest {};

TEST_F(TransientCli, FedBatchWritesTimeSeriesTracesAndAParaViewSeries) {
  const auto r = oxystrat({"transient", (kSourceDir / "cases/fedbatch-60m3.toml").string(), "--duration", "10 min",
                           "--interval", "2 min", "--set", "grid.radial=5", "--set", "grid.axial=16", "--out", "fb"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("Substrate balance"));
  EXPECT_THAT(r.out, HasSubstr("Culture at the end"));
  for (const auto* f : {"result.h5", "trace.csv", "probe.csv", "controller.csv", "transient.pvd", "report.html",
                        "fields/section_0000.vtu", "fields/section_0005.vtu"}) {
    EXPECT_TRUE(fs::exists(work() / "fb" / f)) << f;
  }
  EXPECT_THAT(read_file(work() / "fb/controller.csv"), HasSubstr("time [s],controller output [0-3],speed [rpm]"));
  EXPECT_THAT(read_file(work() / "fb/fields/section_0005.vtu"), HasSubstr("substrate_g_L"));
  const auto file = open_h5((work() / "fb/result.h5").string());
  const auto t = read_doubles(file, "/transient/time");
  ASSERT_FALSE(t.empty());
  EXPECT_DOUBLE_EQ(t.back(), 600.0);
  // Frames at 0, 2, ..., 10 min; one row per frame, one column per zone.
  EXPECT_EQ(read_doubles(file, "/transient/field_time").size(), 6u);
  const auto dims = dims_of(file, "/transient/fields/substrate");
  ASSERT_EQ(dims.size(), 2u);
  EXPECT_EQ(dims[0], 6u);
  EXPECT_EQ(read_doubles(file, "/transient/substrate_max").size(), t.size());
  EXPECT_EQ(read_doubles(file, "/transient/probe_do").size(), t.size());
  EXPECT_FALSE(read_doubles(file, "/transient/do_field").empty());  // the first release's path
  const auto fed = read_doubles(file, "/transient/substrate_fed");
  ASSERT_EQ(fed.size(), 1u);
  // 10 min at 650 -> 651.17 L/h (linear to 790 L/h at 2 h) of 600 g/L: ~65 kg.
  EXPECT_NEAR(fed[0], 0.6 * 1e-3 * 600.0 / 3600.0 * 0.5 * (650.0 + 650.0 + 140.0 * 600.0 / 7200.0) * 1e3, 1e-6);
}

// Runs that would not end (a 1e-9 s step) or would take hours and gigabytes (1 ms fixed steps over
// an hour: 3.6 million steps) are refused at once, before anything is built; nothing is written.
TEST_F(TransientCli, StepsAndSizesAreRefusedBeforeRunning) {
  const std::string fb = (kSourceDir / "cases/fedbatch-60m3.toml").string();
  const std::vector<std::pair<std::vector<std::string>, std::string>> bad = {
      {{"--step", "1e-9 s"}, "--step 1e-09 s: the step must be at least 0.001 s"},
      {{"--step", "1 ms", "--fixed-step"}, "needs at least 3.6e+06 steps"},
      {{"--step", "1 ms"}, "needs at least 3.6e+06 steps"},
      {{"--step", "5 ms", "--set", "grid.radial=200", "--set", "grid.axial=2000"}, "zone-steps"},
      {{"--interval", "1 s", "--set", "grid.radial=200", "--set", "grid.axial=2000"}, "field outputs"},
  };
  for (const auto& [extra, message] : bad) {
    std::vector<std::string> args{"transient", fb, "--duration", "1 h", "--out", "fb"};
    args.insert(args.end(), extra.begin(), extra.end());
    const auto t0 = std::chrono::steady_clock::now();
    const auto r = oxystrat(args);
    // A refusal takes well under a second; 30 s only guards against "tried to run it" on a loaded machine.
    EXPECT_LT(std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count(), 30.0) << message;
    EXPECT_EQ(r.exit_code, 1) << message;
    EXPECT_THAT(r.err, HasSubstr(message));
    EXPECT_TRUE(work_listing().empty()) << message;
  }
}

TEST_F(TransientCli, BadFeedProfileIsAClearError) {
  const auto r = oxystrat({"transient", (kSourceDir / "cases/fedbatch-60m3.toml").string(), "--set",
                           "feed.times=[\"0 h\", \"2 h\", \"1 h\"]", "--out", "x"});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("feed.times.2"));
  EXPECT_THAT(r.err, HasSubstr("increase"));
  EXPECT_FALSE(fs::exists(work() / "x"));
  const auto u = oxystrat({"transient", (kSourceDir / "cases/fedbatch-60m3.toml").string(), "--set",
                           "feed.rates=[\"1 kg\", \"2 L/h\", \"3 L/h\"]", "--out", "x"});
  EXPECT_NE(u.exit_code, 0);
  EXPECT_THAT(u.err, HasSubstr("feed.rates.0"));
  EXPECT_THAT(u.err, HasSubstr("L/h"));
}

TEST_F(TransientCli, LifelinesThroughAFrozenFedBatchSeeTheSubstrate) {
  const auto r = oxystrat({"lifelines", (kSourceDir / "cases/fedbatch-60m3.toml").string(), "--after", "20 min",
                           "--cells", "40", "--duration", "5 min", "--substrate-threshold", "0.3 g/L", "--set",
                           "grid.radial=5", "--set", "grid.axial=16", "--out", "ll"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("Frozen at t = 0.3333 h"));
  EXPECT_THAT(r.out, HasSubstr("above substrate threshold (0.3 g/L)"));
  const auto file = open_h5((work() / "ll/result.h5").string());
  EXPECT_EQ(read_strings(file, "/lifelines/fields/names"), (std::vector<std::string>{"do", "substrate"}));
  const auto above = read_doubles(file, "/lifelines/fields/substrate/time_outside");
  EXPECT_EQ(above.size(), 40u);
  // Some cells pass the feed zone in 5 min, none lives there: shares strictly between 0 and 1 on average.
  double mean = 0.0;
  for (double a : above) mean += a / above.size();
  EXPECT_GT(mean, 0.0);
  EXPECT_LT(mean, 1.0);
  const auto bad = oxystrat({"lifelines", (kSourceDir / "cases/fedbatch-60m3.toml").string(), "--substrate-threshold",
                             "0.3 g/L", "--out", "x"});
  EXPECT_NE(bad.exit_code, 0);
  EXPECT_THAT(bad.err, HasSubstr("--substrate-threshold needs --after"));
}

}  // namespace
}  // namespace oxystrat::test
