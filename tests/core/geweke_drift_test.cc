#include "core/geweke_drift.h"

#include <gtest/gtest.h>

#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

TEST(GewekeDrift, SlowRampIsDetected) {
  std::vector<double> x = testing::Ar1(20000, 0.5, 2);
  for (std::size_t t = 0; t < x.size(); ++t) x[t] += 0.3 * t / 20000.0;
  const DriftTest d = GewekeDrift(x);
  ASSERT_TRUE(d.available);
  EXPECT_LT(d.p_value, 1e-4);
  EXPECT_LT(d.z, 0.0);  // the early part is lower than the late part
}

TEST(GewekeDrift, StationarySeriesRejectsAtAboutTheNominalRate) {
  // Under stationarity z is approximately standard normal (Geweke 1992): about 5 % of p-values fall
  // below 0.05. 300 series; binomial standard deviation 1.3 %.
  int rejected = 0;
  for (int seed = 0; seed < 300; ++seed) {
    rejected += GewekeDrift(testing::Ar1(4000, 0.7, 500 + seed)).p_value < 0.05;
  }
  EXPECT_GE(rejected, 3);
  EXPECT_LE(rejected, 30);
}

TEST(GewekeDrift, ShortSeriesIsNotTested) {
  EXPECT_FALSE(GewekeDrift(testing::Ar1(150, 0.5, 1)).available);
}

}  // namespace
}  // namespace plateau
