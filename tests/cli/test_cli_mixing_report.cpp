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

}  // namespace
}  // namespace oxystrat::test
