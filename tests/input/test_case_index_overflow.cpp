// Regression (found while fuzzing the reader): a list index too long for an unsigned long, in a
// --set key or a key looked up with raw_value (sweep --vary), used to escape as std::out_of_range
// from std::stoul ("oxystrat: error: stoul") instead of a CaseError naming the argument.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

TEST(CaseIndexOverflow, HugeIndexInSetIsAnInputError) {
  const auto msg = error_of(CaseText(), {"impeller.99999999999999999999.type=rushton"});
  EXPECT_THAT(msg, HasSubstr("--set 'impeller.99999999999999999999.type=rushton'"));
  EXPECT_THAT(msg, HasSubstr("does not exist; the case has 2 entries (0 to 1)"));
}

TEST(CaseIndexOverflow, TenDigitIndexIsAnInputErrorToo) {
  // Fits in an unsigned long but not in any list: the same message as any missing element.
  EXPECT_THAT(error_of(CaseText(), {"impeller.4294967296.diameter=0.3 m"}), HasSubstr("does not exist"));
}

TEST(CaseIndexOverflow, RawValueOfAHugeIndexIsAbsent) {
  const auto loaded = load(CaseText());
  EXPECT_FALSE(raw_value(loaded, "impeller.99999999999999999999.diameter").has_value());
  EXPECT_EQ(raw_value(loaded, "impeller.0.diameter").value_or(""), "0.35 m");
}

}  // namespace
}  // namespace oxystrat::test
