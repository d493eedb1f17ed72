// A DO probe in a liquid after aeration resumes, integrated numerically: the reference the tests of
// the closed-form step response and of the kLa fit compare with.
#pragma once

#include <cmath>
#include <vector>

namespace oxystrat::test {

// Liquid C and probe Cp: dC/dt = kLa (C* - C) - OUR, tau_p dCp/dt = C - Cp (docs/method.md, section 14),
// integrated by classical RK4 with step h from C = Cp = c0 at t = 0. Returns Cp at multiples of
// `every` up to `duration`. Independent of the closed form under test.
inline std::vector<double> rk4_probe(double kla, double tau, double cstar, double c0, double our, double h, double every,
                                     double duration) {
  auto f = [&](double c, double cp, double& dc, double& dcp) {
    dc = kla * (cstar - c) - our;
    dcp = tau > 0.0 ? (c - cp) / tau : 0.0;
  };
  std::vector<double> out{c0};
  double c = c0, cp = c0;
  const int per_sample = static_cast<int>(std::lround(every / h));
  const int samples = static_cast<int>(std::lround(duration / every));
  for (int k = 0; k < samples; ++k) {
    for (int j = 0; j < per_sample; ++j) {
      double k1c, k1p, k2c, k2p, k3c, k3p, k4c, k4p;
      f(c, cp, k1c, k1p);
      f(c + 0.5 * h * k1c, cp + 0.5 * h * k1p, k2c, k2p);
      f(c + 0.5 * h * k2c, cp + 0.5 * h * k2p, k3c, k3p);
      f(c + h * k3c, cp + h * k3p, k4c, k4p);
      c += h / 6.0 * (k1c + 2.0 * k2c + 2.0 * k3c + k4c);
      cp += h / 6.0 * (k1p + 2.0 * k2p + 2.0 * k3p + k4p);
    }
    out.push_back(tau > 0.0 ? cp : c);
  }
  return out;
}

}  // namespace oxystrat::test
