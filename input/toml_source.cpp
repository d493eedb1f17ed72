#include "input/toml_source.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <sstream>

namespace oxystrat::detail {
namespace {

std::vector<std::string> split_path(const std::string& path) {
  std::vector<std::string> parts;
  std::string part;
  for (char c : path) {
    if (c == '.') {
      parts.push_back(part);
      part.clear();
    } else {
      part += c;
    }
  }
  parts.push_back(part);
  return parts;
}

bool is_index(const std::string& s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) { return c >= '0' && c <= '9'; });
}

// The position an index names; nothing for one too long for any list (std::stoul would throw
// out_of_range, which is no message for the user). Only for strings that pass is_index.
std::optional<size_t> index_value(const std::string& s) {
  if (s.size() > 9) return std::nullopt;
  return static_cast<size_t>(std::stoul(s));
}

std::string value_text(const toml::node& n) {
  if (const auto* s = n.as_string()) return fmt::format("\"{}\"", s->get());
  if (const auto* f = n.as_floating_point()) {  // shortest round trip, still reading as a float
    auto t = fmt::format("{}", f->get());
    if (t.find_first_of(".eEn") == std::string::npos) t += ".0";
    return t;
  }
  std::ostringstream os;
  n.visit([&](auto&& v) { os << v; });
  return os.str();
}

size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<size_t> prev(b.size() + 1), cur(b.size() + 1);
  for (size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (size_t j = 1; j <= b.size(); ++j) {
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1)});
    }
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

// Allowed keys are stored with array indices replaced by '#', so one entry serves every element.
std::string generic(const std::string& path) {
  std::string out;
  for (const auto& p : split_path(path)) out += (out.empty() ? "" : ".") + (is_index(p) ? "#" : p);
  return out;
}

std::string format_range(units::Dimension dim, Range r) {
  const auto unit = units::display_unit(dim);
  const auto lo = units::to_display(dim, r.lo);
  const auto hi = units::to_display(dim, r.hi);
  const std::string sep = unit.empty() ? "" : " ";
  if (r.lo_exclusive) return fmt::format("more than {:g}{}{} and at most {:g}{}{}", lo, sep, unit, hi, sep, unit);
  return fmt::format("{:g}{}{} to {:g}{}{}", lo, sep, unit, hi, sep, unit);
}

}  // namespace

TomlSource::TomlSource(toml::table root, std::string file_name)
    : root_(std::move(root)), file_(std::move(file_name)) {}

void TomlSource::apply(const Override& o) {
  const auto parts = split_path(o.key);
  if (std::any_of(parts.begin(), parts.end(), [](const auto& p) { return p.empty(); })) {
    throw CaseError(fmt::format("--set '{}': the key '{}' has an empty part", o.raw, o.key));
  }
  // The value: a TOML value when it parses as one (120, true, "a"), otherwise the plain text.
  toml::table parsed;
  bool is_toml = false;
  try {
    parsed = toml::parse("v = " + o.value);
    is_toml = parsed.get("v") != nullptr && !parsed.get("v")->is_table();
  } catch (const toml::parse_error& e) {
    // Plain text ("110 rpm") is taken as a string, but a value that starts as a TOML string,
    // list or table must be one whole: '"x" garbage' is a mistake, not the text it spells.
    const auto first = o.value.find_first_not_of(' ');
    if (first != std::string::npos && std::string("\"'[{").find(o.value[first]) != std::string::npos) {
      throw CaseError(fmt::format("--set '{}': the value {} is not one TOML value ({}); quote the whole value, e.g. "
                                  "--set 'title=\"my vessel\"', or give plain text without quotes",
                                  o.raw, o.value, e.description()));
    }
    is_toml = false;
  }
  toml::node* container = &root_;
  std::string walked;
  for (size_t i = 0; i + 1 < parts.size(); ++i) {
    const auto& p = parts[i];
    const std::string parent = walked;
    walked += (walked.empty() ? "" : ".") + p;
    if (auto* arr = container->as_array()) {
      if (!is_index(p)) throw CaseError(fmt::format("--set '{}': '{}' is a list; give an index (0-based)", o.raw, parent));
      const auto idx = index_value(p);
      if (!idx || *idx >= arr->size()) {
        throw CaseError(fmt::format("--set '{}': '{}' does not exist; the case has {} entries (0 to {})",
                                    o.raw, walked, arr->size(), static_cast<long>(arr->size()) - 1));
      }
      container = arr->get(*idx);
    } else if (auto* tbl = container->as_table()) {
      if (!tbl->contains(p)) tbl->insert(p, toml::table{});
      container = tbl->get(p);
    } else {
      throw CaseError(fmt::format("--set '{}': '{}' is a value, not a table", o.raw, parent));
    }
  }
  const std::string parent = o.key.substr(0, o.key.size() - parts.back().size() - (parts.size() > 1 ? 1 : 0));
  if (container->is_array()) {
    if (is_index(parts.back())) {
      throw CaseError(fmt::format("--set '{}': cannot set an element of a list by value; set its keys, e.g. {}.type",
                                  o.raw, o.key));
    }
    throw CaseError(fmt::format("--set '{}': '{}' is a list; give an index (0-based)", o.raw, parent));
  }
  auto* tbl = container->as_table();
  if (tbl == nullptr) throw CaseError(fmt::format("--set '{}': '{}' is a value, not a table", o.raw, parent));
  if (is_toml) {
    parsed.get("v")->visit([&](auto&& v) { tbl->insert_or_assign(parts.back(), v); });
  } else {
    tbl->insert_or_assign(parts.back(), o.value);
  }
  set_by_[o.key] = o.raw;
}

