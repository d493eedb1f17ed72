// Runs the real oxystrat executable in a shell, capturing exit code, stdout and stderr, and gives
// each test its own empty working folder.
#pragma once

#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <map>
#include <string>
#include <vector>

namespace oxystrat::test {

namespace fs = std::filesystem;

inline const fs::path kExe = OXYSTRAT_EXE;
inline const fs::path kSourceDir = OXYSTRAT_SOURCE_DIR;
inline const fs::path kDataDir = OXYSTRAT_TEST_DATA_DIR;

//! Single-quoted for /bin/sh.
inline std::string shell_quote(const std::string& s) {
  std::string out = "'";
  for (char c : s) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return out + "'";
}

inline std::string read_file(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

//! The small test case that most command-line tests run.
inline const std::string kSmallCase = (kDataDir / "small-case.toml").string();

//! Every regular file under `dir` (relative path -> bytes).
inline std::map<std::string, std::string> snapshot(const fs::path& dir) {
  std::map<std::string, std::string> files;
  for (const auto& e : fs::recursive_directory_iterator(dir)) {
    if (e.is_regular_file()) files[fs::relative(e.path(), dir).string()] = read_file(e.path());
  }
  return files;
}

struct RunResult {
  int exit_code = -1;  //!< -1 when the process did not exit normally
  std::string out;
  std::string err;
};

//! A fresh folder per test (removed afterwards); commands run with it as working directory.
class CliTest : public testing::Test {
 protected:
  void SetUp() override {
    const auto* info = testing::UnitTest::GetInstance()->current_test_info();
    std::string name = std::string("oxystrat-cli-") + info->test_suite_name() + "-" + info->name() + "-" +
                       std::to_string(::getpid());
    for (char& ch : name) {
      if (ch == '/') ch = '_';
    }
    dir_ = fs::temp_directory_path() / name;
    fs::remove_all(dir_);
    fs::create_directories(dir_ / "work");
  }
  void TearDown() override {
    std::error_code ec;
    fs::remove_all(dir_, ec);
  }

  //! Runs `oxystrat args...` in work(); output is captured outside it, so work() holds only
  //! what the program wrote.
  RunResult oxystrat(const std::vector<std::string>& args) const {
    // Appended piece by piece: `" " + std::string` trips a GCC 12 -Wrestrict false positive.
    std::string cmd = "cd ";
    cmd += shell_quote(work().string());
    cmd += " && ";
    cmd += shell_quote(kExe.string());
    for (const auto& a : args) {
      cmd += ' ';
      cmd += shell_quote(a);
    }
    const auto out = dir_ / "stdout.txt";
    const auto err = dir_ / "stderr.txt";
    cmd += " > ";
    cmd += shell_quote(out.string());
    cmd += " 2> ";
    cmd += shell_quote(err.string());
    const int status = std::system(cmd.c_str());
    RunResult r;
    r.exit_code = status != -1 && WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    r.out = read_file(out);
    r.err = read_file(err);
    return r;
  }

  //! Names in work(), sorted.
  std::vector<std::string> work_listing() const {
    std::vector<std::string> names;
    for (const auto& e : fs::directory_iterator(work())) names.push_back(e.path().filename().string());
    std::sort(names.begin(), names.end());
    return names;
  }

  fs::path work() const { return dir_ / "work"; }

 private:
  fs::path dir_;
};

}  // namespace oxystrat::test
