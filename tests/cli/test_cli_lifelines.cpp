// End to end: oxystrat lifelines on a bundled case.
#include <gmock/gmock.h>

#include "cli_runner.hpp"
#include "h5_read.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class LifelinesCli : public CliTest {};

TEST_F(LifelinesCli, WritesStatisticsAndIsReproducible) {
  const std::vector<std::string> args{"lifelines", (kSourceDir / "cases/tall-3rushton.toml").string(), "--cells", "40",
                                      "--duration", "2 min", "--set", "grid.radial=5", "--set", "grid.axial=16"};
  auto a = args, b = args;
  a.insert(a.end(), {"--out", "a", "--threads", "1"});
  b.insert(b.end(), {"--out", "b", "--threads", "2"});
  const auto ra = oxystrat(a);
  ASSERT_EQ(ra.exit_code, 0) << ra.err;
  ASSERT_EQ(oxystrat(b).exit_code, 0);
  EXPECT_THAT(ra.out, HasSubstr("time below critical DO"));
  for (const auto* f : {"result.h5", "cells.csv", "trajectories.csv", "report.html"}) EXPECT_TRUE(fs::exists(work() / "a" / f));
  EXPECT_EQ(read_file(work() / "a/cells.csv"), read_file(work() / "b/cells.csv"));
  EXPECT_THAT(ra.out, HasSubstr("no --min-excursion: every crossing counts"));
  EXPECT_THAT(ra.out, HasSubstr("impeller1 -> bulk1"));
}

TEST_F(LifelinesCli, MinimumExcursionAndRegimesReachTheResultFile) {
  const auto r = oxystrat({"lifelines", (kSourceDir / "cases/tall-3rushton.toml").string(), "--cells", "40", "--duration",
                           "5 min", "--min-excursion", "1 s", "--set", "grid.radial=5", "--set", "grid.axial=16", "--out", "m"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("excursions of at least 1 s"));
  const auto file = open_h5((work() / "m/result.h5").string());
  // The former paths are still there, the new ones beside them.
  const auto all = read_doubles(file, "/lifelines/excursion_durations");
  const auto longer = read_doubles(file, "/lifelines/fields/do/long_excursion_durations");
  EXPECT_EQ(read_doubles(file, "/lifelines/min_excursion"), std::vector<double>{1.0});
  EXPECT_EQ(read_doubles(file, "/lifelines/fields/do/time_outside"), read_doubles(file, "/lifelines/time_below_critical"));
  EXPECT_LE(longer.size(), all.size());
  for (double d : longer) EXPECT_GE(d, 1.0);
  EXPECT_EQ(read_strings(file, "/lifelines/fields/names"), std::vector<std::string>{"do"});
  const auto names = read_strings(file, "/lifelines/regimes/names");
  EXPECT_EQ(names.size(), 6u);  // three impellers, each with its discharge and its bulk
  const auto dims = dims_of(file, "/lifelines/regimes/transitions_per_hour");
  EXPECT_EQ(dims, (std::vector<hsize_t>{6, 6}));
  EXPECT_FALSE(read_doubles(file, "/lifelines/regimes/impeller2/return_histogram_counts").empty());
}

TEST_F(LifelinesCli, RunsTooLargeToRecordAreRefusedBeforeAnyWork) {
  // 1e7 cells over 10 h = 1e8 cell-hours; at ~4.4e8 B per 1e5 cell-hours that is ~440 GB of records.
  const auto r = oxystrat({"lifelines", (kSourceDir / "cases/tall-3rushton.toml").string(), "--cells", "10000000",
                           "--duration", "10 h", "--out", "x"});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("cell-hours"));
  EXPECT_FALSE(fs::exists(work() / "x"));
}

TEST_F(LifelinesCli, BadMinimumExcursionIsAClearError) {
  for (const char* bad : {"0 s", "3 kg", "2 h"}) {
    const auto r = oxystrat({"lifelines", (kSourceDir / "cases/tall-3rushton.toml").string(), "--duration", "1 h",
                             "--min-excursion", bad, "--out", "x"});
    EXPECT_NE(r.exit_code, 0) << bad;
    EXPECT_THAT(r.err, HasSubstr("--min-excursion")) << bad;
  }
  EXPECT_FALSE(fs::exists(work() / "x"));
}

TEST_F(LifelinesCli, BadDurationIsAClearError) {
  const auto r = oxystrat({"lifelines", (kSourceDir / "cases/tall-3rushton.toml").string(), "--duration", "2 weeks", "--out", "x"});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("--duration"));
  EXPECT_FALSE(fs::exists(work() / "x"));
}

}  // namespace
}  // namespace oxystrat::test
