#include "core/profile_analysis.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>

namespace plateau {

double YPlus(double y, double friction_velocity, double viscosity) {
  return y * friction_velocity / viscosity;
}

int WallUnitPower(const std::string& q) {
  if (q == "U" || q == "V" || q == "W") return 1;
  if (q == "k" || (q.size() == 2 && q.find_first_not_of("uvw") == std::string::npos)) return 2;
  if (q.size() == 3 && q.find_first_not_of("uvw") == std::string::npos) return 3;
  return 0;
}

std::vector<double> TotalStressDeparture(const std::vector<double>& y, const std::vector<double>& u,
                                         const std::vector<double>& uv, double viscosity,
                                         double friction_velocity, double half_height) {
  const std::size_t n = y.size();
  if (n < 3 || u.size() != n || uv.size() != n) return {};
  std::vector<double> departure(n);
  const double wall_stress = friction_velocity * friction_velocity;
  for (std::size_t i = 0; i < n; ++i) {
    // Three points around i (shifted inwards at the ends): the derivative of the quadratic through
    // them at y_i, exact for a quadratic profile on any spacing.
    const std::size_t c = std::clamp<std::size_t>(i, 1, n - 2);
    const double y0 = y[c - 1], y1 = y[c], y2 = y[c + 1], x = y[i];
    const double dudy = u[c - 1] * (2 * x - y1 - y2) / ((y0 - y1) * (y0 - y2)) +
                        u[c] * (2 * x - y0 - y2) / ((y1 - y0) * (y1 - y2)) +
                        u[c + 1] * (2 * x - y0 - y1) / ((y2 - y0) * (y2 - y1));
    departure[i] = (viscosity * dudy - uv[i]) / wall_stress - (1.0 - y[i] / half_height);
  }
  return departure;
}

double Interpolate(const std::vector<std::pair<double, double>>& table, double x) {
  if (table.empty() || x < table.front().first || x > table.back().first) {
    return std::numeric_limits<double>::quiet_NaN();
  }
  const auto upper = std::lower_bound(table.begin(), table.end(), x,
                                      [](const auto& row, double v) { return row.first < v; });
  if (upper == table.begin()) return upper->second;
  const auto lower = upper - 1;
  const double f = (x - lower->first) / (upper->first - lower->first);
  return lower->second + f * (upper->second - lower->second);
}

Result<std::vector<std::pair<double, double>>> ReadProfileTable(const std::string& text) {
  std::vector<std::pair<double, double>> rows;
  std::istringstream lines(text);
  std::string line;
  int number = 0;
  while (std::getline(lines, line)) {
    ++number;
    const std::size_t start = line.find_first_not_of(" \t");
    if (start == std::string::npos || line[start] == '#') continue;
    std::istringstream fields(line);
    double x, v;
    if (!(fields >> x >> v)) {
      return Status::Error("line " + std::to_string(number) +
                           ": expected two numbers, x and value");
    }
    rows.emplace_back(x, v);
  }
  std::sort(rows.begin(), rows.end());
  if (rows.empty()) return Status::Error("no rows");
  return rows;
}

}  // namespace plateau
