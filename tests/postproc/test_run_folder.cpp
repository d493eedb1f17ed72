// RunFolder: results appear in the target folder only when complete; an old result is replaced
// only with force and only at commit; an abandoned run leaves nothing behind.
#include "postproc/io/run_folder.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <stdexcept>
#include <string>
#include <vector>

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

}  // namespace
}  // namespace oxystrat::test
