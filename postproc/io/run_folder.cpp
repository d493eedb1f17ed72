#include "postproc/io/run_folder.hpp"
#include "input/errors.hpp"

#include <unistd.h>

#include <stdexcept>
#include <system_error>

namespace oxystrat {
namespace fs = std::filesystem;

RunFolder::RunFolder(fs::path target, bool force) : target_(target.lexically_normal()), force_(force) {
  if (target_.empty()) throw CaseError("no output folder given (--out DIR)");
  if (!target_.has_filename()) target_ = target_.parent_path();  // "res/" names the folder "res"
  if (target_.empty() || target_ == "." || target_ == "..") {
    throw CaseError("output folder '" + target.string() + "' must name a new folder, not the current or parent one");
  }
  if (fs::exists(target_) && !force_) {
    throw IoError("output folder " + target_.string() +
                             " exists; choose another --out or add --force to replace it");
  }
  if (fs::exists(target_) && !fs::is_directory(target_)) {
    throw IoError(target_.string() + " exists and is not a folder");
  }
  const fs::path parent = target_.has_parent_path() ? target_.parent_path() : fs::path(".");
  std::error_code ec;
  fs::create_directories(parent, ec);
  if (ec) throw IoError("cannot create " + parent.string() + ": " + ec.message());
  static int counter = 0;  // several run folders in one process (sweeps) get their own staging
  staging_ = parent / (target_.filename().string() + ".partial-" + std::to_string(::getpid()) + "-" + std::to_string(counter++));
  fs::remove_all(staging_, ec);
  fs::create_directory(staging_, ec);
  if (ec) throw IoError("cannot create " + staging_.string() + ": " + ec.message());
}

RunFolder::~RunFolder() {
  if (!committed_) {
    std::error_code ec;
    fs::remove_all(staging_, ec);
  }
}

void RunFolder::commit() {
  std::error_code ec;
  fs::path old;
  if (fs::exists(target_)) {
    if (!force_) throw IoError("output folder " + target_.string() + " appeared during the run");
    old = target_.string() + ".old-" + std::to_string(::getpid());
    fs::rename(target_, old, ec);
    if (ec) throw IoError("cannot move the old " + target_.string() + " aside: " + ec.message());
  }
  fs::rename(staging_, target_, ec);
  if (ec) {
    if (!old.empty()) fs::rename(old, target_);  // put the previous result back
    throw IoError("cannot move the result into " + target_.string() + ": " + ec.message());
  }
  committed_ = true;
  if (!old.empty()) fs::remove_all(old, ec);
}

}  // namespace oxystrat
