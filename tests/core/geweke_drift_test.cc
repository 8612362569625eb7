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

TEST(GewekeDrift, StronglyCorrelatedSeriesKeepsTheFalseAlarmRateNearNominal) {
  // The stop rule tests at p < 0.001 for many statistics at every evaluation: the tail must hold.
  // AR(1) with phi = 0.9 (tau = 19 samples), 1000 values: the early part has about 5 effective
  // samples. Estimating each part's variance on its own rejected 2.8 % of 20000 such series at
  // p < 0.001 (measured while developing this); the late part's variance with a t law gives
  // about 0.4 %. 4000 series: at most 1 % (40) may reject at 0.001, and about 5 % at 0.05.
  int at_001 = 0;
  int at_05 = 0;
  for (int seed = 0; seed < 4000; ++seed) {
    const DriftTest d = GewekeDrift(testing::Ar1(1000, 0.9, 9000 + seed));
    at_001 += d.p_value < 0.001;
    at_05 += d.p_value < 0.05;
  }
  EXPECT_LE(at_001, 40);
  EXPECT_GE(at_05, 120);  // 3 % to 10 %: neither blind nor trigger-happy
  EXPECT_LE(at_05, 400);
}

TEST(GewekeDrift, ShortSeriesIsNotTested) {
  EXPECT_FALSE(GewekeDrift(testing::Ar1(150, 0.5, 1)).available);
}

}  // namespace
}  // namespace plateau
