// C++ twin of tests/core/fixtures/reference_series.py: SplitMix64 (Steele, Lea & Flood 2014) and the
// Box-Muller transform, so the C++ tests rebuild exactly the series whose reference values R, emcee
// and statsmodels computed. Also reads the committed reference table. Test-only; not thread-safe.
#ifndef PLATEAU_TESTS_CORE_REFERENCE_SERIES_H_
#define PLATEAU_TESTS_CORE_REFERENCE_SERIES_H_

#include <cmath>
#include <cstdint>
#include <fstream>
#include <map>
#include <numbers>
#include <sstream>
#include <string>
#include <vector>

namespace plateau::testing {

class SplitMix64 {
 public:
  explicit SplitMix64(std::uint64_t seed) : state_(seed) {}
  std::uint64_t Next() {
    state_ += 0x9E3779B97F4A7C15ULL;
    std::uint64_t z = state_;
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
    return z ^ (z >> 31);
  }
  double Uniform() { return static_cast<double>(Next() >> 11) * (1.0 / 9007199254740992.0); }
  double Normal() {
    const double u1 = 1.0 - Uniform();
    const double u2 = Uniform();
    return std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * std::numbers::pi * u2);
  }

 private:
  std::uint64_t state_;
};

inline std::vector<double> ReferenceAr1(std::size_t n, double phi, std::uint64_t seed) {
  SplitMix64 rng(seed);
  std::vector<double> x;
  x.reserve(n);
  double state = rng.Normal() / std::sqrt(1.0 - phi * phi);
  for (std::size_t t = 0; t < n; ++t) {
    x.push_back(state);
    state = phi * state + rng.Normal();
  }
  return x;
}

inline std::vector<double> ReferenceSinePlusAr1(std::size_t n, double period, double amplitude,
                                                double phi, std::uint64_t seed) {
  std::vector<double> x = ReferenceAr1(n, phi, seed);
  for (std::size_t t = 0; t < n; ++t) {
    x[t] += amplitude * std::sin(2.0 * std::numbers::pi * static_cast<double>(t) / period);
  }
  return x;
}

// The series of reference_series.CASES, by name.
inline std::vector<double> ReferenceSeries(const std::string& name) {
  if (name == "ar1_phi0.5_n4096") return ReferenceAr1(4096, 0.5, 1);
  if (name == "ar1_phi0.9_n4096") return ReferenceAr1(4096, 0.9, 2);
  if (name == "ar1_phi0.99_n16384") return ReferenceAr1(16384, 0.99, 3);
  if (name == "sine40_ar1_phi0.5_n8192") return ReferenceSinePlusAr1(8192, 40, 3.0, 0.5, 4);
  if (name == "ar1_phi0.9_n1048576") return ReferenceAr1(1048576, 0.9, 5);
  return {};
}

// estimator_reference.tsv as series -> quantity -> value.
using ReferenceTable = std::map<std::string, std::map<std::string, double>>;

inline ReferenceTable ReadReferenceTable(const std::string& path) {
  ReferenceTable table;
  std::ifstream in(path);
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream fields(line);
    std::string series, quantity;
    double value;
    if (fields >> series >> quantity >> value) table[series][quantity] = value;
  }
  return table;
}

}  // namespace plateau::testing

#endif  // PLATEAU_TESTS_CORE_REFERENCE_SERIES_H_
