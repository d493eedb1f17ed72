// A parsed TOML case with the bookkeeping the reader needs: where each key came from (file line
// or --set argument), which keys were read, and typed access with range checks.
#pragma once

#include <toml++/toml.h>

#include <functional>
#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "input/case_reader.hpp"
#include "input/units.hpp"

namespace oxystrat::detail {

//! Closed range [lo, hi] in SI; lo_exclusive makes the lower end open (sizes must be > 0).
struct Range {
  double lo;
  double hi;
  bool lo_exclusive = false;
};

class TomlSource {
 public:
  TomlSource(toml::table root, std::string file_name);

  //! Applies one --set override; creates missing tables, indexes arrays by position.
  void apply(const Override& o);

  const toml::table& root() const { return root_; }
  const std::string& file_name() const { return file_; }

  bool has(const std::string& path) const;
  //! Number of elements of an array of tables (0 when absent).
  size_t array_size(const std::string& path) const;
  //! Number of elements of a plain list such as times = ["0 h", "2 h"] (0 when absent).
  size_t list_size(const std::string& path);
  //! Keys of a table (absent: none).
  std::vector<std::string> keys(const std::string& path) const;

  //! Quantity with a unit, converted to SI and range-checked.
  std::optional<double> quantity(const std::string& path, units::Dimension dim, Range range,
                                 double molar_mass_kg_mol = 0.0);
  double quantity_or(const std::string& path, units::Dimension dim, Range range, double fallback);
  double require_quantity(const std::string& path, units::Dimension dim, Range range,
                          const std::string& example, double molar_mass_kg_mol = 0.0);
  //! Raw text of a string key (for keys whose unit decides the meaning, like gas flow).
  std::optional<std::string> string(const std::string& path);
  //! The string at `path` if it is one (no bookkeeping, no error).
  std::optional<std::string> string_if_string(const std::string& path) const;
  //! The value at `path` written as TOML.
  std::string text_of(const std::string& path) const;
  std::optional<double> number(const std::string& path, Range range);
  std::optional<int> integer(const std::string& path, int lo, int hi);
  std::optional<std::string> choice(const std::string& path, const std::vector<std::string>& options);
  std::optional<bool> boolean(const std::string& path);

  //! "file:line: key = value" for messages.
  std::string where(const std::string& path) const;
  //! Throws CaseError "<where>: <message>".
  [[noreturn]] void fail(const std::string& path, const std::string& message) const;
  //! Throws CaseError for a missing key.
  [[noreturn]] void missing(const std::string& path, const std::string& what) const;
  //! Declares a table as known, so the unknown-key check walks into it.
  void allow_table(const std::string& path);
  //! Throws CaseError for the first key that nothing read (with a suggestion).
  void check_no_unknown_keys() const;

 private:
  const toml::node* find(const std::string& path) const;
  void range_check(const std::string& path, double si, units::Dimension dim, Range range) const;
  void walk_unknown(const toml::table& t, const std::string& prefix) const;

  toml::table root_;
  std::string file_;
  std::map<std::string, std::string> set_by_;  //!< path -> "--set ..." argument
  std::set<std::string> allowed_;              //!< keys the reader looked for
  std::set<std::string> tables_;               //!< tables the reader knows
};

}  // namespace oxystrat::detail
