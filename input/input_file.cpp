#include "input/input_file.hpp"

#include <fmt/format.h>

#include <filesystem>
#include <fstream>
#include <iterator>

#include "input/errors.hpp"

namespace oxystrat {

std::string read_input_file(const std::string& path, std::string_view what, std::uintmax_t max_bytes) {
  namespace fs = std::filesystem;
  std::error_code ec;
  const auto status = fs::status(path, ec);
  if (ec || !fs::exists(status)) throw CaseError(fmt::format("{}: cannot open the {}: no such file", path, what));
  if (fs::is_directory(status)) {
    throw CaseError(fmt::format("{}: the {} must be a file, not a folder; name the file in it", path, what));
  }
  if (!fs::is_regular_file(status)) {
    throw CaseError(fmt::format("{}: the {} must be a regular file, not a device, pipe or socket", path, what));
  }
  const auto limit = [&] {
    return CaseError(fmt::format("{}: the {} is larger than {} MiB; expected a text file of a few kilobytes", path, what,
                                 max_bytes >> 20));
  };
  if (fs::file_size(path, ec) > max_bytes) throw limit();
  std::ifstream in(path, std::ios::binary);
  if (!in) throw CaseError(fmt::format("{}: cannot open the {}", path, what));
  std::string text;
  char buffer[65536];
  while (in.read(buffer, sizeof buffer) || in.gcount() > 0) {  // bounded even if the file grows meanwhile
    text.append(buffer, static_cast<size_t>(in.gcount()));
    if (text.size() > max_bytes) throw limit();
  }
  return text;
}

}  // namespace oxystrat
