// An output folder that appears only when complete: files are written into a temporary sibling
// folder, which replaces the target in one rename at commit(). A run that fails or is interrupted
// leaves the previous result untouched and no folder that looks finished.
#pragma once

#include <filesystem>
#include <string>

namespace oxystrat {

class RunFolder {
 public:
  //! Throws std::runtime_error when `target` exists and `force` is false (before any work).
  RunFolder(std::filesystem::path target, bool force);
  ~RunFolder();
  RunFolder(const RunFolder&) = delete;
  RunFolder& operator=(const RunFolder&) = delete;

  //! Path of `name` inside the temporary folder.
  std::filesystem::path file(const std::string& name) const { return staging_ / name; }
  const std::filesystem::path& target() const { return target_; }
  //! Moves the finished folder into place (replacing an old one only now, with --force).
  void commit();

 private:
  std::filesystem::path target_;
  std::filesystem::path staging_;
  bool force_;
  bool committed_ = false;
};

}  // namespace oxystrat
