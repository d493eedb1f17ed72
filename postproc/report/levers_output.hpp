// The levers study as files and text: the terminal table, levers.csv, /levers in result.h5 (SI)
// and the report's section with its chart.
#pragma once

#include <string>

#include "postproc/io/h5_writer.hpp"
#include "solver/studies/levers.hpp"

namespace oxystrat {

std::string levers_text(const Case& c, const LeversStudy& s);
void write_levers_csv(const std::string& path, const LeversStudy& s);
void write_levers_h5(H5Writer& h5, const LeversStudy& s);
std::string levers_report_body(const Case& c, const LeversStudy& s);

}  // namespace oxystrat
