// Student's t distribution for the confidence intervals of the fits (kLa traces, calibration).
#pragma once

namespace oxystrat {

//! P(T <= t) for `dof` > 0 degrees of freedom (Boost.Math).
double student_t_cdf(double t, double dof);
//! Its inverse: the quantile t_p for 0 < p < 1 (Boost.Math).
double student_t_quantile(double p, double dof);

}  // namespace oxystrat
