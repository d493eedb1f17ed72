// RunFolder: results appear in the target folder only when complete; an old result is replaced
// only with force and only at commit; an abandoned run leaves nothing behind.
#include "postproc/io/run_folder.hpp"

#include <sys/wait.h>
#include <unistd.h>

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "input/errors.hpp"
#include "postproc/io/file_output.hpp"
#include "postproc/report/report.hpp"
#include "temp_folder.hpp"

namespace oxystrat::test {
namespace {

namespace fs = std::filesystem;
using testing::HasSubstr;

void write_text(const fs::path& p, const std::string& text) {
  std::ofstream(p) << text;
}

std::string read_text(const fs::path& p) {
  std::ifstream in(p);
  return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

//! Names in a folder, sorted.
std::vector<std::string> listing(const fs::path& dir) {
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(dir)) names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

//! An existing result folder holding one marker file.
fs::path old_result(const TempFolder& tmp) {
  const auto target = tmp / "run";
  fs::create_directory(target);
  write_text(target / "marker.txt", "old result");
  return target;
}

TEST(RunFolder, NewFolderAppearsOnlyAtCommit) {
  TempFolder tmp;
  const auto target = tmp / "run";
  RunFolder folder(target, false);
  write_text(folder.file("result.txt"), "new");
  EXPECT_FALSE(fs::exists(target));
  EXPECT_TRUE(fs::exists(folder.file("result.txt")));
  folder.commit();
  EXPECT_EQ(read_text(target / "result.txt"), "new");
  EXPECT_EQ(listing(tmp.path()), std::vector<std::string>{"run"});  // no staging folder left
}

TEST(RunFolder, RefusesAnExistingFolderWithoutForce) {
  TempFolder tmp;
  const auto target = old_result(tmp);
  try {
    RunFolder folder(target, false);
    ADD_FAILURE() << "accepted an existing folder without force";
  } catch (const std::runtime_error& e) {
    EXPECT_THAT(e.what(), HasSubstr(target.string() + " exists"));
    EXPECT_THAT(e.what(), HasSubstr("--force"));
  }
  EXPECT_EQ(read_text(target / "marker.txt"), "old result");
  EXPECT_EQ(listing(tmp.path()), std::vector<std::string>{"run"});
}

TEST(RunFolder, ForceReplacesOnlyAtCommit) {
  TempFolder tmp;
  const auto target = old_result(tmp);
  {
    RunFolder folder(target, true);
    write_text(folder.file("result.txt"), "new");
    EXPECT_EQ(read_text(target / "marker.txt"), "old result");  // still the old result
    folder.commit();
  }
  EXPECT_FALSE(fs::exists(target / "marker.txt"));
  EXPECT_EQ(read_text(target / "result.txt"), "new");
  EXPECT_EQ(listing(tmp.path()), std::vector<std::string>{"run"});  // old copy removed
}

TEST(RunFolder, AbandonedRunLeavesNoFolder) {
  TempFolder tmp;
  {
    RunFolder folder(tmp / "run", false);
    write_text(folder.file("half.txt"), "partial");
  }
  EXPECT_TRUE(listing(tmp.path()).empty());
}

TEST(RunFolder, AbandonedForcedRunKeepsTheOldResult) {
  TempFolder tmp;
  const auto target = old_result(tmp);
  {
    RunFolder folder(target, true);
    write_text(folder.file("half.txt"), "partial");
  }
  EXPECT_EQ(listing(target), std::vector<std::string>{"marker.txt"});
  EXPECT_EQ(listing(tmp.path()), std::vector<std::string>{"run"});
}

TEST(RunFolder, FolderAppearingDuringTheRunIsNotReplaced) {
  TempFolder tmp;
  const auto target = tmp / "run";
  {
    RunFolder folder(target, false);
    old_result(tmp);  // another run finished first
    EXPECT_THROW(folder.commit(), std::runtime_error);
  }
  EXPECT_EQ(listing(target), std::vector<std::string>{"marker.txt"});
  EXPECT_EQ(listing(tmp.path()), std::vector<std::string>{"run"});
}

TEST(RunFolder, CreatesMissingParents) {
  TempFolder tmp;
  const auto target = tmp / "a" / "b" / "run";
  RunFolder folder(target, false);
  write_text(folder.file("x.txt"), "x");
  folder.commit();
  EXPECT_TRUE(fs::exists(target / "x.txt"));
}

TEST(RunFolder, ExistingFileIsNotAFolder) {
  TempFolder tmp;
  write_text(tmp / "run", "a file");
  try {
    RunFolder folder(tmp / "run", true);
    ADD_FAILURE() << "accepted a file as the output folder";
  } catch (const std::runtime_error& e) {
    EXPECT_THAT(e.what(), HasSubstr("exists and is not a folder"));
  }
  EXPECT_EQ(read_text(tmp / "run"), "a file");
}

// Regression test for a fixed bug (run_folder.cpp:20-24): with a trailing separator ("--out res/", as shell completion types
// it) target_.filename() is empty and parent_path() is the target itself, so line 22 creates the
// target folder and the staging folder goes inside it ("res/.partial-PID"). commit() then finds
// the target existing and throws "appeared during the run" (without force) or fails to move
// "res/" into "res/.old-PID" (with force: "Invalid argument"); an empty "res" folder is left.
// Expected: "res/" behaves exactly like "res".
TEST(RunFolder, TrailingSeparatorNamesTheSameFolder) {
  TempFolder tmp;
  {
    RunFolder folder(tmp.path().string() + "/run/", false);
    write_text(folder.file("x.txt"), "x");
    EXPECT_FALSE(fs::exists(tmp / "run"));
    EXPECT_NO_THROW(folder.commit());
  }
  EXPECT_EQ(read_text(tmp / "run" / "x.txt"), "x");
  EXPECT_EQ(listing(tmp.path()), std::vector<std::string>{"run"});
}

TEST(RunFolder, EmptyTargetIsRefused) {
  EXPECT_THROW(RunFolder(fs::path(), false), std::runtime_error);
}

// The id of a process that has ended (forked, exited and reaped).
pid_t dead_pid() {
  const pid_t pid = ::fork();
  if (pid == 0) ::_exit(0);
  int status = 0;
  ::waitpid(pid, &status, 0);
  return pid;
}

TEST(RunFolder, TidiesTheStagingFolderOfADeadProcess) {
  TempFolder tmp;
  const auto left = tmp / ("run.partial-" + std::to_string(dead_pid()) + "-0");
  fs::create_directory(left);
  write_text(left / "half.txt", "partial");
  std::vector<std::string> notes;
  set_run_folder_notes([&](const std::string& s) { notes.push_back(s); });
  {
    RunFolder folder(tmp / "run", false);
    EXPECT_FALSE(fs::exists(left));
  }
  set_run_folder_notes({});
  ASSERT_EQ(notes.size(), 1u);
  EXPECT_THAT(notes[0], HasSubstr("removed " + left.string()));
}

TEST(RunFolder, PutsBackAResultADeadProcessHadMovedAside) {
  TempFolder tmp;
  const auto target = old_result(tmp);
  const auto aside = tmp / ("run.old-" + std::to_string(dead_pid()));
  fs::rename(target, aside);
  EXPECT_THROW(RunFolder(target, false), IoError);  // put back, so it exists
  EXPECT_EQ(read_text(target / "marker.txt"), "old result");
  EXPECT_EQ(listing(tmp.path()), std::vector<std::string>{"run"});
}

TEST(RunFolder, KeepsWhatALiveProcessIsWriting) {
  TempFolder tmp;
  const auto busy = tmp / ("run.partial-" + std::to_string(::getpid()) + "-99");
  const auto aside = tmp / ("run.old-" + std::to_string(::getpid()));
  fs::create_directory(busy);
  fs::create_directory(aside);
  { RunFolder folder(tmp / "run", false); }
  EXPECT_TRUE(fs::exists(busy));
  EXPECT_TRUE(fs::exists(aside));
}

TEST(RunFolder, AbandonedFoldersAreRemovedAndCannotCommit) {
  TempFolder tmp;
  // In a child process: abandoning is for good, and would stop this process's other folders.
  EXPECT_EXIT(
      {
        RunFolder folder(tmp / "run", false);
        write_text(folder.file("half.txt"), "partial");
        abandon_run_folders();
        bool ok = listing(tmp.path()).empty();
        try {
          folder.commit();
          ok = false;
        } catch (const IoError&) {
        }
        std::exit(ok && !fs::exists(tmp / "run") ? 0 : 1);
      },
      testing::ExitedWithCode(0), "");
}

TEST(CheckReplaceable, RefusesAFolderHoldingAnInputOrTheWorkingFolder) {
  TempFolder tmp;
  fs::create_directories(tmp / "a" / "b");
  write_text(tmp / "a" / "b" / "case.toml", "x");
  fs::create_directory_symlink(tmp / "a", tmp / "link");
  const std::vector<fs::path> inputs{tmp / "a" / "b" / "case.toml"};
  for (const auto& t : {tmp / "a", tmp / "a" / "b", tmp / "a" / "b" / "", tmp / "a" / "b" / ".." / "b", tmp / "link",
                        tmp / "link" / "b", tmp.path()}) {
    EXPECT_THROW(check_replaceable(t, inputs), CaseError) << t;
  }
  fs::create_directory(tmp / "other");
  EXPECT_NO_THROW(check_replaceable(tmp / "other", inputs));
  EXPECT_THROW(check_replaceable(fs::current_path(), {}), CaseError);
  EXPECT_THROW(check_replaceable(fs::current_path().parent_path(), {}), CaseError);
}

// A small file on a full disk fails only when its buffer is written, at the close.
TEST(FinishFile, AFullDiskIsAnErrorEvenForAFewBytes) {
  if (!fs::exists("/dev/full")) GTEST_SKIP() << "no /dev/full";
  try {
    write_text_file("/dev/full", "a few bytes");
    ADD_FAILURE() << "writing to a full device succeeded";
  } catch (const IoError& e) {
    EXPECT_THAT(e.what(), HasSubstr("cannot write /dev/full: No space left on device"));
  }
}

}  // namespace
}  // namespace oxystrat::test
