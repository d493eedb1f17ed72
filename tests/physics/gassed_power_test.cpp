// Gassed power and flooding for every impeller type.
#include <gtest/gtest.h>

#include <cmath>

#include "physics/impeller_power.hpp"

namespace oxystrat {
namespace {

TEST(GassedPower, RushtonFollowsCuiEtAlAtThreeFlowNumbers) {
  // Cui, van der Lans & Luyben (1996) [mem]: 0.748 at Fl_G 0.02, 0.5275 at 0.05, 0.435 at 0.10
  // (computed from the two branches; round-off).
  EXPECT_NEAR(gassed_power_ratio(ImpellerType::rushton, 0.02, 0.5, 0.33), 0.748, 1e-9);
  EXPECT_NEAR(gassed_power_ratio(ImpellerType::rushton, 0.05, 0.5, 0.33), 0.5275, 1e-9);
  EXPECT_NEAR(gassed_power_ratio(ImpellerType::rushton, 0.10, 0.5, 0.33), 0.435, 1e-9);
}

TEST(GassedPower, OtherTypesFallWithTheGasLoadToTheirFloodingValue) {
  // The [mem] end points of docs/method.md: Pg/P0 at flooding 0.6 (pitched blade down), 0.55
  // (hydrofoil down), 0.75 (hollow blade), 0.85 (up-pumping); flooding at 0.5, 0.5, 2.5 and 3
  // times a Rushton's Fl_G. Checked at three loads: none, half way, at flooding and beyond.
  const double fr = 0.5, dt = 0.35;
  for (auto t : {ImpellerType::pitched_blade_down, ImpellerType::hydrofoil_down, ImpellerType::hollow_blade,
                 ImpellerType::pitched_blade_up, ImpellerType::hydrofoil_up}) {
    const auto& d = impeller_data(t);
    const double flood = flooding_aeration_number(t, fr, dt);
    EXPECT_NEAR(flood, d.flooding_capacity * 30.0 * fr * std::pow(dt, 3.5), 1e-12);  // Nienow et al. 1985 scaled
    EXPECT_EQ(gassed_power_ratio(t, 0.0, fr, dt), 1.0);
    EXPECT_NEAR(gassed_power_ratio(t, 0.5 * flood, fr, dt), 0.5 * (1.0 + d.gassed_ratio_at_flooding), 1e-12);
    EXPECT_NEAR(gassed_power_ratio(t, flood, fr, dt), d.gassed_ratio_at_flooding, 1e-12);
    EXPECT_NEAR(gassed_power_ratio(t, 3.0 * flood, fr, dt), d.gassed_ratio_at_flooding, 1e-12);
    // A little gas costs little power, more gas more: the ratio depends on the load.
    EXPECT_GT(gassed_power_ratio(t, 0.01 * flood, fr, dt), gassed_power_ratio(t, 0.2 * flood, fr, dt));
  }
  // Down-pumping axial types lose more power than a hollow blade and flood earlier.
  EXPECT_LT(impeller_data(ImpellerType::pitched_blade_down).gassed_ratio_at_flooding,
            impeller_data(ImpellerType::hollow_blade).gassed_ratio_at_flooding);
  EXPECT_LT(flooding_aeration_number(ImpellerType::hydrofoil_down, fr, dt),
            flooding_aeration_number(ImpellerType::rushton, fr, dt));
  EXPECT_FALSE(impeller_data(ImpellerType::hydrofoil_up).floods);
}

}  // namespace
}  // namespace oxystrat
