// A disk that fills while the output is written: one message, exit 1, the previous result as it
// was and no partial folder. The real failure path is exercised without a real full disk: each
// run gets a file-size limit (RLIMIT_FSIZE, with SIGXFSZ ignored), so the kernel refuses the
// write that would pass it with EFBIG, as a full disk refuses it with ENOSPC; the program sees a
// failing write() either way. Where a tmpfs can be mounted (root), a truly full disk is tried too.
#include <fcntl.h>
#include <gmock/gmock.h>
#include <gtest/gtest.h>
#include <signal.h>
#include <sys/mount.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <map>

#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

struct LimitedRun {
  int exit_code = -1;  //!< -1: ended by a signal
  int signal = 0;
  std::string err;
};

class CliFullDisk : public CliTest {
 protected:
  //! Runs oxystrat in `cwd` (default work()) with no file allowed past `bytes` (0: no limit).
  LimitedRun run_limited(size_t bytes, const std::vector<std::string>& args, fs::path cwd = {}) const {
    if (cwd.empty()) cwd = work();
    const fs::path err_file = work().parent_path() / "limited-stderr.txt";
    const pid_t pid = ::fork();
    if (pid == 0) {
      if (::chdir(cwd.c_str()) != 0) ::_exit(127);
      const int null = ::open("/dev/null", O_WRONLY);
      const int err = ::open(err_file.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
      ::dup2(null, 1);
      ::dup2(err, 2);
      if (bytes > 0) {
        ::signal(SIGXFSZ, SIG_IGN);  // the write fails with EFBIG instead of killing the process
        const rlimit lim{bytes, bytes};
        if (::setrlimit(RLIMIT_FSIZE, &lim) != 0) ::_exit(126);
      }
      std::vector<char*> argv;
      std::string exe = kExe.string();
      argv.push_back(exe.data());
      std::vector<std::string> copy = args;
      for (auto& a : copy) argv.push_back(a.data());
      argv.push_back(nullptr);
      ::execv(exe.c_str(), argv.data());
      ::_exit(127);
    }
    int status = 0;
    ::waitpid(pid, &status, 0);
    LimitedRun r;
    if (WIFEXITED(status)) r.exit_code = WEXITSTATUS(status);
    if (WIFSIGNALED(status)) r.signal = WTERMSIG(status);
    r.err = read_file(err_file);
    return r;
  }

  //! `args` writes into "res", which already holds a complete result of the same command: under
  //! a file limit of `bytes` it must fail with one message and leave "res" exactly as it was.
  void expect_clean_failure(size_t bytes, const std::vector<std::string>& args, const std::string& message) {
    const auto first = run_limited(0, args);
    ASSERT_EQ(first.exit_code, 0) << first.err;
    const auto before = snapshot(work() / "res");
    auto forced = args;
    forced.push_back("--force");
    const auto r = run_limited(bytes, forced);
    EXPECT_EQ(r.signal, 0) << "killed by signal " << r.signal << "; stderr: " << r.err;
    EXPECT_EQ(r.exit_code, 1) << r.err;
    EXPECT_THAT(r.err, HasSubstr("oxystrat: error: "));
    EXPECT_THAT(r.err, HasSubstr(message));
    EXPECT_EQ(std::count(r.err.begin(), r.err.end(), '\n'), 1) << "one message: " << r.err;
    EXPECT_EQ(snapshot(work() / "res"), before) << "the previous result changed";
    EXPECT_EQ(work_listing(), std::vector<std::string>{"res"}) << "a partial folder was left behind";
  }
};

// 8 KiB: the CSV and text files fit, result.h5 does not; its close then fails (before the fix,
// HDF5's clean-up at exit then crashed on the half-closed file: signal 11).
TEST_F(CliFullDisk, RunFailsCleanlyWhenResultH5CannotBeWritten) {
  expect_clean_failure(8 << 10, {"run", kSmallCase, "--out", "res"}, "result.h5: File too large");
}

TEST_F(CliFullDisk, CompareFailsCleanlyWhenResultH5CannotBeWritten) {
  expect_clean_failure(8 << 10, {"compare", kSmallCase, kSmallCase, "--out", "res"}, "result.h5: File too large");
}

TEST_F(CliFullDisk, ValidateFailsCleanlyWhenResultH5CannotBeWritten) {
  // 24 KiB: validation.csv (about 15 KiB) fits, result.h5 (about 40 KiB) does not.
  expect_clean_failure(24 << 10, {"validate", "--out", "res"}, "result.h5: File too large");
}

// 1 KiB: the sweep journal (a line per finished point) passes it after a point or two. Before the
// fix the journal's exception escaped an OpenMP region: std::terminate, signal 6.
TEST_F(CliFullDisk, SweepFailsCleanlyWhenItsJournalCannotBeWritten) {
  const std::vector<std::string> args = {"sweep", kSmallCase, "--vary", "operation.speed=200:400:6:rpm", "--no-biomass",
                                         "--out", "res"};
  const auto first = run_limited(0, args);
  ASSERT_EQ(first.exit_code, 0) << first.err;
  const auto before = snapshot(work() / "res");
  auto forced = args;
  forced.push_back("--force");
  const auto r = run_limited(1 << 10, forced);
  EXPECT_EQ(r.signal, 0) << "killed by signal " << r.signal << "; stderr: " << r.err;
  EXPECT_EQ(r.exit_code, 1) << r.err;
  EXPECT_THAT(r.err, HasSubstr("oxystrat: error: cannot write res.journal.csv: File too large"));
  EXPECT_EQ(snapshot(work() / "res"), before);
  // The journal keeps what was written; no partial folder.
  EXPECT_EQ(work_listing(), (std::vector<std::string>{"res", "res.journal.csv"}));
}

// A truly full disk: a 256 KiB tmpfs, nearly filled first. Needs root and a kernel that lets this
// process mount (not in most containers): skipped otherwise, the limits above stand in.
TEST_F(CliFullDisk, RunOnAFullTmpfsFailsCleanly) {
  const fs::path disk = work() / "disk";
  fs::create_directory(disk);
  if (::geteuid() != 0 || ::mount("tmpfs", disk.c_str(), "tmpfs", 0, "size=256k") != 0) {
    GTEST_SKIP() << "cannot mount a tmpfs here";
  }
  struct Unmount {
    fs::path at;
    ~Unmount() { ::umount2(at.c_str(), MNT_DETACH); }
  } unmount{disk};
  const auto first = run_limited(0, {"run", kSmallCase, "--out", "res"}, disk);
  ASSERT_EQ(first.exit_code, 0) << first.err;
  const auto before = snapshot(disk / "res");
  // Fill the disk, then free 8 KiB: less than the new result needs.
  {
    std::ofstream fill(disk / "fill", std::ios::binary);
    const std::string block(1024, 'x');
    for (int i = 0; i < 4096 && fill; ++i) fill << block << std::flush;
  }
  const auto filled = fs::file_size(disk / "fill");
  ASSERT_GT(filled, 8u << 10);
  fs::resize_file(disk / "fill", filled - (8 << 10));
  const auto r = run_limited(0, {"run", kSmallCase, "--out", "res", "--force"}, disk);
  EXPECT_EQ(r.signal, 0) << "killed by signal " << r.signal << "; stderr: " << r.err;
  EXPECT_EQ(r.exit_code, 1) << r.err;
  EXPECT_THAT(r.err, HasSubstr("No space left on device"));
  EXPECT_EQ(snapshot(disk / "res"), before);
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(disk)) names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  EXPECT_EQ(names, (std::vector<std::string>{"fill", "res"}));
}

}  // namespace
}  // namespace oxystrat::test
