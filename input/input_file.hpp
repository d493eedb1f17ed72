// Reading a file the user names as input (a case, an included fragment, a data table): only a
// regular file of a sensible size is read. A device (/dev/zero, read for ever), a FIFO (blocks
// until someone writes) or a folder is refused before it is opened.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

namespace oxystrat {

//! The whole text of `path`. Throws CaseError "<path>: ..." naming `what` ("case file") when the
//! file does not exist, is not a regular file, or holds more than `max_bytes`.
std::string read_input_file(const std::string& path, std::string_view what, std::uintmax_t max_bytes);

}  // namespace oxystrat
