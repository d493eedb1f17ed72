// Every check of the validation list passes: the same list `oxystrat validate` tabulates.
#include <gtest/gtest.h>

#include "solver/studies/validation.hpp"

namespace oxystrat {
namespace {

class ValidationList : public ::testing::TestWithParam<size_t> {};

TEST_P(ValidationList, CheckPasses) {
  const auto& c = validation_checks().at(GetParam());
  const auto r = run_check(c);
  EXPECT_TRUE(r.passed) << c.group << ": " << c.quantity << " (" << c.source << "): model " << r.model << ", reference "
                        << c.reference << " " << c.unit << ", error " << r.error << ", tolerance " << c.tolerance
                        << (c.relative ? " (relative)" : "");
}

INSTANTIATE_TEST_SUITE_P(Published, ValidationList, ::testing::Range<size_t>(0, validation_checks().size()));

TEST(ValidationList, EveryCheckNamesItsSourceAndTolerance) {
  EXPECT_GE(validation_checks().size(), 20u);
  for (const auto& c : validation_checks()) {
    EXPECT_FALSE(c.source.empty()) << c.quantity;
    EXPECT_FALSE(c.why.empty()) << c.quantity;
    EXPECT_GT(c.tolerance, 0.0) << c.quantity;
  }
}

}  // namespace
}  // namespace oxystrat