const toml::node* TomlSource::find(const std::string& path) const {
  const toml::node* n = &root_;
  for (const auto& p : split_path(path)) {
    if (const auto* t = n->as_table()) {
      n = t->get(p);
    } else if (const auto* a = n->as_array(); a != nullptr && is_index(p)) {
      const auto idx = index_value(p);
      n = idx ? a->get(*idx) : nullptr;
    } else {
      return nullptr;
    }
    if (n == nullptr) return nullptr;
  }
  return n;
}

bool TomlSource::has(const std::string& path) const { return find(path) != nullptr; }

size_t TomlSource::array_size(const std::string& path) const {
  const auto* n = find(path);
  if (n == nullptr) return 0;
  if (const auto* a = n->as_array()) return a->size();
  if (n->is_table()) fail(path, "must be a list of tables, written [[" + path + "]]");
  fail(path, "must be a list of tables, written [[" + path + "]]");
}

size_t TomlSource::list_size(const std::string& path) {
  allowed_.insert(generic(path));
  const auto* n = find(path);
  if (n == nullptr) return 0;
  if (const auto* a = n->as_array()) return a->size();
  fail(path, "must be a list, e.g. [\"0 h\", \"4 h\"]");
}

std::vector<std::string> TomlSource::keys(const std::string& path) const {
  std::vector<std::string> out;
  if (const auto* n = find(path); n != nullptr) {
    if (const auto* t = n->as_table()) {
      for (const auto& [k, v] : *t) out.emplace_back(k.str());
    }
  }
  return out;
}

std::string TomlSource::where(const std::string& path) const {
  if (const auto it = set_by_.find(path); it != set_by_.end()) return fmt::format("--set '{}'", it->second);
  const auto* n = find(path);
  if (n == nullptr) return fmt::format("{}: {}", file_, path);
  const auto line = n->source().begin.line;
  if (n->is_table() || n->is_array()) return fmt::format("{}:{}: {}", file_, line, path);
  if (line == 0) return fmt::format("{}: {} = {}", file_, path, value_text(*n));
  return fmt::format("{}:{}: {} = {}", file_, line, path, value_text(*n));
}

void TomlSource::fail(const std::string& path, const std::string& message) const {
  throw CaseError(fmt::format("{}: {}", where(path), message));
}

void TomlSource::missing(const std::string& path, const std::string& what) const {
  // Name the table's line, and a sibling key that looks like a misspelling of the missing one.
  const auto dot = path.rfind('.');
  const std::string parent = dot == std::string::npos ? "" : path.substr(0, dot);
  const std::string leaf = dot == std::string::npos ? path : path.substr(dot + 1);
  std::string place = file_;
  std::string hint;
  if (const auto* t = parent.empty() ? &root_ : (find(parent) ? find(parent)->as_table() : nullptr); t != nullptr) {
    if (!parent.empty() && t->source().begin.line > 0) place = fmt::format("{}:{}", file_, t->source().begin.line);
    for (const auto& [k, v] : *t) {
      const std::string key(k.str());
      if (key != leaf && edit_distance(key, leaf) <= 3) {
        hint = fmt::format("; line {} has '{}': a misspelling?", v.source().begin.line, key);
      }
    }
  }
  throw CaseError(fmt::format("{}: missing key {} ({}){}", place, path, what, hint));
}

void TomlSource::range_check(const std::string& path, double si, units::Dimension dim, Range range) const {
  const bool low = range.lo_exclusive ? !(si > range.lo) : !(si >= range.lo);
  if (low || !(si <= range.hi)) {
    fail(path, fmt::format("out of range: {} is outside the allowed {}", units::format(dim, si, 6),
                           format_range(dim, range)));
  }
}

std::optional<double> TomlSource::quantity(const std::string& path, units::Dimension dim, Range range,
                                           double molar_mass_kg_mol) {
  allowed_.insert(generic(path));
  const auto* n = find(path);
  if (n == nullptr) return std::nullopt;
  double si = 0.0;
  if (const auto* s = n->as_string()) {
    try {
      si = units::parse(dim, s->get(), molar_mass_kg_mol);
    } catch (const UnitError& e) {
      fail(path, fmt::format("{} (allowed {})", e.what(), format_range(dim, range)));
    }
  } else if (n->is_number() && dim == units::Dimension::fraction) {
    si = n->value<double>().value();
  } else if (n->is_number()) {
    fail(path, fmt::format("missing unit: write it as a string with a unit, e.g. \"{} {}\" ({})",
                           n->value<double>().value(), units::display_unit(dim), units::accepted(dim)));
  } else {
    fail(path, fmt::format("must be a string with a unit in {}", units::accepted(dim)));
  }
  range_check(path, si, dim, range);
  return si;
}

