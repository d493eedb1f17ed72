// End to end: a command that advises an operating point (sweep's chosen point, scale-up's production
// points) gives the cautions `run` would give there, on the terminal, in the report and in result.h5
// (they were counted, or dropped, while the advice read "meets").
#include <gmock/gmock.h>

#include <algorithm>

#include "cli_runner.hpp"
#include "h5_read.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class AdviceCautionsCli : public CliTest {};

TEST_F(AdviceCautionsCli, TheSweepsChosenPointCarriesItsCautions) {
  // Every point of this sweep enriches the gas above air: the chosen one is cautioned for it.
  const auto r = oxystrat({"sweep", kSmallCase, "--vary", "operation.oxygen_fraction=25:30:2:%", "--no-biomass", "--out",
                           "sw"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  ASSERT_THAT(r.out, HasSubstr("chosen point"));
  EXPECT_THAT(r.out, HasSubstr("Cautions at the chosen point"));
  EXPECT_THAT(r.out, HasSubstr("OXYGEN-ENRICHED gas"));
  const auto html = read_file(work() / "sw/report.html");
  EXPECT_THAT(html, HasSubstr("Cautions at the chosen point"));
  EXPECT_THAT(html, HasSubstr("OXYGEN-ENRICHED gas"));
  const auto f = open_h5((work() / "sw/result.h5").string());
  const auto cautions = read_strings(f, "/sweep/chosen_cautions");
  EXPECT_TRUE(std::any_of(cautions.begin(), cautions.end(),
                          [](const std::string& w) { return w.find("OXYGEN-ENRICHED") != std::string::npos; }));
}

TEST_F(AdviceCautionsCli, ScaleUpGivesTheCautionsOfEachProductionPoint) {
  // The bundled pilot taken to the bundled cell-culture vessel at the pilot's 1 vvm: every
  // production point is a sparged cell culture (the bubble-damage caution, said once for all),
  // and equal P/V there drives the holdup beyond bubbly flow.
  const auto r = oxystrat({"scale-up", (kSourceDir / "cases/pilot-300L.toml").string(),
                           (kSourceDir / "cases/cell-culture-2m3.toml").string(), "--out", "su"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("Cautions at the production points"));
  EXPECT_THAT(r.out, HasSubstr("every production point:\n    - CELL CULTURE, bubbles"));
  size_t said = 0;
  for (auto at = r.out.find("CELL CULTURE, bubbles"); at != std::string::npos; at = r.out.find("CELL CULTURE, bubbles", at + 1)) {
    ++said;
  }
  EXPECT_EQ(said, 1u) << "a caution every point shares is said once";
  EXPECT_THAT(r.out, HasSubstr("equal P/V (gassed), equal vvm:\n    - model range: gas holdup"));
  EXPECT_THAT(r.out, HasSubstr("meets (2 cautions)"));
  EXPECT_THAT(read_file(work() / "su/report.html"), HasSubstr("Cautions at the production points"));
  EXPECT_THAT(read_file(work() / "su/scale_up.csv"), HasSubstr(",breaks,cautions [1]\n"));
  const auto f = open_h5((work() / "su/result.h5").string());
  const auto cautions = read_strings(f, "/scale_up/cautions");
  const auto rows = read_ints(f, "/scale_up/caution_row");
  ASSERT_EQ(cautions.size(), rows.size());
  const auto criteria = read_strings(f, "/scale_up/criterion");
  for (int row : rows) EXPECT_GT(row, 0) << "the pilot's own cautions are not the production's";
  for (int row : rows) EXPECT_LT(row, static_cast<int>(criteria.size()));
}

}  // namespace
}  // namespace oxystrat::test
