// The comparison's note for a configuration that meets its constraints as computed but has broth
// below critical DO within the model constants' scatter (P90), and its silence otherwise.
#include <gmock/gmock.h>

#include "postproc/report/report.hpp"

namespace oxystrat {
namespace {

using testing::HasSubstr;

std::vector<SummaryValue> with_scatter(double below_p90) {
  return {summary_entry("do_min", 0.06, "mol/m3", "mmol/L", "DO min (zones)"),
          summary_entry("do_min_p10", 0.012, "mol/m3", "mmol/L", "DO min (zones) P10"),
          summary_entry("volume_fraction_below_critical_p90", below_p90, "1", "%", "volume below critical DO P90")};
}

TEST(ScatterNote, APassWithBrothBelowCriticalAtP90IsNamed) {
  const auto note = scatter_note("pilot", with_scatter(0.3), true);
  EXPECT_THAT(note, HasSubstr("pilot meets its constraints as computed, but not across the model constants' scatter"));
  EXPECT_THAT(note, HasSubstr("30 % of the volume"));
  EXPECT_THAT(note, HasSubstr("0.012 mmol/L"));
}

TEST(ScatterNote, NothingToSayOtherwise) {
  EXPECT_EQ(scatter_note("pilot", with_scatter(0.0), true), "");  // no broth below critical at P90
  EXPECT_EQ(scatter_note("pilot", with_scatter(0.3), false), "");  // already fails: its breaks are listed
  EXPECT_EQ(scatter_note("pilot", {summary_entry("do_min", 0.06, "mol/m3", "mmol/L", "DO min (zones)")}, true), "");  // no --uncertainty
}

}  // namespace
}  // namespace oxystrat
