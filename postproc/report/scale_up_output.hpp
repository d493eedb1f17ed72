// The scale-up table as text, CSV, /scale_up in result.h5 (SI) and the report's section.
#pragma once

#include <string>

#include "postproc/io/h5_writer.hpp"
#include "solver/studies/scale_up.hpp"

namespace oxystrat {

std::string scale_up_text(const Case& pilot, const Case& production, const ScaleUpStudy& s);
void write_scale_up_csv(const std::string& path, const ScaleUpStudy& s);
void write_scale_up_h5(H5Writer& h5, const ScaleUpStudy& s);
std::string scale_up_report_body(const Case& pilot, const Case& production, const ScaleUpStudy& s);

}  // namespace oxystrat
