#include "input/case_reader.hpp"

#include <fmt/format.h>

#include <sstream>

#include "input/case_cross_checks.hpp"
#include "input/case_sections.hpp"
#include "input/input_file.hpp"
#include "input/limits_reader.hpp"
#include "input/toml_source.hpp"

namespace oxystrat {

using namespace detail;

Override parse_override(std::string_view argument) {
  const auto eq = argument.find('=');
  if (eq == std::string_view::npos || eq == 0) {
    throw CaseError(fmt::format("--set '{}': expected KEY=VALUE, e.g. --set operation.speed=\"110 rpm\"", argument));
  }
  auto trim = [](std::string_view s) {
    while (!s.empty() && s.front() == ' ') s.remove_prefix(1);
    while (!s.empty() && s.back() == ' ') s.remove_suffix(1);
    return std::string(s);
  };
  return Override{trim(argument.substr(0, eq)), trim(argument.substr(eq + 1)), std::string(argument)};
}

LoadedCase read_case_text(const std::string& text, const std::string& file_name,
                          const std::vector<Override>& overrides) {
  toml::table root;
  try {
    root = toml::parse(text, file_name);
  } catch (const toml::parse_error& e) {
    throw CaseError(fmt::format("{}:{}: not valid TOML: {}", file_name, e.source().begin.line, e.description()));
  }
  LoadedCase out;
  out.included_files = merge_includes(root, file_name);
  TomlSource src(std::move(root), file_name);
  for (const auto& o : overrides) {
    src.apply(o);
    out.overrides.push_back(o.raw);
  }
  Case& c = out.data;
  c.title = src.string("title").value_or("untitled case");
  read_vessel(src, c);
  read_broth(src, c);
  read_impellers(src, c);
  read_sparger(src, c);
  read_operation(src, c);
  read_do_calibration(src, c);
  read_culture(src, c);
  read_feed(src, c);
  read_numerics(src, c);
  read_constraints(src, c);
  read_control(src, c);
  read_design_limits(src, c);  // heat, shear, cost (input/limits_reader.cpp)
  src.check_no_unknown_keys();
  check_geometry(src, c, out.notes);
  leave_out_uncovered_impellers(src, c, out.notes);
  note_ignored_keys(src, c, out.notes);
  check_control_limits(src, c);
  check_gas_and_boiling(src, c, out.notes);
  check_events(src, c, text, file_name, overrides);
  out.file_name = file_name;
  out.source_text = text;
  std::ostringstream os;
  os << src.root();
  out.effective_text = os.str();
  return out;
}

std::optional<std::string> raw_value(const LoadedCase& loaded, const std::string& key) {
  TomlSource src(toml::parse(loaded.effective_text, loaded.file_name), loaded.file_name);
  if (!src.has(key)) return std::nullopt;
  if (const auto s = src.string_if_string(key)) return s;
  return src.text_of(key);
}

LoadedCase read_case_file(const std::string& path, const std::vector<Override>& overrides) {
  // Not a device or a pipe, and not megabytes: a case is a few kilobytes of TOML.
  return read_case_text(read_input_file(path, "case file", 16u << 20), path, overrides);
}

}  // namespace oxystrat
