// Grid lines along one axis: through every required position, with cells shared out by length.
#include "mesh/grid_lines.hpp"
#include "tests/round_off.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <vector>

namespace oxystrat::test {
namespace {

// Lines are sums and quotients of the inputs: round-off only (kRoundOff).

bool contains_line(const std::vector<double>& lines, double x) {
  return std::any_of(lines.begin(), lines.end(), [&](double l) { return std::abs(l - x) <= kRoundOff; });
}

void expect_increasing_from_to(const std::vector<double>& lines, double lo, double hi) {
  ASSERT_GE(lines.size(), 2u);
  EXPECT_EQ(lines.front(), lo);
  EXPECT_EQ(lines.back(), hi);
  for (size_t i = 1; i < lines.size(); ++i) EXPECT_LT(lines[i - 1], lines[i]) << "at line " << i;
}

TEST(GridLines, UniformWithoutRequiredPositions) {
  const auto lines = aligned_lines(0.0, 2.0, {}, 8);
  ASSERT_EQ(lines.size(), 9u);
  for (size_t i = 0; i < lines.size(); ++i) EXPECT_NEAR(lines[i], 0.25 * static_cast<double>(i), kRoundOff);
}

TEST(GridLines, RequiredPositionsAreLinesAndCountIsMet) {
  const std::vector<double> required{1.37, 0.21, 2.9, 0.2133};
  for (const int target : {1, 4, 5, 13, 40, 101}) {
    const auto lines = aligned_lines(0.0, 3.2, required, target);
    SCOPED_TRACE(target);
    expect_increasing_from_to(lines, 0.0, 3.2);
    for (const double x : required) EXPECT_TRUE(contains_line(lines, x)) << x;
    // Four required positions make five segments: at least that many cells, else the target.
    EXPECT_EQ(static_cast<int>(lines.size()) - 1, std::max(target, 5));
  }
}

TEST(GridLines, PositionsOutsideOrOnTheEndsAreIgnored) {
  const auto lines = aligned_lines(0.0, 1.0, {-0.5, 0.0, 1.0, 1.5}, 4);
  ASSERT_EQ(lines.size(), 5u);
  expect_increasing_from_to(lines, 0.0, 1.0);
}

TEST(GridLines, DuplicatePositionsMakeOneLine) {
  const auto lines = aligned_lines(0.0, 1.0, {0.3, 0.3, 0.3}, 2);
  ASSERT_EQ(lines.size(), 3u);
  EXPECT_EQ(lines[1], 0.3);
}

TEST(GridLines, CellsPerSegmentFollowTheLength) {
  // One cell per segment, then the rest by largest remainder: every segment gets its share of
  // the spare cells rounded down or up, never more than one away.
  const double lo = 0.0, hi = 10.0;
  const std::vector<double> knots{0.0, 0.7, 3.1, 3.3, 9.0, 10.0};
  const int target = 37;
  const auto lines = aligned_lines(lo, hi, {0.7, 3.1, 3.3, 9.0}, target);
  ASSERT_EQ(static_cast<int>(lines.size()) - 1, target);
  const int spare = target - 5;
  for (size_t s = 0; s + 1 < knots.size(); ++s) {
    const auto cells = std::count_if(lines.begin(), lines.end(), [&](double x) {
      return x > knots[s] + kRoundOff && x <= knots[s + 1] + kRoundOff;
    });
    const double share = spare * (knots[s + 1] - knots[s]) / (hi - lo);
    EXPECT_GE(cells, 1);
    EXPECT_LT(std::abs(static_cast<double>(cells - 1) - share), 1.0) << "segment " << s;
  }
}

TEST(GridLines, EachSegmentIsUniform) {
  // 0.2 | 0.8 with 6 cells: one each, 4 spare shared 0.8 | 3.2, the remainder 0.8 wins the last
  // one: 2 cells of 0.1 m below 0.2, 4 cells of 0.2 m above.
  const auto lines = aligned_lines(0.0, 1.0, {0.2}, 6);
  const std::vector<double> expected{0.0, 0.1, 0.2, 0.4, 0.6, 0.8, 1.0};
  ASSERT_EQ(lines.size(), expected.size());
  for (size_t i = 0; i < lines.size(); ++i) EXPECT_NEAR(lines[i], expected[i], kRoundOff) << i;
}

}  // namespace
}  // namespace oxystrat::test
