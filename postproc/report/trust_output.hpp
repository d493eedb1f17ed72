// Output of the trust studies: uncertainty bands and sensitivity, grid convergence (GCI).
#pragma once

#include <string>

#include "solver/studies/grid_check.hpp"
#include "postproc/io/h5_writer.hpp"
#include "solver/studies/uncertainty.hpp"

namespace oxystrat {

std::string uncertainty_text(const UncertaintyResult& u);
void write_uncertainty_h5(H5Writer& h5, const UncertaintyResult& u);
void write_uncertainty_csv(const std::string& path, const UncertaintyResult& u);
std::string uncertainty_html(const UncertaintyResult& u, double critical_do_mol_m3);

std::string grid_check_text(const GridCheck& g);
void write_grid_check_h5(H5Writer& h5, const GridCheck& g);
std::string grid_check_html(const GridCheck& g);

}  // namespace oxystrat
