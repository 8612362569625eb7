// Two-sided quantiles of Student's t (Boost.Math) for confidence intervals. Pure; stateless.
#ifndef PLATEAU_CORE_STUDENT_T_H_
#define PLATEAU_CORE_STUDENT_T_H_

namespace plateau {

// q such that P(|T| <= q) = confidence for T ~ t(degrees_of_freedom); an infinite number of degrees
// of freedom gives the normal quantile. NaN for confidence outside (0, 1) or dof <= 0.
double TwoSidedStudentQuantile(double confidence, double degrees_of_freedom);

// Two-sided p-value of a standard normal score: P(|Z| >= |z|).
double TwoSidedNormalPValue(double z);

// Two-sided p-value of a t score: P(|T| >= |t|) for T ~ t(degrees_of_freedom); NaN for dof <= 0.
double TwoSidedStudentPValue(double t, double degrees_of_freedom);

// How well a half-width is itself known: the relative standard deviation of a standard error whose
// variance estimate has `degrees_of_freedom` (chi-square/nu has variance 2/nu; the square root halves
// the relative spread): 1 / sqrt(2 nu), 0.16 at 20 degrees of freedom. 0 for infinitely many, NaN
// for nu <= 0.
double HalfWidthUncertainty(double degrees_of_freedom);

}  // namespace plateau

#endif  // PLATEAU_CORE_STUDENT_T_H_
