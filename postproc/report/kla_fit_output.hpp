// Output of `oxystrat kla-fit`: the fitted trace as CSV, the result in HDF5 (/kla_fit/...), the
// terminal summary and the HTML report body. Numbers are SI in HDF5 and in the trace's own DO
// unit in the CSV, the terminal and the report.
#pragma once

#include <string>

#include "postproc/io/h5_writer.hpp"
#include "solver/fit/do_trace.hpp"
#include "solver/fit/kla_fit.hpp"

namespace oxystrat {

//! time [s], DO measured, fitted and residual (fitted - measured) in the trace's DO unit.
void write_kla_fit_csv(const std::string& path, const DoTrace& trace, const KlaFitResult& fit);

//! /kla_fit/kla, kla_ci_low, kla_ci_high [1/s], probe_lag (+ _ci_low/_ci_high) [s], cstar, c0,
//! steady, time [s], measured, fitted, residual [mol/m3 or 1], and the warnings.
void write_kla_fit_h5(H5Writer& h5, const DoTrace& trace, const KlaFitOptions& options, const KlaFitResult& fit);

//! Lines for the terminal: kLa in 1/s and 1/h with its interval, tau_p, C*, RMS, points.
std::string kla_fit_text(const DoTrace& trace, const KlaFitOptions& options, const KlaFitResult& fit);

//! The report body: result table, warnings, the trace with the fit, the residuals, the method.
std::string kla_fit_report_body(const DoTrace& trace, const KlaFitOptions& options, const KlaFitResult& fit);

}  // namespace oxystrat
