// End to end: a vessel filled below its top impeller runs with that impeller left out, and says so
// on the terminal and in the report (read without the terminal).
#include <gmock/gmock.h>

#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class LowFillCli : public CliTest {};

TEST_F(LowFillCli, AnImpellerAboveTheLiquidIsLeftOutAndTheReportSaysSo) {
  const auto r = oxystrat({"run", (kSourceDir / "cases/tall-3rushton.toml").string(), "--out", "low", "--set",
                           "vessel.liquid_height=5.5 m", "--set", "vessel.straight_side=7.5 m", "--set", "grid.axial=24"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const std::string note = "impeller 2 at 5.9 m is above the liquid surface at 5.5 m and is left out";
  EXPECT_THAT(r.err, HasSubstr("warning: "));
  EXPECT_THAT(r.err, HasSubstr(note));
  EXPECT_THAT(r.out, HasSubstr("impellers (bottom up): rushton D 1.1 m at 1.3 m, rushton D 1.1 m at 3.6 m\n"));
  EXPECT_THAT(read_file(work() / "low/report.html"), HasSubstr(note));
  // Without the shell's length a low fill and a mistyped elevation look alike: refused.
  const auto refused = oxystrat({"run", (kSourceDir / "cases/tall-3rushton.toml").string(), "--out", "refused", "--set",
                                 "vessel.liquid_height=5.5 m"});
  EXPECT_EQ(refused.exit_code, 1);
  EXPECT_THAT(refused.err, HasSubstr("vessel.straight_side"));
}

}  // namespace
}  // namespace oxystrat::test
