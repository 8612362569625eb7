// Arithmetic of probe-line profiles: wall units, the total shear stress of a pressure-driven
// channel, and reference profiles. Pure; stateless.
#ifndef PLATEAU_CORE_PROFILE_ANALYSIS_H_
#define PLATEAU_CORE_PROFILE_ANALYSIS_H_

#include <string>
#include <utility>
#include <vector>

#include "core/result.h"

namespace plateau {

// y+ = y u_tau / nu.
double YPlus(double y, double friction_velocity, double viscosity);

// The power of u_tau that makes a profile quantity dimensionless: 1 for the mean velocities
// U, V, W; 2 for the Reynolds stresses (uu, uv, ...) and the TKE k; 3 for triple correlations;
// 0 for a name it does not know.
int WallUnitPower(const std::string& quantity);

// In a statistically steady pressure-driven channel the total shear stress is linear in y:
//   nu dU/dy - <u'v'> = u_tau^2 (1 - y / delta)
// (e.g. Pope 2000, "Turbulent Flows", eq. 7.10 with 7.13). Returns, per point, the departure
// (nu dU/dy - <u'v'>) / u_tau^2 - (1 - y / delta) in wall units, with dU/dy from the three-point
// formula on the possibly non-uniform points (one-sided at the ends). `y` must increase; fewer
// than three points give an empty result.
std::vector<double> TotalStressDeparture(const std::vector<double>& y, const std::vector<double>& u,
                                         const std::vector<double>& uv, double viscosity,
                                         double friction_velocity, double half_height);

// Linear interpolation in a table of (x, value) rows sorted by x; NaN outside its range.
double Interpolate(const std::vector<std::pair<double, double>>& table, double x);

// A two-column text table (x value per line, '#' comments), e.g. a published profile in wall
// units, sorted by x; an error when a line is not two numbers or there are no rows.
Result<std::vector<std::pair<double, double>>> ReadProfileTable(const std::string& text);

}  // namespace plateau

#endif  // PLATEAU_CORE_PROFILE_ANALYSIS_H_
