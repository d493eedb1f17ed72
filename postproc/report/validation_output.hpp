// The validation table: CSV, HTML report, HDF5 and terminal text of every published check.
#pragma once

#include <string>
#include <vector>

#include "postproc/io/h5_writer.hpp"
#include "solver/studies/validation.hpp"

namespace oxystrat {

void write_validation_csv(const std::string& path, const std::vector<ValidationResult>& results);
void write_validation_h5(H5Writer& h5, const std::vector<ValidationResult>& results);
std::string validation_html(const std::vector<ValidationResult>& results);
std::string validation_text(const std::vector<ValidationResult>& results);

}  // namespace oxystrat
