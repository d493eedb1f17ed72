// The self-contained HTML report (inline CSS and SVG, no network): for a run, a comparison of
// cases and a sweep.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/sweep.hpp"
#include "solver/studies/verdict.hpp"

namespace oxystrat {

//! One case's figures and tables: summary, DO profile with critical DO, zone map, C* and kLa
//! profiles, cautions.
//! `verdict` (optional) is shown first; without it the report makes its own. `heading`: start with
//! the case title as an h2 (off when the page title already names the case). `case_notes`: what
//! the case reader noted (LoadedCase::notes), listed first among the notes, since the report is
//! read without the terminal's warnings.
std::string run_report_body(const Case& c, const CaseRun& run, std::optional<double> theta95_s,
                            const Verdict* verdict = nullptr, bool heading = true,
                            const std::vector<std::string>& case_notes = {});

//! A complete page: title, the body, then (for zone-model reports) the method and references.
std::string report_page(const std::string& title, const std::string& body, bool zone_model_method = true);

//! Cases side by side: one table column per case, bars per configuration, DO profiles together.
struct ComparedCase {
  std::string name;
  const Case* data;
  const CaseRun* run;
  std::vector<SummaryValue> values;
  std::vector<ConstraintCheck> checks;
};
std::string compare_report_body(const std::vector<ComparedCase>& cases);
//! With --uncertainty, for a configuration that meets its constraints as computed but not across
//! the model constants' scatter (some broth below critical DO at P90): one sentence; else "".
std::string scatter_note(const std::string& name, const std::vector<SummaryValue>& values, bool meets);

//! The operating window of a sweep: feasible region, chosen point and its cautions, Pareto front,
//! the table.
std::string sweep_report_body(const SweepPlan& plan, const std::vector<PointResult>& results,
                              const std::vector<bool>& pareto, int chosen, const std::string& objective,
                              const std::vector<std::string>& chosen_cautions);

void write_text_file(const std::string& path, const std::string& text);

}  // namespace oxystrat
