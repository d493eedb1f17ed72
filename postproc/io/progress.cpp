#include "postproc/io/progress.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <cstdio>

namespace oxystrat {

Progress::Progress(size_t total, std::string what)
    : total_(total), what_(std::move(what)), enabled_(::isatty(STDERR_FILENO) != 0), start_(std::chrono::steady_clock::now()) {}

Progress::~Progress() {
  if (enabled_) fmt::print(stderr, "\n");
}

void Progress::step() {
  ++done_;
  if (!enabled_) return;
  const double elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  const double eta = done_ > 0 ? elapsed * static_cast<double>(total_ - done_) / static_cast<double>(done_) : 0.0;
  constexpr int width = 30;
  const int filled = total_ > 0 ? static_cast<int>(width * done_ / total_) : width;
  fmt::print(stderr, "\r[{}{}] {}/{} {}, {:.0f} s elapsed, ETA {:.0f} s   ", std::string(filled, '#'),
             std::string(width - filled, '.'), done_, total_, what_, elapsed, eta);
  std::fflush(stderr);
}

}  // namespace oxystrat
