// Output of a design's other limits (heat, shear, cost): HDF5 /summary, /fields and /impellers
// datasets with units, the terminal lines of `run`, VTK arrays and the report section.
#pragma once

#include <string>
#include <vector>

#include "input/case.hpp"
#include "postproc/io/h5_writer.hpp"
#include "postproc/io/vtk_writer.hpp"
#include "postproc/report/svg_plot.hpp"
#include "solver/oxygen/case_run.hpp"

namespace oxystrat {

//! Values that do not apply (no [cooling], no [prices]) are not written.
void write_limits_h5(H5Writer& h5, const Case& c, const CaseRun& run);

//! Heat, shear and cost lines of the terminal summary.
std::string limits_summary(const Case& c, const CaseRun& run);

//! kolmogorov_length_um and turbulent_stress per zone.
std::vector<CellArray> limits_cell_arrays(const CaseRun& run);

//! The report section: the three balances as tables, the zones near a shear limit, a map of the
//! Kolmogorov length.
std::string limits_report_html(const Case& c, const CaseRun& run, const std::vector<svg::Outline>& outlines);

//! Zones within a factor 2 in dissipation of a shear limit of the case (max_dissipation, or
//! min_kolmogorov_length: 2^(1/4) in length), largest dissipation first, at most 8; empty without
//! a limit. `limit_text` (optional) gets the limits in words.
std::vector<int> zones_near_shear_limit(const Case& c, const CaseRun& run, std::string* limit_text = nullptr);

}  // namespace oxystrat
