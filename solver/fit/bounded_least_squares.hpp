// Nonlinear least squares with simple bounds: Levenberg-Marquardt with projection. Kept as our own
// because the fits need bounds (kLa > 0, probe lag >= 0, the step time inside the trace) and
// Eigen's unsupported LevenbergMarquardt has none: unbounded, a noisy or short trace walks the
// probe lag below zero, where the step response has no meaning.
#pragma once

#include <Eigen/Core>
#include <functional>
#include <vector>

namespace oxystrat {

//! Residuals r(p) (model - measured) and, when J is given, dr/dp for every parameter.
using Residuals = std::function<void(const Eigen::VectorXd& p, Eigen::VectorXd& r, Eigen::MatrixXd* J)>;

struct LeastSquaresResult {
  Eigen::VectorXd p;
  double cost = 0.0;  //!< 0.5 |r|^2 at p
  int iterations = 0;
  bool converged = false;
};

//! Minimises 0.5 |r(p)|^2 over the parameters marked `free` (the others held at their start
//! value), within lo <= p <= hi: a parameter on its bound whose gradient points outwards sits out
//! the step. Column scaling by the largest Jacobian column norm seen (More 1978); damping update
//! of Nielsen (1999). Converged when the residual is orthogonal to every free column (cosine
//! 1e-10), when steps no longer move the parameters or the cost, or at a minimum where no step
//! lowers the cost (cosine 1e-6).
LeastSquaresResult bounded_levenberg_marquardt(const Residuals& f, Eigen::VectorXd p, const std::vector<bool>& free,
                                               const Eigen::VectorXd& lo, const Eigen::VectorXd& hi, int max_iterations);

//! The positions of the free parameters.
std::vector<int> free_indices(const std::vector<bool>& free);

}  // namespace oxystrat
