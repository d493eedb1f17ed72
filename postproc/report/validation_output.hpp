// The verification and validation tables: CSV, HTML report, HDF5 and terminal text.
#pragma once

#include <string>
#include <vector>

#include "postproc/io/h5_writer.hpp"
#include "solver/studies/validation.hpp"

namespace oxystrat {

struct ValidationTally {
  int verification_checks = 0, verification_failed = 0;  //!< verification and calibration
  int validation_rows = 0, inside_band = 0, errors = 0;  //!< errors: rows the model could not compute
};
ValidationTally tally(const std::vector<ValidationResult>& results);

void write_validation_csv(const std::string& path, const std::vector<ValidationResult>& results);
void write_validation_h5(H5Writer& h5, const std::vector<ValidationResult>& results);
std::string validation_html(const std::vector<ValidationResult>& results);
std::string validation_text(const std::vector<ValidationResult>& results);

}  // namespace oxystrat
