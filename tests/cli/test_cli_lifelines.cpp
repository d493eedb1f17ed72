// End to end: oxystrat lifelines on a bundled case.
#include <gmock/gmock.h>

#include "cli_runner.hpp"

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
}

TEST_F(LifelinesCli, BadDurationIsAClearError) {
  const auto r = oxystrat({"lifelines", (kSourceDir / "cases/tall-3rushton.toml").string(), "--duration", "2 weeks", "--out", "x"});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("--duration"));
  EXPECT_FALSE(fs::exists(work() / "x"));
}

}  // namespace
}  // namespace oxystrat::test
