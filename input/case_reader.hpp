// Reads a TOML case file (plus --set overrides) into a checked Case. Every error names the file
// and line (or the --set argument), the key, the value and what was expected.
#pragma once

#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

#include "input/case.hpp"
#include "input/errors.hpp"

namespace oxystrat {

//! One `--set KEY=VALUE` argument.
struct Override {
  std::string key;    //!< dotted path, array elements by 0-based index: "impeller.2.type"
  std::string value;  //!< as typed; parsed as a TOML value when it is one, else taken as a string
  std::string raw;    //!< the whole argument, for messages
};

//! Splits "KEY=VALUE"; throws CaseError when there is no '=' or the key is empty.
Override parse_override(std::string_view argument);

struct LoadedCase {
  Case data;
  std::string file_name;
  std::string source_text;     //!< the file as given
  std::string effective_text;  //!< the case with overrides applied, as TOML
  std::vector<std::string> overrides;  //!< the --set arguments, in order
  std::vector<std::string> notes;      //!< warnings about the input (not errors)
  std::vector<std::string> included_files;  //!< the files `include` named, as opened
};

//! The value of `key` as written in the effective case text (string values without quotes), or
//! nothing when absent: sweeps use it to find the unit a key is written in.
std::optional<std::string> raw_value(const LoadedCase& loaded, const std::string& key);

//! Reads and checks a case file.
LoadedCase read_case_file(const std::string& path, const std::vector<Override>& overrides = {});

//! Reads and checks case text; `file_name` is used in messages only.
LoadedCase read_case_text(const std::string& text, const std::string& file_name,
                          const std::vector<Override>& overrides = {});

}  // namespace oxystrat
