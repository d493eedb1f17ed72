// An output folder that appears only when complete: files are written into a temporary sibling
// folder, which replaces the target in one rename at commit(). A run that fails or is interrupted
// leaves the previous result untouched and no folder that looks finished.
#pragma once

#include <filesystem>
#include <functional>
#include <string>
#include <vector>

namespace oxystrat {

class RunFolder {
 public:
  //! Before any work: tidies what killed runs on the same target left behind (their staging
  //! folders are removed, a result one had moved aside is put back), then throws CaseError/IoError
  //! when `target` exists and `force` is false, or when replacing it would delete a folder that
  //! holds the working folder or a file given to protect_from_replacement().
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

//! The folder a --out argument names, as RunFolder::target() will give it ("res/" and "./res"
//! name "res").
std::filesystem::path output_folder_path(const std::filesystem::path& out);

//! Where RunFolder says what it tidied from killed runs (one sentence each); nowhere by default.
void set_run_folder_notes(std::function<void(const std::string&)> sink);

//! Marks a file the process reads (a case, an included file, a data file): no RunFolder of this
//! process replaces a folder that holds it.
void protect_from_replacement(const std::filesystem::path& input);

//! Throws CaseError when replacing `target` would delete a folder that holds one of `inputs` or
//! the working folder: `target` is one of them or an ancestor, however either is spelt (relative,
//! absolute, "..", symbolic links, trailing separators).
void check_replaceable(const std::filesystem::path& target, const std::vector<std::filesystem::path>& inputs);

//! Removes the staging folders of every RunFolder of this process not yet committed, waiting for a
//! commit under way to finish, and lets no later commit start: for a process about to end on a
//! signal (postproc/io/interrupts.hpp). Not async-signal-safe: call it from an ordinary thread.
void abandon_run_folders();

}  // namespace oxystrat
