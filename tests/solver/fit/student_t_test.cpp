// Student's t quantiles against closed forms (1 and 2 degrees of freedom) and printed tables.
#include <gtest/gtest.h>

#include <cmath>

#include "solver/fit/student_t.hpp"

namespace oxystrat {
namespace {

TEST(StudentT, QuantilesMatchClosedFormsAndTables) {
  // Closed forms: 1 degree of freedom (Cauchy) t = tan(pi (p - 1/2)); 2 degrees of freedom
  // t = (2p - 1) / sqrt(2 p (1 - p)). Round-off level agreement.
  for (double p : {0.6, 0.9, 0.975, 0.995}) {
    EXPECT_NEAR(student_t_quantile(p, 1.0), std::tan(M_PI * (p - 0.5)), 1e-9 * std::tan(M_PI * (p - 0.5)));
    EXPECT_NEAR(student_t_quantile(p, 2.0), (2 * p - 1) / std::sqrt(2 * p * (1 - p)), 1e-10);
  }
  // Two-sided 95 % values of the standard t table (e.g. Abramowitz & Stegun 1964, table 26.10),
  // given there to 6 significant digits [mem]; the large-dof limit is the normal 1.959964.
  EXPECT_NEAR(student_t_quantile(0.975, 5.0), 2.570582, 2e-6);
  EXPECT_NEAR(student_t_quantile(0.975, 10.0), 2.228139, 2e-6);
  EXPECT_NEAR(student_t_quantile(0.975, 30.0), 2.042272, 2e-6);
  EXPECT_NEAR(student_t_quantile(0.975, 1e8), 1.959964, 2e-6);
  EXPECT_NEAR(student_t_quantile(0.025, 10.0), -2.228139, 2e-6);
  for (double dof : {3.0, 17.0, 250.0}) {
    for (double p : {0.01, 0.3, 0.8, 0.999}) EXPECT_NEAR(student_t_cdf(student_t_quantile(p, dof), dof), p, 1e-12);
  }
}

}  // namespace
}  // namespace oxystrat
