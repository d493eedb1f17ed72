// The verdict and the operating point, first in the terminal and in the report.
#pragma once

#include <string>

#include "input/case.hpp"
#include "postproc/io/h5_writer.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/verdict.hpp"

namespace oxystrat {

//! The operating point as an engineer states it: speed, gas in vvm, Nm3/h and actual m3/h at the
//! sparger, O2 fraction, head pressure, impellers, biomass.
std::string operating_point_text(const Case& c);
//! For a cell culture (kind "cell") with a cell dry mass: its biomass back in cells/mL and its
//! q_O2,max per cell, one line; "" otherwise.
std::string cell_culture_text(const Culture& k);
std::string verdict_text(const Case& c, const Verdict& v);
std::string verdict_html(const Case& c, const Verdict& v);
//! /verdict in result.h5: meets, headline, binding, advice, the starved region (SI) and every
//! constraint check.
void write_verdict_h5(H5Writer& h5, const Verdict& v);

//! The box every report opens with: one bold sentence (green edge when `ok`, red when not) and a
//! second paragraph with what follows from it. Plain text in, escaped here.
std::string verdict_box_html(bool ok, const std::string& headline, const std::string& detail);

}  // namespace oxystrat
