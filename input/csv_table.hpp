// The one reader of the CSV data files oxystrat takes (DO traces, calibration points): a header
// row naming the columns with their units, then rows of cells; `#` comment lines and blank lines
// skipped; ',' or ';' between cells, and with ';' a decimal comma; cells trimmed and unquoted.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace oxystrat {

//! One way of reading a header cell as a column name and its unit.
struct HeaderCell {
  std::string name, unit;
};

//! The readings of a header cell, most likely first: "time [s]", "speed (rpm)" and
//! "pressure (bar(g))" have one; "gas flow Nm3/h" has one per space, the split at the last space
//! first ("gas flow" | "Nm3/h", then "gas" | "flow Nm3/h"). A caller takes the first reading
//! whose name or unit it knows. A cell without a unit reads as itself with an empty unit.
std::vector<HeaderCell> header_cell_readings(std::string_view cell);

struct CsvTable {
  struct Row {
    int line = 0;                    //!< 1-based line in the file
    std::vector<std::string> cells;  //!< as many as the header's
  };
  std::string file_name;
  char separator = ',';
  int header_line = 0;
  std::vector<std::string> header;  //!< the header's cells, trimmed and unquoted
  std::vector<Row> rows;

  //! "file:line", for messages.
  std::string where(int line) const;
  //! The cell as a finite number (a decimal comma with ';' between cells), or nothing.
  std::optional<double> number(const Row& row, std::size_t column) const;
};

//! Parses CSV text; `example_header` shows the expected header in messages. Throws CaseError
//! (with file:line) when there is no header, the first row is a number, or a row's cell count
//! differs from the header's.
CsvTable parse_csv_table(std::string_view text, const std::string& file_name, std::string_view example_header);

//! Reads and parses a data file; `what` names it in messages ("DO trace"). Throws CaseError when
//! the file cannot be opened, is not a regular file, or is larger than 64 MiB.
CsvTable read_csv_table(const std::string& path, std::string_view what, std::string_view example_header);

}  // namespace oxystrat
