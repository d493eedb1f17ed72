// Inside the case reader (input/case_reader.hpp): one function per table of the case file, each
// reading its keys with their checks into the Case, and the checks across tables. Called in the
// order read_case_text gives; a later table may use what an earlier one read (the vessel first).
// Not a public interface.
#pragma once

#include <toml++/toml.h>

#include <optional>
#include <string>
#include <vector>

#include "input/case.hpp"
#include "input/toml_source.hpp"

namespace oxystrat::detail {

using units::Dimension;

// Quantities whose unit decides their meaning (input/case_quantities.cpp).

//! Gas flow [Nm3/s]: the unit decides the basis. vvm and N-prefixed units are normal volumes
//! (0 degC, 1 atm); plain volume units are actual volumes at head-space pressure and broth
//! temperature. 0 when the key is absent.
double read_gas_flow(TomlSource& src, const std::string& path, const Vessel& v);
//! A dissolved-O2 concentration [mol/m3]: molar or mass units, or "% air saturation" of the
//! case's DO basis (read_do_calibration, read before). Required; `example` shows the form.
double read_o2_concentration(TomlSource& src, const std::string& path, const Case& c, Range range,
                             const std::string& example);
//! A partial pressure [Pa]; it needs no (a)/(g): it is absolute by nature.
std::optional<double> read_partial_pressure(TomlSource& src, const std::string& path);

// The vessel and what is in it (input/case_vessel.cpp).
void read_vessel(TomlSource& src, Case& c);
void read_impellers(TomlSource& src, Case& c);
void read_sparger(TomlSource& src, Case& c);

// How it is run and what it holds (input/case_operation.cpp).
void read_operation(TomlSource& src, Case& c);
//! What 100 % DO means ([do_calibration]): air at 1 atm, or the probe's in-vessel calibration.
void read_do_calibration(TomlSource& src, Case& c);
void read_broth(TomlSource& src, Case& c);
void read_culture(TomlSource& src, Case& c);
//! The culture's amount and uptake (input/case_culture_amounts.cpp): culture.biomass, or
//! culture.cell_density with culture.cell_dry_mass; culture.q_o2_max per dry mass, or per cell
//! with culture.cell_dry_mass. Everything leaves in SI per dry mass.
void read_culture_amounts(TomlSource& src, Culture& k);

// What changes it in time and the limits it must keep (input/case_control.cpp).
void read_feed(TomlSource& src, Case& c);
void read_constraints(TomlSource& src, Case& c);
void read_control(TomlSource& src, Case& c);

// The grid, the output and the model's constants (input/case_model.cpp).
void read_numerics(TomlSource& src, Case& c);
//! include = ["calibration.toml"]: [model] keys kept in other files (e.g. the fragment `oxystrat
//! calibrate` writes), paths relative to the case file's folder. Included keys are defaults: the
//! case's own keys and --set override them. An included file may hold only a [model] table, so
//! includes do not nest and cannot form cycles. Each file is checked on its own first, so a bad
//! value is reported at its own file and line. Returns the included files as the case names them.
std::vector<std::string> merge_includes(toml::table& root, const std::string& file_name);

//! Geometry that the single keys cannot check alone (input/case_checks.cpp): errors, and notes
//! for what is allowed but outside the correlations' range.
void check_geometry(const TomlSource& src, const Case& c, std::vector<std::string>& notes);
//! Impellers wholly above the liquid surface (a vessel filled below them; allowed when the case
//! gives vessel.straight_side) are removed from the case with a note: they stir nothing. Called
//! after check_geometry (input/case_checks.cpp).
void leave_out_uncovered_impellers(const TomlSource& src, Case& c, std::vector<std::string>& notes);
//! Keys that have no effect are ignored with a note: those of another flow curve (left over when
//! --set switches broth.rheology) and model keys no model uses (input/case_checks.cpp).
void note_ignored_keys(const TomlSource& src, const Case& c, std::vector<std::string>& notes);

}  // namespace oxystrat::detail
