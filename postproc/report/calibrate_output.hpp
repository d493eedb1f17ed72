// Output of `oxystrat calibrate`: the case fragment with the fitted [model] keys (calibration.toml),
// measured against fitted per point (calibration.csv, mixing.csv), the result in HDF5
// (/calibration/...), the terminal table and the HTML report body. SI in HDF5 and in the
// fragment; 1/h, rpm, vvm, kW/m3 and mm/s for people.
#pragma once

#include <string>

#include "solver/studies/calibrate_exchange.hpp"
#include "solver/studies/calibrate_kla.hpp"
#include "postproc/io/h5_writer.hpp"

namespace oxystrat {

//! Where the calibration came from, for the fragment's header and the report.
struct CalibrationSources {
  std::string case_file;
  std::string kla_data;     //!< empty: no kLa calibration
  std::string mixing_data;  //!< empty: no mixing calibration
  std::string date_utc;     //!< "2026-12-02 01:40 UTC"
};

//! The case fragment: a header comment (sources, date, ranges covered, fit statistics, how to
//! include it) and a [model] table with kla_prefactor, kla_power_exponent, kla_gas_exponent
//! (when kLa was calibrated) and exchange_constant (when mixing times were). Either may be null.
std::string calibration_toml(const CalibrationSources& src, const KlaCalibration* kla, const MixingCalibration* mix);

//! One row per kLa point: name, line, speed [rpm], gas flow [vvm], Pg/V [W/m3], vs [m/s],
//! kLa measured, fitted, before, zone-model mean [1/h], residual ln(fitted/measured) [-], weight.
void write_kla_calibration_csv(const std::string& path, const KlaCalibration& kla);
//! One row per mixing point: name, line, speed [rpm], gas flow [vvm], theta measured, fitted,
//! before [s], residual [-], sensitivity d ln theta / d ln c_t [-], weight.
void write_mixing_calibration_csv(const std::string& path, const MixingCalibration& mix);

//! /calibration/kla/... and /calibration/mixing/... (each dataset with units), and the sources.
void write_calibration_h5(H5Writer& h5, const CalibrationSources& src, const KlaCalibration* kla,
                          const MixingCalibration* mix);

//! The terminal summary: the constants with intervals, fit statistics, ranges, the point table.
std::string calibration_text(const CalibrationSources& src, const KlaCalibration* kla, const MixingCalibration* mix);

//! The report body: tables, warnings, parity plots and residuals, the method.
std::string calibration_report_body(const CalibrationSources& src, const KlaCalibration* kla,
                                    const MixingCalibration* mix);

}  // namespace oxystrat
