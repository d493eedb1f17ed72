// End to end: oxystrat mixing writes report.html, which opens with the same verdict the terminal prints.
#include <gmock/gmock.h>

#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class MixingReportCli : public CliTest {};

TEST_F(MixingReportCli, ReportOpensWithTheTerminalVerdictAndHasItsFigures) {
  const auto r = oxystrat({"mixing", (kSourceDir / "cases/tall-3rushton.toml").string(), "--set", "grid.radial=5", "--set",
                           "grid.axial=14", "--out", "mix"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  ASSERT_TRUE(fs::exists(work() / "mix/report.html"));
  const auto html = read_file(work() / "mix/report.html");
  // The headline is the second line of the terminal output (after the case title).
  const auto first = r.out.find('\n') + 1;
  const std::string headline = r.out.substr(first, r.out.find('\n', first) - first);
  EXPECT_THAT(headline, HasSubstr("mixes to 95 %"));
  const auto verdict = html.find("class=\"verdict\"");
  ASSERT_NE(verdict, std::string::npos);
  EXPECT_LT(verdict, html.find("<svg"));
  EXPECT_NE(html.find(headline.substr(0, headline.find(". ") + 1)), std::string::npos) << headline;
  // Tracer at the probe, farthest zone from uniform, tracer in the section: each with data marks.
  size_t figures = 0, with_data = 0;
  for (auto at = html.find("<svg"); at != std::string::npos; at = html.find("<svg", at + 1)) {
    ++figures;
    const auto end = html.find("</svg>", at);
    with_data += html.find("<g class=\"data\">\n<", at) < end ? 1 : 0;
  }
  EXPECT_EQ(figures, 3u);
  EXPECT_EQ(with_data, figures);
}

TEST_F(MixingReportCli, StagnantBrothIsNamedAndAnUnmixedVesselGetsALowerBound) {
  // The viscous demo: caverns that touch, a little stagnant broth outside them, which theta95 leaves
  // out and says so.
  const auto viscous = oxystrat({"mixing", (kSourceDir / "cases/viscous-broth-40m3.toml").string(), "--out", "viscous"});
  ASSERT_EQ(viscous.exit_code, 0) << viscous.err;
  EXPECT_THAT(viscous.out, HasSubstr("The broth inside the caverns mixes to 95 %"));
  EXPECT_THAT(viscous.out, HasSubstr("outside them is stagnant and not counted"));
  // The tall demo with a yield stress: three caverns with stagnant broth between them never mix
  // with each other, and `run` prints theta95 as a lower bound.
  const auto apart = oxystrat({"run", (kSourceDir / "cases/tall-3rushton.toml").string(), "--set",
                               "broth.rheology=herschel-bulkley", "--set", "broth.yield_stress=100 Pa", "--set",
                               "broth.consistency=5 Pa s^n", "--set", "broth.flow_index=0.3", "--no-levers", "--out", "apart"});
  ASSERT_EQ(apart.exit_code, 0) << apart.err;
  EXPECT_THAT(apart.out, HasSubstr("theta95 > "));
}

}  // namespace
}  // namespace oxystrat::test
