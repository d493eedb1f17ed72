// The one way text outputs end: the stream is closed (so what is still buffered reaches the file)
// before its state is judged, and a failure names the file and the system's reason (a full disk
// shows only when the buffer is written, often at close).
#pragma once

#include <fstream>
#include <string>

namespace oxystrat {

//! Closes `out` and throws IoError "cannot write PATH: reason" when any write or the close failed.
void finish_file(std::ofstream& out, const std::string& path);

}  // namespace oxystrat
