// kLa from a measured dissolved-oxygen trace by the dynamic gassing-out method: the trace, as a
// plant exports it (CSV with units in the header), and a nonlinear least-squares fit of the
// step response of the liquid seen through a first-order probe (Badino, Facciotti & Schmidell
// 2000, J. Chem. Technol. Biotechnol. 75:469, as recalled). SI inside: time [s], rates [1/s].
//
// The DO column is either a concentration [mol/m3] or a fraction of air saturation [1] (a trace
// in %); the fit does not need to know which, because the model is linear in the DO scale. Only
// uptake rates and a given C* must be in the same kind of quantity as the trace.
#pragma once

#include <optional>
#include <string>
#include <vector>

namespace oxystrat {

//! What the DO column of a trace measures.
enum class DoScale {
  concentration,  //!< dissolved O2 [mol/m3]
  saturation,     //!< fraction of air saturation [1] (read from %)
};

//! A measured DO trace, SI.
struct DoTrace {
  std::string file_name;        //!< for messages
  std::vector<double> time_s;   //!< sample times, strictly increasing [s]
  std::vector<double> value;    //!< DO [mol/m3] or [1], by `scale`
  std::vector<int> line;        //!< source line of each row (1-based), for messages
  DoScale scale = DoScale::concentration;
  std::string time_header, do_header;  //!< the header cells as written ("time [min]")
  std::string time_unit, do_unit;      //!< units as written ("min", "mg/L", "%")
  double time_factor = 1.0;  //!< SI value of one time_unit [s]
  double do_factor = 1.0;    //!< SI value of one do_unit [mol/m3] or [1]
};

//! Parses a trace: optional '#' comment lines, a header row naming both columns with units
//! (`time [s],DO [%]`, `t min;DO mg/L`), then one row per sample; ',' or ';' separates the
//! columns (with ';' a decimal comma is accepted). Time in s, min or h; DO in %, % air saturation,
//! mg/L (O2, 31.9988 g/mol), mmol/L, mol/m3 and the project's other concentration units. Throws
//! CaseError naming the file, line, column and what was expected; needs at least
//! `min_trace_points` rows.
DoTrace parse_do_trace(const std::string& text, const std::string& file_name);
//! Reads and parses a trace file.
DoTrace read_do_trace(const std::string& path);
inline constexpr int min_trace_points = 10;

//! SI value of a DO quantity for a trace of the given scale: a concentration ("0.21 mmol/L",
//! "6.8 mg/L") for a concentration trace, a percentage ("100 %") for a saturation trace. `what`
//! names the option in messages. Throws CaseError.
double parse_do_value(const std::string& text, DoScale scale, const std::string& what);
//! SI uptake rate for a trace of the given scale: mmol/L/h, mmol/(L h), mol/m3/s, mol/(m3 s),
//! mg/L/h [mol/(m3 s)] for a concentration trace; %/h, %/min, %/s [1/s] for a saturation trace.
double parse_uptake_rate(const std::string& text, DoScale scale, const std::string& what);

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
