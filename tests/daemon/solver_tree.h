// Writes a solver's output tree in the layout solvers use for their time-series functions, for
// tests of reading real output: `<output>/<series>/<start time>/<file>`, a restart into a new
// start-time folder whose first rows repeat times already written, surface and volume averages
// with their descriptive headers, a line of velocity probes with their locations, a solver log
// and a binary restart file. Our own invented scenario: an air channel of half-height 1 m,
// u_tau about 0.053 m/s (a kinematic wall shear stress of 2.8e-3 m^2/s^2, negative streamwise as
// solvers write it). Test-only.
#ifndef PLATEAU_TESTS_DAEMON_SOLVER_TREE_H_
#define PLATEAU_TESTS_DAEMON_SOLVER_TREE_H_

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "tests/core/synthetic_series.h"

namespace plateau::testing {

class SolverTree {
 public:
  static constexpr std::size_t kRows = 6000;      // samples of every series, once each
  static constexpr std::size_t kRestartRow = 3500;  // the second job starts here ...
  static constexpr std::size_t kOverlap = 50;     // ... after repeating the last 50 times
  static constexpr double kStep = 0.01;           // seconds between samples

  struct SeriesText {
    std::string folder;  // wallShearLower
    std::string file;    // surfaceFieldValue.dat
    std::string header;
    std::vector<std::string> rows;  // one per sample, without newline
  };

  SolverTree() {
    series_.push_back(Average("wallShearLower", "surfaceFieldValue.dat", "patch lowerWall",
                              "areaAverage(wallShearStress)", -2.8e-3, 1.5e-4, 11));
    series_.push_back(Average("wallShearUpper", "surfaceFieldValue.dat", "patch upperWall",
                              "areaAverage(wallShearStress)", -2.8e-3, 1.5e-4, 23));
    series_.push_back(Average("bulkVelocity", "volFieldValue.dat", "cellZone all",
                              "volAverage(U)", 1.0, 2.0e-3, 37));
    series_.push_back(Probes());
  }

  const std::vector<SeriesText>& series() const { return series_; }

  // The tree as a restarted run writes it, under `output`: segments `0/` and `35/`.
  void WriteRestartedRun(const std::filesystem::path& output) const {
    for (const SeriesText& s : series_) {
      WriteSegment(output / s.folder / "0" / s.file, s, 0, kRestartRow);
      WriteSegment(output / s.folder / Time(kRestartRow - kOverlap) / s.file, s,
                   kRestartRow - kOverlap, kRows);
    }
    std::ofstream(output / "log.solver") << "Courant Number mean: 0.21 max: 0.48\n"
                                            "Time = 0.01\n\nsmoothSolver: Solving for Ux\n";
    std::ofstream binary(output / "restart.bin", std::ios::binary);
    const char bytes[] = {'\x7f', 'E', 'L', 'F', '\0', '\x01', '\0', '\0'};
    for (int i = 0; i < 64; ++i) binary.write(bytes, sizeof bytes);
  }

  // Every series uncut, one file each: `folder/<series folder>/<file>`.
  void WriteUncut(const std::filesystem::path& folder) const {
    for (const SeriesText& s : series_) WriteSegment(folder / s.folder / s.file, s, 0, kRows);
  }

 private:
  static std::string Time(std::size_t row) {
    char text[32];
    std::snprintf(text, sizeof text, "%g", kStep * static_cast<double>(row));
    return text;
  }

  static void WriteSegment(const std::filesystem::path& path, const SeriesText& s,
                           std::size_t from, std::size_t to) {
    std::filesystem::create_directories(path.parent_path());
    std::ofstream out(path);
    out << s.header;
    for (std::size_t i = from; i < to; ++i) out << s.rows[i] << "\n";
  }

  static SeriesText Average(const std::string& folder, const std::string& file,
                            const std::string& region, const std::string& field, double mean,
                            double deviation, std::uint64_t seed) {
    SeriesText s{folder, file, "", {}};
    s.header = "# Region type : " + region + "\n# Faces       : 1200\n# Area        : 8\n" +
               "# Time        \t" + field + "\n";
    const std::vector<double> x = Ar1(kRows, 0.9, seed, mean, deviation);
    const std::vector<double> y = Ar1(kRows, 0.5, seed + 1, 0.0, deviation * 0.01);
    char line[160];
    for (std::size_t i = 0; i < kRows; ++i) {
      std::snprintf(line, sizeof line, "%g\t(%.9e %.9e %.9e)", kStep * (i + 1), x[i], y[i],
                    -0.5 * y[i]);
      s.rows.push_back(line);
    }
    return s;
  }

  // Five probes along y at x = 2.05, z = 1.0333: one (Ux Uy Uz) group each.
  static SeriesText Probes() {
    static const double kY[] = {0.0048, 0.012, 0.031, 0.12, 0.5};
    SeriesText s{"probes", "U", "", {}};
    for (int p = 0; p < 5; ++p) {
      char line[96];
      std::snprintf(line, sizeof line, "# Probe %d (2.05 %g 1.0333)\n", p, kY[p]);
      s.header += line;
    }
    s.header += "#           Probe             0             1             2             3"
                "             4\n#            Time\n";
    std::vector<std::vector<double>> u;
    for (int p = 0; p < 5; ++p) {
      u.push_back(Ar1(kRows, 0.8, 100 + p, 0.3 + 0.1 * p, 0.05));
    }
    for (std::size_t i = 0; i < kRows; ++i) {
      char group[96];
      std::snprintf(group, sizeof group, "%g", kStep * (i + 1));
      std::string row = group;
      for (int p = 0; p < 5; ++p) {
        std::snprintf(group, sizeof group, "  (%.9g %.9g %.9g)", u[p][i], -0.1 * u[p][i] + 0.03,
                      0.02 * static_cast<double>(p) + 0.3 * (u[p][kRows - 1 - i] - 0.3));
        row += group;
      }
      s.rows.push_back(row);
    }
    return s;
  }

  std::vector<SeriesText> series_;
};

}  // namespace plateau::testing

#endif  // PLATEAU_TESTS_DAEMON_SOLVER_TREE_H_
