// Output of the lifeline statistics: HDF5 /lifelines, CSV, report section, terminal text.
#pragma once

#include <string>

#include "postproc/io/h5_writer.hpp"
#include "solver/studies/lifelines.hpp"
#include "solver/studies/lifelines_study.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

//! Terminal text: the DO lines as before (critical DO in mol/m3 = mmol/L), then every other field,
//! the long excursions and the regime passages.
std::string lifeline_text(const LifelineResult& r, double critical_do_mol_m3);
//! Terminal text of `oxystrat lifelines`: where the fields came from (the frozen transient's
//! operating point, or what is missing), the case title, lifeline_text, and for a fed case
//! followed through the steady field how to follow the substrate.
std::string lifeline_study_text(const Case& c, const LifelineStudy& s);
//! /lifelines/...: the former datasets (DO from the field "do"; zeros and empty without it), then
//! /lifelines/fields/NAME/... for every field and /lifelines/regimes/... (docs/outputs.md, "lifelines").
void write_lifelines_h5(H5Writer& h5, const LifelineResult& r, const LifelineOptions& o,
                        const LifelineRegimes& regimes);
//! Per cell: share of time below critical DO (and outside each other field); and the kept trajectories (time, zone, DO).
void write_lifelines_csv(const std::string& cells_path, const std::string& paths_path, const LifelineResult& r,
                         const std::vector<double>& do_mol_m3);
//! The report's body; `cautions` (the state's, LifelineStudy::cautions) listed at its end.
std::string lifeline_html(const LifelineResult& r, const ZoneNetwork& net, const std::vector<double>& do_mol_m3,
                          double critical_do_mol_m3, const std::vector<std::string>& cautions);

}  // namespace oxystrat
