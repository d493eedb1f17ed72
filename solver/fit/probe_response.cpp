#include "solver/fit/probe_response.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {
namespace {

// phi(x) = (1 - e^-x)/x and phi'(x); the power series near 0 avoids the cancellation.
void phi_and_derivative(double x, double& phi, double& dphi) {
  if (std::abs(x) < 0.5) {
    // phi = sum_n c_n x^n, c_n = (-1)^n/(n+1)!; 25 terms leave < 1e-30 for |x| < 0.5.
    phi = 0.0;
    dphi = 0.0;
    double c = 1.0, xn = 1.0, xn_1 = 0.0;
    for (int n = 0; n < 25; ++n) {
      phi += c * xn;
      if (n >= 1) dphi += n * c * xn_1;
      xn_1 = xn;
      xn *= x;
      c *= -1.0 / (n + 2);
    }
    return;
  }
  const double em = std::exp(-x);
  phi = -std::expm1(-x) / x;
  dphi = (em * (1.0 + x) - 1.0) / (x * x);
}

}  // namespace

StepResponse probe_step_response_derivatives(double s, double kla, double tau) {
  StepResponse g;
  if (s <= 0.0) return g;  // before the step the probe reads C0; the step response starts flat
  const double a = kla;
  if (tau <= 0.0 || a * tau < 1e-12) {
    // No lag (or one too small to matter in double precision): g = exp(-a s).
    const double e = std::exp(-a * s);
    g.g = e;
    g.d_s = -a * e;
    g.d_kla = -s * e;
    g.d_tau = a * e;  // one-sided derivative at tau = 0+, from g ~ exp(-a s) (1 + a tau)
    return g;
  }
  const double b = 1.0 / tau;
  if (std::min(a, b) * s > 600.0) {
    g.g = 0.0;  // both exponentials below 1e-260: the step is complete
    return g;
  }
  const double d = b - a;
  if (std::abs(d) <= 0.1 * std::max(a, b)) {
    // Near kLa tau_p = 1: g = e^{-as} (1 + a s phi(d s)), phi(x) = (1 - e^-x)/x, exact and free of
    // the 0/0 of the textbook form; at d = 0 it is the (1 + kLa t) e^{-kLa t} limit.
    double phi = 0.0, dphi = 0.0;
    phi_and_derivative(d * s, phi, dphi);
    const double e = std::exp(-a * s);
    g.g = e * (1.0 + a * s * phi);
    g.d_s = -a * b * s * e * phi;
    g.d_kla = e * (-s - a * s * s * phi + s * phi - a * s * s * dphi);
    const double d_b = e * a * s * s * dphi;
    g.d_tau = -b * b * d_b;
    return g;
  }
  const double ea = std::exp(-a * s), eb = std::exp(-b * s);
  g.g = (b * ea - a * eb) / d;
  g.d_s = a * b * (eb - ea) / d;
  g.d_kla = b * (ea - eb - s * d * ea) / (d * d);
  const double d_b = a * (eb - ea + s * d * eb) / (d * d);
  g.d_tau = -b * b * d_b;
  return g;
}

double probe_step_response(double s, double kla, double tau) { return probe_step_response_derivatives(s, kla, tau).g; }

}  // namespace oxystrat
