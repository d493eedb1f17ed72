#include "input/case_sections.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>

namespace oxystrat::detail {

void read_numerics(TomlSource& src, Case& c) {
  src.allow_table("grid");
  c.grid.radial = src.integer("grid.radial", 1, 2000).value_or(c.grid.radial);
  c.grid.axial = src.integer("grid.axial", 1, 20000).value_or(c.grid.axial);
  if (static_cast<long>(c.grid.radial) * c.grid.axial > 4'000'000) {
    src.fail("grid.axial", fmt::format("grid.radial x grid.axial = {} zones; at most 4,000,000 are supported",
                                       static_cast<long>(c.grid.radial) * c.grid.axial));
  }
  src.allow_table("output");
  c.output.sectors = src.integer("output.sectors", 3, 360).value_or(c.output.sectors);
  src.allow_table("model");
  auto& m = c.model;
  m.exchange_constant = src.number("model.exchange_constant", {0.0, 100.0}).value_or(0.0);
  m.mixing_length_ratio = src.number("model.mixing_length_ratio", {0.0, 1.0}).value_or(0.0);
  m.discharge_power_share = src.number("model.discharge_power_share", {0.0, 0.9}).value_or(m.discharge_power_share);
  m.upper_gas_share = src.number("model.upper_gas_share", {0.0, 1.0}).value_or(m.upper_gas_share);
  m.slip_velocity_m_s = src.quantity_or("model.slip_velocity", Dimension::velocity, {0.05, 1.0}, m.slip_velocity_m_s);
  const auto km = src.choice("model.kla_model", {"local-correlation", "mechanistic"}).value_or("local-correlation");
  m.kla_model = km == "mechanistic" ? KlaModel::mechanistic : KlaModel::local_correlation;
  m.kla_prefactor = src.number("model.kla_prefactor", {0.0, 10.0}).value_or(0.0);
  m.kla_power_exponent = src.number("model.kla_power_exponent", {0.0, 1.5}).value_or(0.0);
  m.kla_gas_exponent = src.number("model.kla_gas_exponent", {0.0, 1.5}).value_or(0.0);
  m.bubble_diameter_m = src.quantity_or("model.bubble_diameter", Dimension::length, {1e-4, 0.02}, 0.0);
  m.kla_factor = src.number("model.kla_factor", {0.01, 10.0}).value_or(1.0);
  m.kla_normalise = src.boolean("model.kla_normalise").value_or(true);
  m.multiple_impeller_factor = src.number("model.multiple_impeller_factor", {0.3, 1.0}).value_or(1.0);
}

std::vector<std::string> merge_includes(toml::table& root, const std::string& file_name) {
  const toml::node* inc = root.get("include");
  if (inc == nullptr) return {};
  const auto line = inc->source().begin.line;
  const auto bad = [&] {
    throw CaseError(fmt::format("{}:{}: include: expected a list of file names, e.g. include = [\"calibration.toml\"]",
                                file_name, line));
  };
  std::vector<std::string> names;
  if (const auto* s = inc->as_string()) {
    names.push_back(s->get());
  } else if (const auto* a = inc->as_array()) {
    for (const auto& e : *a) {
      if (!e.is_string()) bad();
      names.push_back(e.as_string()->get());
    }
  } else {
    bad();
  }
  std::vector<std::string> seen;
  for (const auto& name : names) {
    std::filesystem::path path(name);
    if (path.is_relative()) path = std::filesystem::path(file_name).parent_path() / path;
    const std::string shown = path.lexically_normal().string();
    if (std::find(seen.begin(), seen.end(), shown) != seen.end()) {
      throw CaseError(fmt::format("{}:{}: include: {} is listed twice", file_name, line, shown));
    }
    seen.push_back(shown);
    std::error_code ec;  // the non-throwing tests: a name the system refuses (too long) is just "cannot open"
    if (const auto st = std::filesystem::status(path, ec); std::filesystem::exists(st) &&
                                                           !std::filesystem::is_regular_file(st) &&
                                                           !std::filesystem::is_directory(st)) {
      // Opened, a FIFO blocks and a device reads for ever.
      throw CaseError(fmt::format("{}:{}: include = \"{}\": {} is a device or pipe, not a file", file_name, line, name,
                                  shown));
    }
    std::ifstream in(path, std::ios::binary);
    if (!in || !std::filesystem::is_regular_file(path, ec)) {
      throw CaseError(fmt::format("{}:{}: include = \"{}\": cannot open {}{} (a relative path is taken from the case "
                                  "file's folder)",
                                  file_name, line, name, shown,
                                  std::filesystem::is_directory(path, ec) ? ": it is a folder; name the file in it, e.g. "
                                                                        "calibration.toml"
                                                                      : ""));
    }
    std::ostringstream ss;
    ss << in.rdbuf();
    const std::string text = ss.str();
    toml::table fragment;
    try {
      fragment = toml::parse(text, shown);
    } catch (const toml::parse_error& e) {
      throw CaseError(fmt::format("{}:{}: not valid TOML: {} (included by {}:{})", shown, e.source().begin.line,
                                  e.description(), file_name, line));
    }
    for (const auto& [key, node] : fragment) {
      if (key.str() == "model" && node.is_table()) continue;
      throw CaseError(fmt::format("{}:{}: {}: an included file may hold only a [model] table{} (included by {}:{})",
                                  shown, node.source().begin.line, key.str(),
                                  key.str() == "include" ? "; includes do not nest" : "", file_name, line));
    }
    {
      TomlSource check(toml::parse(text, shown), shown);  // parsed again: a copy would lose the lines
      Case scratch;
      read_numerics(check, scratch);
      check.check_no_unknown_keys();
    }
    if (!root.contains("model")) root.insert("model", toml::table{});
    auto* target = root.get("model")->as_table();
    if (target == nullptr) {
      throw CaseError(fmt::format("{}:{}: model must be a table, written [model]", file_name,
                                  root.get("model")->source().begin.line));
    }
    for (const auto& [key, value] : *fragment.get("model")->as_table()) {
      const std::string name(key.str());  // a structured binding in a lambda: not before clang 16
      if (!target->contains(name)) value.visit([&](auto&& v) { target->insert(name, v); });
    }
  }
  root.erase("include");
  return seen;
}

}  // namespace oxystrat::detail
