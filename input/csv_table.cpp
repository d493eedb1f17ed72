#include "input/csv_table.hpp"

#include <fmt/format.h>

#include <cctype>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "input/errors.hpp"
#include "input/input_file.hpp"
#include "input/numbers.hpp"

namespace oxystrat {
namespace {

constexpr std::uintmax_t kMaxDataFileBytes = 64u << 20;  // far above any measured trace or table

std::string_view trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return s;
}

// Spreadsheets quote cells: "time [s]".
std::string_view unquote(std::string_view s) {
  s = trim(s);
  if (s.size() >= 2 && s.front() == '"' && s.back() == '"') s = trim(s.substr(1, s.size() - 2));
  return s;
}

// The content of one line: trimmed, without the UTF-8 byte-order mark on line 1; empty for blank
// lines and `#` comments.
std::string_view content_line(std::string_view raw, int line_no) {
  if (line_no == 1 && raw.substr(0, 3) == "\xEF\xBB\xBF") raw.remove_prefix(3);
  raw = trim(raw);
  return !raw.empty() && raw.front() == '#' ? std::string_view{} : raw;
}

std::vector<std::string> split_cells(std::string_view line, char sep) {
  std::vector<std::string> cells;
  size_t start = 0;
  while (true) {
    const size_t at = line.find(sep, start);
    cells.emplace_back(unquote(line.substr(start, at == std::string_view::npos ? std::string_view::npos : at - start)));
    if (at == std::string_view::npos) break;
    start = at + 1;
  }
  return cells;
}

}  // namespace

std::vector<HeaderCell> header_cell_readings(std::string_view cell) {
  cell = trim(cell);
  if (const auto o = cell.find('['); o != std::string_view::npos) {
    if (const auto c = cell.find(']', o); c != std::string_view::npos) {
      return {{std::string(trim(cell.substr(0, o))), std::string(trim(cell.substr(o + 1, c - o - 1)))}};
    }
  }
  if (const auto o = cell.find('('); o != std::string_view::npos && !cell.empty() && cell.back() == ')') {
    return {{std::string(trim(cell.substr(0, o))), std::string(trim(cell.substr(o + 1, cell.size() - o - 2)))}};
  }
  std::vector<HeaderCell> readings;
  for (auto space = cell.find_last_of(" \t"); space != std::string_view::npos && space > 0;
       space = cell.find_last_of(" \t", space - 1)) {
    const auto name = trim(cell.substr(0, space));
    if (!name.empty()) readings.push_back({std::string(name), std::string(trim(cell.substr(space + 1)))});
  }
  readings.push_back({std::string(cell), ""});
  return readings;
}

std::string CsvTable::where(int line) const { return fmt::format("{}:{}", file_name, line); }

std::optional<double> CsvTable::number(const Row& row, std::size_t column) const {
  return parse_number(row.cells.at(column), separator == ';');
}

CsvTable parse_csv_table(std::string_view text, const std::string& file_name, std::string_view example_header) {
  CsvTable t;
  t.file_name = file_name;
  std::istringstream in{std::string(text)};
  std::string raw;
  int line_no = 0;
  while (std::getline(in, raw)) {
    ++line_no;
    const std::string_view line = content_line(raw, line_no);
    if (line.empty()) continue;
    if (t.header_line == 0) {
      t.separator = line.find(';') != std::string_view::npos ? ';' : ',';
      t.header = split_cells(line, t.separator);
      if (parse_number(t.header.front(), t.separator == ';')) {
        throw CaseError(fmt::format("{}: expected a header row naming the columns with their units, e.g. {}, before "
                                    "the first row of numbers",
                                    t.where(line_no), example_header));
      }
      t.header_line = line_no;
      continue;
    }
    auto cells = split_cells(line, t.separator);
    if (cells.size() != t.header.size()) {
      throw CaseError(fmt::format("{}: {} cells; the header has {} columns (separated by '{}')", t.where(line_no),
                                  cells.size(), t.header.size(), t.separator));
    }
    t.rows.push_back({line_no, std::move(cells)});
  }
  if (t.header_line == 0) {
    throw CaseError(fmt::format("{}: no header row; expected e.g. {} followed by one row per point", file_name,
                                example_header));
  }
  return t;
}

CsvTable read_csv_table(const std::string& path, std::string_view what, std::string_view example_header) {
  return parse_csv_table(read_input_file(path, what, kMaxDataFileBytes), path, example_header);
}

}  // namespace oxystrat
