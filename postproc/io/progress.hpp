// A one-line progress bar with ETA on stderr, drawn only when stderr is a terminal.
#pragma once

#include <chrono>
#include <string>

namespace oxystrat {

class Progress {
 public:
  Progress(size_t total, std::string what);
  ~Progress();
  //! One more item done (call from one thread at a time).
  void step();

 private:
  size_t total_, done_ = 0;
  std::string what_;
  bool enabled_;
  std::chrono::steady_clock::time_point start_;
};

}  // namespace oxystrat
