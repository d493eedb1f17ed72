#include "postproc/io/file_output.hpp"

#include <cerrno>
#include <cstring>

#include "input/errors.hpp"

namespace oxystrat {

void finish_file(std::ofstream& out, const std::string& path) {
  // A write that failed already left its errno; otherwise only the close can fail now.
  if (out) errno = 0;
  if (out.is_open()) out.close();
  if (!out) {
    const int code = errno;
    throw IoError("cannot write " + path + (code != 0 ? std::string(": ") + std::strerror(code) : std::string()));
  }
}

}  // namespace oxystrat
