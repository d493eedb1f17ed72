// The step response of a first-order DO probe in a liquid that approaches its steady level at rate
// kLa after aeration resumes: the model of the gassing-out method (Badino, Facciotti & Schmidell
// 2000, J. Chem. Technol. Biotechnol. 75:469, as recalled). SI: time [s], rates [1/s].
#pragma once

namespace oxystrat {

//! Response of the probe reading to a unit step of the liquid concentration at s = 0, with the
//! liquid approaching its steady value at rate kLa and the probe lagging with time constant
//! tau_p: g(s) = (C_inf - C_p)/(C_inf - C0) = [exp(-kLa s) - kLa tau_p exp(-s/tau_p)] / (1 - kLa tau_p)
//! (docs/method.md, section 14), which is symmetric in kLa and 1/tau_p and tends to (1 + kLa s) exp(-kLa s) as
//! kLa tau_p -> 1; evaluated without cancellation near that limit. g = 1 for s <= 0.
//! s [s], kla [1/s], tau_p [s] (0: no lag).
double probe_step_response(double s, double kla_1_s, double tau_p_s);

//! g and its partial derivatives with respect to s [1/s], kLa [s] and tau_p [1/s].
struct StepResponse {
  double g = 1.0, d_s = 0.0, d_kla = 0.0, d_tau = 0.0;
};
StepResponse probe_step_response_derivatives(double s, double kla_1_s, double tau_p_s);

}  // namespace oxystrat
