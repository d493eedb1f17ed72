// The checks the model makes, in one list with two kinds of evidence: verification (the code
// does what its equations say: identities, analytic limits, conservation, calibration fits) and
// validation (the model against values measured in published experiments, each with its source,
// conditions and an acceptance band fixed before the comparison). One source of truth for
// `oxystrat validate` and tests/solver/studies/validation_test.cpp.
#pragma once

#include <functional>
#include <string>
#include <vector>

namespace oxystrat {

enum class CheckKind {
  verification,  //!< identity, analytic limit, conservation, reference check value of a formula
  calibration,   //!< a point the model's constant was fitted to: shows the fit, proves nothing
  validation,    //!< a measured value (or a correlation of measured data, said so in `source`)
};

struct ValidationCheck {
  CheckKind kind = CheckKind::verification;
  std::string group;       //!< solubility, power, gassed power, mixing time, holdup, heat, conservation ...
  std::string quantity;    //!< what is compared
  std::string conditions;  //!< the experiment's conditions (validation rows)
  std::string source;      //!< authors, year, table/equation; tag [pub]/[sec]/[mem]/[calc]/common practice
  std::string unit;        //!< unit of the reference and model values
  double reference = 0.0;  //!< measured, published or analytic value
  double tolerance = 0.0;  //!< acceptance band on |model - reference| (absolute, in `unit`) ...
  bool relative = false;   //!< ... or relative to the reference when true
  std::string why;         //!< why this band (measurement scatter, model accuracy or round-off)
  std::string known_miss;  //!< validation rows only: why the model misses, when it does (kept visible)
  std::function<double()> model;  //!< computes the model's value
};

struct ValidationResult {
  const ValidationCheck* check = nullptr;
  double model = 0.0;
  bool computed = false;  //!< false: the model threw (its message in `failure`)
  std::string failure;
  double error = 0.0;     //!< model - reference (relative when the check is relative)
  bool passed = false;
};

//! Error statistics of the validation rows of one group (relative errors, model - measured).
struct ValidationStatistics {
  std::string group;
  int rows = 0;
  int inside_band = 0;
  double mean_error = 0.0;      //!< bias
  double mean_abs_error = 0.0;
  double max_abs_error = 0.0;
};

//! Every check, verification first, then validation, in report order.
const std::vector<ValidationCheck>& validation_checks();

//! Runs one check; a model that throws counts as failed, with no value.
ValidationResult run_check(const ValidationCheck& c);

//! Per group of validation rows (in order of first appearance); relative errors only.
std::vector<ValidationStatistics> validation_statistics(const std::vector<ValidationResult>& results);

const char* kind_name(CheckKind k);

namespace detail {
ValidationCheck make_check(CheckKind kind, std::string group, std::string quantity, std::string source,
                           std::string unit, double reference, double tolerance, bool relative, std::string why,
                           std::function<double()> model);
std::vector<ValidationCheck> verification_checks();
std::vector<ValidationCheck> measured_checks();
}  // namespace detail

}  // namespace oxystrat
