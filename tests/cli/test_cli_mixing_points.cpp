// End to end: the injection and probe points of `mixing` (and `calibrate`), "R,Z" with units:
// a point outside the liquid is refused with the vessel's extent, a negative one with what R and Z
// mean (a negative value once fell back to the default point silently), and no folder is left;
// and the degree of homogeneity, which names the mixing time it asks for.
#include <gmock/gmock.h>

#include "cli_runner.hpp"
#include "h5_read.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class MixingPointsCli : public CliTest {};

TEST_F(MixingPointsCli, PointsOutsideTheLiquidOrNegativeAreRefusedWithTheReason) {
  const std::string demo = (kSourceDir / "cases/tall-3rushton.toml").string();
  const std::vector<std::string> grid = {"--set", "grid.radial=5", "--set", "grid.axial=14"};
  const auto run = [&](const std::string& option, const std::string& point) {
    std::vector<std::string> args = {"mixing", demo, "--out", "mix", option, point};
    args.insert(args.end(), grid.begin(), grid.end());
    return oxystrat(args);
  };
  // The demo: T = 3.2 m, liquid 8 m deep.
  const auto wide = run("--probe", "9 m,1 m");
  EXPECT_EQ(wide.exit_code, 1);
  EXPECT_THAT(wide.err, HasSubstr("the probe point (r = 9 m, z = 1 m) lies outside the liquid: r runs from the axis to "
                                  "the wall at 1.6 m (less in the bottom head) and z from the lowest point to the "
                                  "surface at 8 m"));
  const auto high = run("--inject", "0.5 m,9 m");
  EXPECT_EQ(high.exit_code, 1);
  EXPECT_THAT(high.err, HasSubstr("the injection point (r = 0.5 m, z = 9 m) lies outside the liquid"));
  const auto beyond_wall = run("--inject", "2 m,4 m");  // once moved to the wall without a word
  EXPECT_EQ(beyond_wall.exit_code, 1);
  EXPECT_THAT(beyond_wall.err, HasSubstr("the injection point (r = 2 m, z = 4 m) lies outside the liquid"));
  const auto negative = run("--probe", "-1 m,2 m");
  EXPECT_EQ(negative.exit_code, 1);
  EXPECT_THAT(negative.err, HasSubstr("--probe '-1 m,2 m': R is the distance from the vessel's axis and Z the height "
                                      "above its lowest point; neither can be negative"));
  EXPECT_FALSE(fs::exists(work() / "mix"));
  EXPECT_EQ(run("--probe", "1 m,2 m").exit_code, 0);
}

TEST_F(MixingPointsCli, TheDegreeOfHomogeneityNamesTheMixingTime) {
  // --homogeneity 0.999 was printed as theta100 and written to /mixing/theta95 with a +-5 % meaning.
  const std::string demo = (kSourceDir / "cases/tall-3rushton.toml").string();
  const auto mix = [&](const std::string& out, const std::string& x) {
    return oxystrat({"mixing", demo, "--out", out, "--homogeneity", x, "--set", "grid.radial=5", "--set", "grid.axial=14"});
  };
  const auto fine = mix("fine", "0.999");
  ASSERT_EQ(fine.exit_code, 0) << fine.err;
  EXPECT_THAT(fine.out, HasSubstr("theta99.9 whole vessel"));
  EXPECT_THAT(fine.out, HasSubstr("mixes to 99.9 %"));
  const auto f = open_h5((work() / "fine/result.h5").string());
  EXPECT_EQ(read_doubles(f, "/mixing/homogeneity"), std::vector<double>{0.999});
  EXPECT_THAT(read_attribute(f, "/mixing/theta", "meaning"), HasSubstr("+-0.1 %"));
  EXPECT_LE(H5Lexists(f, "/mixing/theta95", H5P_DEFAULT), 0);  // absent: this is not theta95
  const auto usual = mix("usual", "0.95");
  ASSERT_EQ(usual.exit_code, 0) << usual.err;
  const auto g = open_h5((work() / "usual/result.h5").string());
  EXPECT_EQ(read_doubles(g, "/mixing/theta95"), read_doubles(g, "/mixing/theta"));  // the documented name kept
  EXPECT_GT(read_doubles(f, "/mixing/theta")[0], read_doubles(g, "/mixing/theta")[0]);  // a tighter band takes longer
}

}  // namespace
}  // namespace oxystrat::test
