#include "core/student_t.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

namespace plateau {
namespace {

// Two-sided quantiles against the printed table of Student's t, e.g. Abramowitz & Stegun (1964),
// "Handbook of Mathematical Functions", Table 26.10 (values to three decimals, as printed).
TEST(StudentT, QuantilesMatchThePublishedTable) {
  EXPECT_NEAR(TwoSidedStudentQuantile(0.95, 19), 2.093, 5e-4);
  EXPECT_NEAR(TwoSidedStudentQuantile(0.95, 5), 2.571, 5e-4);
  EXPECT_NEAR(TwoSidedStudentQuantile(0.99, 10), 3.169, 5e-4);
  EXPECT_NEAR(TwoSidedStudentQuantile(0.90, 29), 1.699, 5e-4);
  EXPECT_NEAR(TwoSidedStudentQuantile(0.95, std::numeric_limits<double>::infinity()), 1.960,
              5e-4);
}

TEST(StudentT, OutOfRangeArgumentsGiveNaN) {
  EXPECT_TRUE(std::isnan(TwoSidedStudentQuantile(1.0, 10)));
  EXPECT_TRUE(std::isnan(TwoSidedStudentQuantile(0.95, 0)));
}

TEST(StudentT, NormalPValue) {
  EXPECT_NEAR(TwoSidedNormalPValue(1.959964), 0.05, 1e-6);
  EXPECT_NEAR(TwoSidedNormalPValue(-3.0), 0.0026998, 1e-6);
}

}  // namespace
}  // namespace plateau
