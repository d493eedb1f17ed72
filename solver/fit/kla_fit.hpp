// kLa from a measured dissolved-oxygen trace (solver/fit/do_trace.hpp) by the dynamic
// gassing-out method: a nonlinear least-squares fit of the step response of the liquid seen
// through a first-order probe (solver/fit/probe_response.hpp). SI inside: time [s], rates [1/s].
//
// The DO column is either a concentration [mol/m3] or a fraction of air saturation [1] (a trace
// in %); the fit does not need to know which, because the model is linear in the DO scale. Only
// uptake rates and a given C* must be in the same kind of quantity as the trace.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "solver/fit/do_trace.hpp"

namespace oxystrat {

enum class ProbeLagMode {
  fitted,  //!< tau_p is an unknown of the fit
  fixed,   //!< tau_p is given (measured separately)
  none,    //!< tau_p = 0: the probe is taken as instantaneous
};

struct KlaFitOptions {
  ProbeLagMode lag_mode = ProbeLagMode::fitted;
  double probe_lag_s = 0.0;         //!< tau_p for ProbeLagMode::fixed [s]
  std::optional<double> saturation; //!< given C* [mol/m3] or [1] (trace scale); fitted when absent
  double uptake = 0.0;              //!< OUR during the rise [mol/(m3 s)] or [1/s] (trace scale)
  int max_iterations = 200;         //!< Levenberg-Marquardt iterations per start
  double confidence = 0.95;         //!< of the intervals
};

struct KlaFitResult {
  double kla_1_s = 0.0;                    //!< [1/s]
  double kla_ci_low_1_s = 0.0, kla_ci_high_1_s = 0.0;  //!< interval [1/s] (infinite when undetermined)
  double probe_lag_s = 0.0;                //!< tau_p fitted, given or 0 [s]
  double probe_lag_ci_low_s = 0.0, probe_lag_ci_high_s = 0.0;  //!< [s]; equal to tau_p unless fitted
  double cstar = 0.0;                      //!< C* [mol/m3] or [1]
  double cstar_ci_low = 0.0, cstar_ci_high = 0.0;  //!< equal to C* when given
  double steady = 0.0;                     //!< C* - OUR/kLa, the level the trace approaches
  double c0 = 0.0;                         //!< liquid and probe level at the step
  double step_time_s = 0.0;                //!< t0: the step, where aeration resumes [s]
  bool step_at_first_row = false;          //!< t0 sits on the first row (no-lag fits: C0 absorbs it)
  double rms = 0.0;                        //!< residual root mean square [trace scale]
  double kla_tau = 0.0;                    //!< kLa tau_p [-]
  int points = 0, parameters = 0, iterations = 0;
  double t_quantile = 0.0;                 //!< Student-t quantile used for the intervals
  std::vector<double> fitted, residual;    //!< per row: model and model - measured [trace scale]
  std::vector<std::string> warnings;       //!< complete sentences for the user
  std::vector<std::string> free_parameters;  //!< names of the fitted unknowns
};

//! Fits kLa (and C*, C0, the step time t0, tau_p as configured) to the trace by Levenberg-
//! Marquardt with the analytic Jacobian, from several start values derived from a log-linear fit
//! of the 10-90 % part of the rise. Model: the probe reads C0 until t0, then
//! C_inf - (C_inf - C0) g(t - t0), C_inf = C* - OUR/kLa. Intervals from s^2 (J^T J)^-1 with the
//! Student-t quantile. With a fitted lag the probe is taken as the faster of the two first-order
//! processes (kLa tau_p <= 1): the step response alone cannot tell kLa from 1/tau_p. Throws
//! CaseError for a trace that is too short or not rising and SolveError when the fit fails.
KlaFitResult fit_kla(const DoTrace& trace, const KlaFitOptions& options);

//! Model values at the given times for a result (used for plots and tests).
std::vector<double> kla_model_values(const KlaFitResult& r, const std::vector<double>& time_s);

}  // namespace oxystrat
