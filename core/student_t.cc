#include "core/student_t.h"

#include <boost/math/distributions/normal.hpp>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <limits>

namespace plateau {

double TwoSidedStudentQuantile(double confidence, double degrees_of_freedom) {
  if (!(confidence > 0.0 && confidence < 1.0) || !(degrees_of_freedom > 0.0)) {
    return std::numeric_limits<double>::quiet_NaN();
  }
  const double upper = 0.5 * (1.0 + confidence);
  if (std::isinf(degrees_of_freedom)) {
    return boost::math::quantile(boost::math::normal_distribution<double>(), upper);
  }
  return boost::math::quantile(boost::math::students_t_distribution<double>(degrees_of_freedom),
                               upper);
}

double TwoSidedNormalPValue(double z) {
  if (std::isnan(z)) return std::numeric_limits<double>::quiet_NaN();
  return 2.0 * boost::math::cdf(boost::math::complement(
                   boost::math::normal_distribution<double>(), std::fabs(z)));
}

double TwoSidedStudentPValue(double t, double degrees_of_freedom) {
  if (std::isnan(t) || !(degrees_of_freedom > 0.0)) return std::numeric_limits<double>::quiet_NaN();
  if (std::isinf(degrees_of_freedom)) return TwoSidedNormalPValue(t);
  return 2.0 * boost::math::cdf(boost::math::complement(
                   boost::math::students_t_distribution<double>(degrees_of_freedom), std::fabs(t)));
}

double HalfWidthUncertainty(double degrees_of_freedom) {
  if (!(degrees_of_freedom > 0.0)) return std::numeric_limits<double>::quiet_NaN();
  return 1.0 / std::sqrt(2.0 * degrees_of_freedom);
}

}  // namespace plateau
