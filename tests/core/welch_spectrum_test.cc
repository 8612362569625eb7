// Welch's averaged periodogram kept online (core/welch_spectrum.h) against SciPy's signal.welch
// on the same series and settings (fixtures/make_welch_reference.py; Welch 1967).
#include "core/welch_spectrum.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <map>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "tests/core/reference_series.h"

namespace plateau {
namespace {

struct ReferenceSpectrum {
  std::size_t segment = 0;
  double sampling_rate = 0.0;
  std::vector<double> frequency;
  std::vector<double> density;
};

std::map<std::string, ReferenceSpectrum> ReadSpectra() {
  std::ifstream in(PLATEAU_TEST_DATA_DIR "/core/fixtures/welch_reference.tsv");
  std::map<std::string, ReferenceSpectrum> spectra;
  std::string line;
  std::getline(in, line);  // header
  while (std::getline(in, line)) {
    std::istringstream fields(line);
    std::string name;
    ReferenceSpectrum row;
    double f = 0.0;
    double p = 0.0;
    if (!(fields >> name >> row.segment >> row.sampling_rate >> f >> p)) continue;
    ReferenceSpectrum& s = spectra[name];
    s.segment = row.segment;
    s.sampling_rate = row.sampling_rate;
    s.frequency.push_back(f);
    s.density.push_back(p);
  }
  return spectra;
}

const std::map<std::string, std::string> kSeriesOf = {{"tone_512", "sine40_ar1_phi0.5_n8192"},
                                                      {"tone_1000", "sine40_ar1_phi0.5_n8192"},
                                                      {"ar1_256", "ar1_phi0.9_n4096"}};

TEST(WelchSpectrum, EqualsSciPysWelchOnTheSameData) {
  const std::map<std::string, ReferenceSpectrum> spectra = ReadSpectra();
  ASSERT_EQ(spectra.size(), kSeriesOf.size()) << "welch_reference.tsv not found or incomplete";
  for (const auto& [name, reference] : spectra) {
    WelchSpectrum welch(reference.segment, reference.sampling_rate);
    for (double v : testing::ReferenceSeries(kSeriesOf.at(name))) welch.Add(v);
    const std::vector<double> f = welch.Frequencies();
    const std::vector<double> p = welch.Density();
    ASSERT_EQ(p.size(), reference.density.size()) << name;
    const double peak = *std::max_element(reference.density.begin(), reference.density.end());
    for (std::size_t k = 0; k < p.size(); ++k) {
      EXPECT_NEAR(f[k], reference.frequency[k], 1e-12 * reference.frequency.back()) << name;
      // 1e-9 relative to each bin, or to the peak for bins at round-off level.
      EXPECT_NEAR(p[k], reference.density[k], 1e-9 * std::max(reference.density[k], 1e-6 * peak))
          << name << " bin " << k;
    }
  }
}

TEST(WelchSpectrum, TheTonesPeakSitsAtItsFrequency) {
  // A tone of period 40 samples at 500 samples per time unit: 12.5 per time unit, bin 12.8 of 1000.
  WelchSpectrum welch(1000, 500.0);
  for (double v : testing::ReferenceSeries("sine40_ar1_phi0.5_n8192")) welch.Add(v);
  const std::vector<double> p = welch.Density();
  const std::size_t peak = static_cast<std::size_t>(std::max_element(p.begin(), p.end()) - p.begin());
  EXPECT_NEAR(welch.Frequencies()[peak], 12.5, 0.5);
  EXPECT_EQ(welch.segments(), (8192 - 500) / 500);
}

TEST(WelchSpectrum, NothingBeforeTheFirstSegmentAndOddSegmentsAreRefused) {
  WelchSpectrum welch(8, 1.0);
  for (int i = 0; i < 7; ++i) welch.Add(i);
  EXPECT_EQ(welch.segments(), 0u);
  EXPECT_TRUE(welch.Density().empty());
  welch.Add(7.0);
  EXPECT_EQ(welch.segments(), 1u);
  EXPECT_THROW(WelchSpectrum(7, 1.0), std::invalid_argument);
}

}  // namespace
}  // namespace plateau
