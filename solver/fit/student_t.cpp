#include "solver/fit/student_t.hpp"

#include <boost/math/distributions/students_t.hpp>
#include <stdexcept>

namespace oxystrat {

double student_t_cdf(double t, double dof) {
  if (!(dof > 0.0)) throw std::invalid_argument("student_t_cdf: degrees of freedom must be positive");
  return boost::math::cdf(boost::math::students_t(dof), t);
}

double student_t_quantile(double p, double dof) {
  if (!(p > 0.0 && p < 1.0)) throw std::invalid_argument("student_t_quantile: p must be in (0, 1)");
  if (!(dof > 0.0)) throw std::invalid_argument("student_t_quantile: degrees of freedom must be positive");
  return boost::math::quantile(boost::math::students_t(dof), p);
}

}  // namespace oxystrat
