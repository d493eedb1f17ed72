// A valid case as TOML text, with small edits that break one thing at a time, and a helper that
// returns the reader's error message. Line numbers are looked up in the edited text, so a test
// can assert "case.toml:<line>" without hard-coding it.
#pragma once

// Project headers before GoogleTest's: see unit_check.hpp on `si_value`.
#include "input/case_reader.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace oxystrat::test {

//! The file name the reader is given; every message must carry it.
inline const std::string kCaseFile = "case.toml";

//! Invented numbers: a 1 m vessel, H/T = 1.5, two impellers, a ring sparger. Every value in it
//! is written once, so each edit below names exactly one line.
inline const std::string kBaseCase = R"toml(# Test case: invented numbers.
title = "test vessel"

[vessel]
diameter = "1.0 m"
liquid_height = "1.5 m"
bottom = "ellipsoidal"
baffles = 4
baffle_width = "0.1 m"
head_pressure = "0.5 bar(g)"
temperature = "30 degC"

[[impeller]]
type = "rushton"
diameter = "0.35 m"
elevation = "0.4 m"

[[impeller]]
type = "pitched-blade-down"
diameter = "0.30 m"
elevation = "1.0 m"

[sparger]
type = "ring"
elevation = "0.25 m"
diameter = "0.28 m"

[operation]
speed = "150 rpm"
gas_flow = "0.5 vvm"

[broth]
density = "1030 kg/m3"
viscosity = "2 mPa s"

[culture]
biomass = "20 g/L"
q_o2_max = "4 mmol/g/h"
k_o2 = "0.002 mmol/L"
critical_do = "0.02 mmol/L"

[grid]
radial = 6
axial = 12
)toml";

//! The sparger block of kBaseCase, for tests that remove it.
inline const std::string kSpargerBlock = "[sparger]\ntype = \"ring\"\nelevation = \"0.25 m\"\ndiameter = \"0.28 m\"\n";

class CaseText {
 public:
  CaseText() : text_(kBaseCase) {}
  explicit CaseText(std::string text) : text_(std::move(text)) {}

  //! Replaces the one occurrence of `old_text` (throws when it is absent or not unique).
  CaseText& replace(std::string_view old_text, std::string_view new_text) {
    const auto pos = unique_position(old_text);
    text_.replace(pos, old_text.size(), new_text);
    return *this;
  }
  //! Removes the whole line holding `needle`.
  CaseText& remove_line(std::string_view needle) {
    const auto pos = unique_position(needle);
    const auto begin = text_.rfind('\n', pos) + 1;  // npos + 1 == 0 on the first line
    const auto end = text_.find('\n', pos);
    text_.erase(begin, end - begin + 1);
    return *this;
  }
  //! Inserts `line` after the line holding `needle`.
  CaseText& insert_after(std::string_view needle, std::string_view line) {
    const auto pos = unique_position(needle);
    const auto end = text_.find('\n', pos);
    text_.insert(end + 1, std::string(line) + "\n");
    return *this;
  }
  //! 1-based line of the line holding `needle`.
  int line_of(std::string_view needle) const {
    const auto pos = unique_position(needle);
    int line = 1;
    for (size_t i = 0; i < pos; ++i) line += text_[i] == '\n' ? 1 : 0;
    return line;
  }
  //! "case.toml:<line>" of the line holding `needle`.
  std::string where(std::string_view needle) const { return kCaseFile + ":" + std::to_string(line_of(needle)); }
  const std::string& str() const { return text_; }

 private:
  size_t unique_position(std::string_view s) const {
    const auto pos = text_.find(s);
    if (pos == std::string::npos || text_.find(s, pos + 1) != std::string::npos) {
      throw std::logic_error("test setup: '" + std::string(s) + "' is not in the case text exactly once");
    }
    return pos;
  }
  std::string text_;
};

inline LoadedCase load(const CaseText& c, const std::vector<std::string>& sets = {}) {
  std::vector<Override> overrides;
  for (const auto& s : sets) overrides.push_back(parse_override(s));
  return read_case_text(c.str(), kCaseFile, overrides);
}

//! The CaseError message the reader gives, or a test failure (and "") when it accepts the case.
inline std::string error_of(const CaseText& c, const std::vector<std::string>& sets = {}) {
  try {
    load(c, sets);
  } catch (const CaseError& e) {
    return e.what();
  }
  ADD_FAILURE() << "the case was accepted, but an error was expected";
  return "";
}

}  // namespace oxystrat::test
