// The one error hierarchy of oxystrat. Every message is complete and meant for the user as it is;
// the command line prints it on one line and exits 1.
#pragma once

#include <stdexcept>

namespace oxystrat {

//! Base of every error oxystrat raises on purpose.
class Error : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

//! Bad input: a case file, a --set argument, a data file or an option. The message names the
//! file (and line) or option, the key, the value, and the expected unit and range.
class CaseError : public Error {
 public:
  using Error::Error;
};

//! A unit that cannot be read; the case reader adds file and key before it reaches the user.
class UnitError : public Error {
 public:
  using Error::Error;
};

//! A computation that did not succeed (a solve, a fit); the message says what to try.
class SolveError : public Error {
 public:
  using Error::Error;
};

//! A file that could not be written or read back (disk full, permissions, a vanished folder).
class IoError : public Error {
 public:
  using Error::Error;
};

}  // namespace oxystrat