double TomlSource::quantity_or(const std::string& path, units::Dimension dim, Range range, double fallback) {
  return quantity(path, dim, range).value_or(fallback);
}

double TomlSource::require_quantity(const std::string& path, units::Dimension dim, Range range,
                                    const std::string& example, double molar_mass_kg_mol) {
  const auto v = quantity(path, dim, range, molar_mass_kg_mol);
  if (!v) missing(path, fmt::format("e.g. {} = \"{}\"; allowed {}", split_path(path).back(), example, format_range(dim, range)));
  return *v;
}

std::optional<std::string> TomlSource::string(const std::string& path) {
  allowed_.insert(generic(path));
  const auto* n = find(path);
  if (n == nullptr) return std::nullopt;
  if (const auto* s = n->as_string()) return s->get();
  fail(path, "must be a string");
}

std::optional<std::string> TomlSource::string_if_string(const std::string& path) const {
  const auto* n = find(path);
  if (n != nullptr && n->is_string()) return n->as_string()->get();
  return std::nullopt;
}

std::string TomlSource::text_of(const std::string& path) const {
  const auto* n = find(path);
  return n == nullptr ? std::string() : value_text(*n);
}

std::optional<double> TomlSource::number(const std::string& path, Range range) {
  return quantity(path, units::Dimension::fraction, range);
}

std::optional<int> TomlSource::integer(const std::string& path, int lo, int hi) {
  allowed_.insert(generic(path));
  const auto* n = find(path);
  if (n == nullptr) return std::nullopt;
  const auto v = n->value_exact<int64_t>();
  if (!v) fail(path, fmt::format("must be a whole number from {} to {}", lo, hi));
  if (*v < lo || *v > hi) fail(path, fmt::format("out of range: allowed {} to {}", lo, hi));
  return static_cast<int>(*v);
}

std::optional<bool> TomlSource::boolean(const std::string& path) {
  allowed_.insert(generic(path));
  const auto* n = find(path);
  if (n == nullptr) return std::nullopt;
  const auto v = n->value_exact<bool>();
  if (!v) fail(path, "must be true or false");
  return *v;
}

std::optional<std::string> TomlSource::choice(const std::string& path, const std::vector<std::string>& options) {
  const auto v = string(path);
  if (!v) return std::nullopt;
  if (std::find(options.begin(), options.end(), *v) == options.end()) {
    std::string list;
    for (const auto& o : options) list += (list.empty() ? "" : " | ") + o;
    fail(path, fmt::format("unknown value; expected one of {}", list));
  }
  return v;
}

void TomlSource::allow_table(const std::string& path) { tables_.insert(generic(path)); }

void TomlSource::walk_unknown(const toml::table& t, const std::string& prefix) const {
  for (const auto& [key, node] : t) {
    const std::string path = prefix.empty() ? std::string(key.str()) : prefix + "." + std::string(key.str());
    if (const auto* sub = node.as_table()) {
      if (tables_.count(generic(path)) != 0) {
        walk_unknown(*sub, path);
        continue;
      }
    } else if (const auto* arr = node.as_array(); arr != nullptr && tables_.count(generic(path)) != 0) {
      for (size_t i = 0; i < arr->size(); ++i) {
        if (const auto* el = arr->get(i)->as_table()) walk_unknown(*el, path + "." + std::to_string(i));
      }
      continue;
    } else if (allowed_.count(generic(path)) != 0) {
      continue;
    }
    // Unknown: suggest the closest known key of the same table.
    std::string best;
    size_t best_d = 4;
    const std::string g = generic(path);
    for (const auto& known : allowed_) {
      const auto d = edit_distance(g, known);
      if (d < best_d) best_d = d, best = known;
    }
    for (const auto& known : tables_) {
      const auto d = edit_distance(g, known);
      if (d < best_d) best_d = d, best = known;
    }
    // Put the element's own index back where the known key has '#'.
    const auto actual = split_path(path);
    auto known_parts = split_path(best);
    for (size_t i = 0; i < known_parts.size() && i < actual.size(); ++i) {
      if (known_parts[i] == "#") known_parts[i] = actual[i];
    }
    std::string suggestion;
    for (const auto& p : known_parts) suggestion += (suggestion.empty() ? "" : ".") + p;
    std::string hint = best.empty() ? "" : fmt::format("; did you mean {}?", suggestion);
    fail(path, "unknown key" + hint + " (docs/case-reference.md lists every key)");
  }
}

void TomlSource::check_no_unknown_keys() const { walk_unknown(root_, ""); }

}  // namespace oxystrat::detail
