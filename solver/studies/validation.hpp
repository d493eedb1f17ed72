// The list of published checks the model makes: one source of truth for `oxystrat validate`
// (which tabulates them for a reviewer) and for tests/solver/validation_test.cpp (which fails when
// any of them fails).
#pragma once

#include <functional>
#include <string>
#include <vector>

namespace oxystrat {

struct ValidationCheck {
  std::string group;      //!< solubility, power, gassed power, flooding, mixing time, kLa, conservation, limits
  std::string quantity;   //!< what is compared, with its conditions
  std::string source;     //!< authors, year, table/equation; tag [pub]/[sec]/[mem]/[calc]/common practice
  std::string unit;       //!< unit of the reference and model values
  double reference = 0.0; //!< published (or analytic) value
  double tolerance = 0.0; //!< allowed |model - reference| (absolute, in `unit`) ...
  bool relative = false;  //!< ... or relative to the reference when true
  std::string why;        //!< why this tolerance (model accuracy or round-off)
  std::function<double()> model;  //!< computes the model's value
};

struct ValidationResult {
  const ValidationCheck* check = nullptr;
  double model = 0.0;
  double error = 0.0;  //!< model - reference (relative when the check is relative)
  bool passed = false;
};

//! Every check, in report order.
const std::vector<ValidationCheck>& validation_checks();

//! Runs one check (exceptions count as failures with NaN model value).
ValidationResult run_check(const ValidationCheck& c);

}  // namespace oxystrat
