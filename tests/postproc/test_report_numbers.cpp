// The report's number format, adaptive units and display bins of the lifeline histograms.
#include <gtest/gtest.h>

#include <cmath>
#include <numeric>

#include "postproc/report/display_bins.hpp"
#include "postproc/report/number_format.hpp"

namespace oxystrat::report {
namespace {

TEST(ReportNumbers, FixedDecimalsNoExponentAndZeroAtPrintedPrecision) {
  EXPECT_EQ(format_number(7.984e-06), "0");  // a DO of 8e-6 mmol/L is zero at 4 decimals
  EXPECT_EQ(format_number(-1e-9), "0");      // no "-0"
  EXPECT_EQ(format_number(0.0106), "0.0106");
  EXPECT_EQ(format_number(841.07), "841.1");
  EXPECT_EQ(format_number(2.0), "2");
  EXPECT_EQ(format_number(0.5), "0.5");
  EXPECT_EQ(format_number(9.99996), "10");   // rounding up a digit stays at 4 significant
  EXPECT_EQ(format_number(123456.0), "123456");
  EXPECT_EQ(format_number(std::nan("")), "\xE2\x80\x93");
}

TEST(ReportNumbers, PowerPerVolumeOfACellCultureInWattsPerCubicMetre) {
  const auto d = adapt_unit("kW/m3", 0.01834);
  EXPECT_EQ(d.unit, "W/m3");
  EXPECT_DOUBLE_EQ(d.factor, 1e3);
  EXPECT_EQ(adapt_unit("kW/m3", 1.66).unit, "kW/m3");
  EXPECT_EQ(adapt_unit("W", 52310.0).unit, "kW");
  EXPECT_EQ(adapt_unit("W", 850.0).unit, "W");
  EXPECT_EQ(adapt_unit("mmol/L", 1e-6).unit, "mmol/L");  // not a power: unchanged
  EXPECT_EQ(format_quantity(0.0363, "kW"), "36.3 W");
}

TEST(ReportNumbers, DurationsInTheUnitThatReadsNaturally) {
  EXPECT_EQ(format_duration(45.0), "45 s");
  EXPECT_EQ(format_duration(600.0), "10 min");
  EXPECT_EQ(format_duration(9000.0), "2.5 h");
  EXPECT_EQ(format_duration(3.0 * 86400.0), "3 d");
}

TEST(ReportNumbers, DisplayBinsFloorTinyEventsAndKeepEveryCount) {
  // Flickers of a microsecond beside excursions of 0.5 to 80 s.
  const std::vector<double> d{6.65e-7, 2e-6, 0.5, 1.0, 2.0, 3.0, 10.0, 40.0, 80.0};
  const auto b = display_bins(d);
  ASSERT_GE(b.edges.size(), 2u);
  EXPECT_GE(b.edges.front(), 80.0 * 1e-3 * (1 - 1e-12));  // the floor: 1/1000 of the largest
  EXPECT_GE(b.edges.back(), 80.0);
  EXPECT_EQ(b.below, 2.0);
  EXPECT_EQ(b.below + std::accumulate(b.counts.begin(), b.counts.end(), 0.0), static_cast<double>(d.size()));
  EXPECT_LE(b.counts.size(), 16u);
}

TEST(ReportNumbers, DisplayBinsOfOneValueIsOneBinAroundIt) {
  const auto b = display_bins(std::vector<double>{3.0, 3.0});
  ASSERT_EQ(b.counts.size(), 1u);
  EXPECT_LT(b.edges.front(), 3.0);
  EXPECT_GT(b.edges.back(), 3.0);
  EXPECT_EQ(b.counts.front(), 2.0);
}

}  // namespace
}  // namespace oxystrat::report
