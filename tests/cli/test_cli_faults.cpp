// Faults as tests: absurd sizes are refused by the reader before anything is built, an output
// folder that cannot be written gives a message and leaves nothing behind, and a run killed
// while it writes its output leaves the previous result as it was, with at most a
// DIR.partial-* folder beside it (docs/commands.md: output is written to DIR.partial-PID and moved into
// place on success only).
#include <fcntl.h>
#include <gmock/gmock.h>
#include <gtest/gtest.h>
#include <signal.h>
#include <sys/mount.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <map>
#include <thread>

#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;
using Clock = std::chrono::steady_clock;

// A refusal reads a few hundred bytes of TOML; building what these inputs ask for would take
// tens of gigabytes and minutes or more. 30 s separates the two with a wide margin even in a
// sanitizer build on a loaded machine: a guard against "tried to build it", not a speed target.
constexpr double kRefusalSeconds = 30.0;

class CliFaults : public CliTest {
 protected:
  //! Runs `oxystrat run` on the small case with `sets`; expects a quick exit 1 with `message` on
  //! stderr and nothing written.
  void expect_refused(const std::vector<std::string>& sets, const std::vector<std::string>& message) {
    std::vector<std::string> args = {"run", kSmallCase, "--out", "res"};
    for (const auto& s : sets) {
      args.push_back("--set");
      args.push_back(s);
    }
    const auto t0 = Clock::now();
    const auto r = oxystrat(args);
    const double seconds = std::chrono::duration<double>(Clock::now() - t0).count();
    EXPECT_EQ(r.exit_code, 1) << r.err;
    EXPECT_LT(seconds, kRefusalSeconds);
    for (const auto& m : message) EXPECT_THAT(r.err, HasSubstr(m));
    EXPECT_THAT(r.err, HasSubstr("oxystrat: error: "));
    EXPECT_TRUE(work_listing().empty()) << "a refused case must not create its output folder";
  }
};

TEST_F(CliFaults, HundredMillionZonesByGridKeysAreRefused) {
  // 10000 x 10000 = 1e8 zones: each key is past its own limit (radial 1-2000, axial 1-20000).
  expect_refused({"grid.radial=10000", "grid.axial=10000"},
                 {"--set 'grid.radial=10000'", "out of range: allowed 1 to 2000"});
}

TEST_F(CliFaults, FortyMillionZonesWithinEachKeysLimitAreRefused) {
  // 2000 x 20000 passes both single-key ranges; the product limit (4 million zones) refuses it.
  expect_refused({"grid.radial=2000", "grid.axial=20000"}, {"40000000 zones", "at most 4,000,000"});
}

TEST_F(CliFaults, OneMillimetreVesselIsRefused) {
  expect_refused({"vessel.diameter=1 mm"}, {"--set 'vessel.diameter=1 mm'", "out of range", "0.05 m to 20 m"});
}

TEST_F(CliFaults, MillionRpmIsRefused) {
  expect_refused({"operation.speed=1e6 rpm"}, {"--set 'operation.speed=1e6 rpm'", "out of range", "3000 rpm"});
}

// A case file that is a device, a pipe or a folder is refused before it is opened: `check
// /dev/zero` used to read 4 GB, a FIFO would block for ever.
TEST_F(CliFaults, SpecialFilesAreRefusedAsCaseFiles) {
  ASSERT_EQ(::mkfifo((work() / "pipe").c_str(), 0600), 0);
  for (const std::string path : {"/dev/zero", "pipe"}) {
    const auto t0 = Clock::now();
    const auto r = oxystrat({"check", path});
    EXPECT_LT(std::chrono::duration<double>(Clock::now() - t0).count(), kRefusalSeconds) << path;
    EXPECT_EQ(r.exit_code, 1) << path << ": " << r.err;
    EXPECT_THAT(r.err, HasSubstr("oxystrat: error: " + path + ": the case file must be")) << path;
  }
  fs::create_directory(work() / "folder.toml");  // the argument parser refuses folders itself
  const auto folder = oxystrat({"check", "folder.toml"});
  EXPECT_NE(folder.exit_code, 0);
  EXPECT_THAT(folder.err, HasSubstr("directory: folder.toml"));
  std::ofstream(work() / "big.toml") << std::string(17u << 20, '#');  // 17 MiB of comment
  EXPECT_THAT(oxystrat({"check", "big.toml"}).err, HasSubstr("big.toml: the case file is larger than 16 MiB"));
}

// Bad input that used to pass `check` or fail only later, refused when the case is read.
TEST_F(CliFaults, InputChecksHappenBeforeAnyWork) {
  std::ofstream(work() / "event.toml") << read_file(kSmallCase) << "\n[[event]]\ntime = \"1 h\"\nset = \"operation.sped=200 rpm\"\n";
  auto r = oxystrat({"check", "event.toml"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("event.toml:"));
  EXPECT_THAT(r.err, HasSubstr("event.0.set = \"operation.sped=200 rpm\""));
  r = oxystrat({"check", kSmallCase, "--set", "title=\"x\" garbage"});
  EXPECT_EQ(r.exit_code, 1);
  r = oxystrat({"check", kSmallCase, "--set", "vessel.temperature=80 degC", "--set", "vessel.head_pressure=0.45 bar(a)"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("the broth boils"));
  r = oxystrat({"check", kSmallCase, "--set", "operation.oxygen_fraction=1"});
  EXPECT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.err, HasSubstr("warning: --set 'operation.oxygen_fraction=1': oxygen-enriched gas"));
  EXPECT_TRUE(work_listing() == (std::vector<std::string>{"event.toml"}));
}

TEST_F(CliFaults, OutputUnderARegularFileGivesAMessage) {
  { std::ofstream(work() / "blocker") << "not a folder\n"; }
  const auto r = oxystrat({"run", kSmallCase, "--out", "blocker/res"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("oxystrat: error: cannot create blocker"));
  EXPECT_THAT(r.err, HasSubstr("Not a directory"));
  EXPECT_EQ(work_listing(), std::vector<std::string>{"blocker"});
  EXPECT_TRUE(fs::is_regular_file(work() / "blocker"));
}

TEST_F(CliFaults, OutputWhereNobodyMayCreateFoldersGivesAMessage) {
  // sysfs refuses mkdir even to root (and is read-only in containers): unwritable for anyone.
  if (!fs::is_directory("/sys")) GTEST_SKIP() << "no /sys on this machine";
  const std::string target = "/sys/oxystrat-cli-faults-" + std::to_string(::getpid());
  const auto r = oxystrat({"run", kSmallCase, "--out", target});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("oxystrat: error: cannot create " + target));
  EXPECT_FALSE(fs::exists(target));
  EXPECT_TRUE(work_listing().empty());
}

TEST_F(CliFaults, OutputInAReadOnlyFolderGivesAMessage) {
  if (::geteuid() == 0) GTEST_SKIP() << "root ignores folder permissions (the /sys test covers this case)";
  fs::create_directory(work() / "ro");
  fs::permissions(work() / "ro", fs::perms::owner_read | fs::perms::owner_exec);
  const auto r = oxystrat({"run", kSmallCase, "--out", "ro/res"});
  fs::permissions(work() / "ro", fs::perms::owner_all);
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("oxystrat: error: cannot create ro/res"));
  EXPECT_TRUE(fs::is_empty(work() / "ro"));
}

// ---- a run killed with SIGKILL while it writes its output ----

//! Starts oxystrat with `args` in `cwd` (output to /dev/null) and returns its pid. The signals the
//! tests send have their default action in it, whatever the test runner set.
pid_t spawn(const fs::path& cwd, const std::vector<std::string>& args) {
  const pid_t pid = ::fork();
  if (pid == 0) {
    if (::chdir(cwd.c_str()) != 0) ::_exit(127);
    const int null = ::open("/dev/null", O_WRONLY);
    ::dup2(null, 1);
    ::dup2(null, 2);
    for (int sig : {SIGINT, SIGTERM, SIGHUP}) ::signal(sig, SIG_DFL);
    std::vector<char*> argv;
    std::string exe = kExe.string();
    argv.push_back(exe.data());
    std::vector<std::string> copy = args;
    for (auto& a : copy) argv.push_back(a.data());
    argv.push_back(nullptr);
    ::execv(exe.c_str(), argv.data());
    ::_exit(127);
  }
  return pid;
}

//! The staging folders DIR.partial-* in `work`.
std::vector<fs::path> partial_folders(const fs::path& work, const std::string& dir) {
  std::vector<fs::path> out;
  for (const auto& e : fs::directory_iterator(work)) {
    if (e.path().filename().string().rfind(dir + ".partial-", 0) == 0) out.push_back(e.path());
  }
  return out;
}

// A network whose output takes seconds (3200 zones revolved into 360 sectors: over a million VTK
// cells) and whose computing takes little (no gas, so no oxygen solve): the kill lands while the
// files are being written.
const std::vector<std::string> kSlowOutput = {"--set", "grid.radial=40", "--set", "grid.axial=80",
                                              "--set", "output.sectors=360", "--set", "operation.gas_flow=0 vvm"};

//! Runs the slow-output case into `dir` (with --force) and kills it with `sig` as soon as its
//! staging folder holds result.h5, i.e. once output has begun.
void kill_during_output(const fs::path& work, const std::string& dir, int sig = SIGKILL) {
  std::vector<std::string> args = {"run", kSmallCase, "--out", dir, "--force"};
  args.insert(args.end(), kSlowOutput.begin(), kSlowOutput.end());
  const pid_t pid = spawn(work, args);
  ASSERT_GT(pid, 0);
  const auto deadline = Clock::now() + std::chrono::seconds(300);
  bool writing = false;
  while (!writing && Clock::now() < deadline) {
    int status = 0;
    if (::waitpid(pid, &status, WNOHANG) == pid) {
      FAIL() << "the run ended (status " << status << ") before it could be killed during output";
    }
    for (const auto& p : partial_folders(work, dir)) writing = writing || fs::exists(p / "result.h5");
    if (!writing) std::this_thread::sleep_for(std::chrono::milliseconds(2));
  }
  ASSERT_TRUE(writing) << "output did not begin within 300 s";
  ASSERT_EQ(::kill(pid, sig), 0);
  int status = 0;
  ASSERT_EQ(::waitpid(pid, &status, 0), pid);
  // SIGINT and SIGTERM end it as the signal would (after its clean-up), not with an exit code.
  EXPECT_TRUE(WIFSIGNALED(status) && WTERMSIG(status) == sig) << "the run finished before the kill (status " << status << ")";
}

TEST_F(CliFaults, KilledDuringOutputLeavesThePreviousResultIntact) {
  ASSERT_EQ(oxystrat({"run", kSmallCase, "--out", "res"}).exit_code, 0);
  const auto before = snapshot(work() / "res");
  ASSERT_TRUE(before.count("result.h5") == 1);

  kill_during_output(work(), "res");

  EXPECT_EQ(snapshot(work() / "res"), before) << "the previous result changed";
  for (const auto& name : work_listing()) {
    EXPECT_TRUE(name == "res" || name.rfind("res.partial-", 0) == 0) << "unexpected " << name;
  }
}

TEST_F(CliFaults, KilledDuringOutputLeavesNoFolderThatLooksFinished) {
  kill_during_output(work(), "res");
  EXPECT_FALSE(fs::exists(work() / "res"));
  for (const auto& name : work_listing()) EXPECT_EQ(name.rfind("res.partial-", 0), 0u) << "unexpected " << name;
}

// ---- SIGINT and SIGTERM clean up; the next run tidies what SIGKILL left ----

class CliInterrupts : public CliFaults, public testing::WithParamInterface<int> {};

TEST_P(CliInterrupts, InterruptDuringOutputRemovesThePartialFolderAndKeepsThePreviousResult) {
  ASSERT_EQ(oxystrat({"run", kSmallCase, "--out", "res"}).exit_code, 0);
  const auto before = snapshot(work() / "res");
  kill_during_output(work(), "res", GetParam());
  EXPECT_EQ(snapshot(work() / "res"), before) << "the previous result changed";
  EXPECT_EQ(work_listing(), std::vector<std::string>{"res"}) << "a partial folder was left behind";
}

TEST_P(CliInterrupts, InterruptDuringAFirstRunLeavesNothing) {
  kill_during_output(work(), "res", GetParam());
  EXPECT_TRUE(work_listing().empty()) << "left: " << testing::PrintToString(work_listing());
}

INSTANTIATE_TEST_SUITE_P(Signals, CliInterrupts, testing::Values(SIGINT, SIGTERM, SIGHUP),
                         [](const testing::TestParamInfo<int>& i) {
                           return std::string(i.param == SIGINT ? "SIGINT" : i.param == SIGTERM ? "SIGTERM" : "SIGHUP");
                         });

TEST_F(CliFaults, NextRunRemovesThePartialFolderOfAKilledRun) {
  kill_during_output(work(), "res");
  ASSERT_FALSE(partial_folders(work(), "res").empty()) << "SIGKILL left no partial folder to tidy";
  const auto r = oxystrat({"run", kSmallCase, "--out", "res"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.err, HasSubstr("note: removed res.partial-"));
  EXPECT_EQ(work_listing(), std::vector<std::string>{"res"});
}

// A sweep interrupted (SIGTERM) once some points are journalled: no partial folder, the journal
// keeps them, and --resume finishes to the table of an uninterrupted sweep.
TEST_F(CliFaults, KilledSweepResumesFromItsJournal) {
  const std::vector<std::string> sweep = {"sweep", (kSourceDir / "cases/pilot-300L.toml").string(), "--vary",
                                          "operation.speed=300:500:4", "--vary", "operation.gas_flow=0.5:1.5:3",
                                          "--set", "grid.radial=14", "--set", "grid.axial=50", "--with-mixing",
                                          "--threads", "1", "--out"};
  auto args = sweep;
  args.push_back("res");
  const pid_t pid = spawn(work(), args);
  ASSERT_GT(pid, 0);
  const auto journalled = [&] {
    const auto text = read_file(work() / "res.journal.csv");
    return std::count(text.begin(), text.end(), '\n') - 1;  // less the signature line
  };
  const auto deadline = Clock::now() + std::chrono::seconds(120);
  int status = 0;
  bool ended = false;
  while (journalled() < 2 && Clock::now() < deadline) {
    if (::waitpid(pid, &status, WNOHANG) == pid) {
      ended = true;
      break;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(5));
  }
  if (!ended) {
    ASSERT_EQ(::kill(pid, SIGTERM), 0);
    ASSERT_EQ(::waitpid(pid, &status, 0), pid);
  }
  if (ended || fs::exists(work() / "res")) GTEST_SKIP() << "the sweep finished before it could be interrupted";
  EXPECT_TRUE(WIFSIGNALED(status) && WTERMSIG(status) == SIGTERM) << status;
  const auto kept = journalled();
  EXPECT_GE(kept, 2);
  EXPECT_TRUE(partial_folders(work(), "res").empty()) << "the interrupt left a partial folder";
  args.push_back("--resume");
  const auto resumed = oxystrat(args);
  ASSERT_EQ(resumed.exit_code, 0) << resumed.err;
  EXPECT_THAT(resumed.out, HasSubstr(std::to_string(kept) + " from the journal"));
  auto whole = sweep;
  whole.push_back("whole");
  ASSERT_EQ(oxystrat(whole).exit_code, 0);
  EXPECT_EQ(read_file(work() / "res/sweep.csv"), read_file(work() / "whole/sweep.csv"));
}

//! The id of a process that has ended (forked, exited and reaped).
pid_t dead_pid() {
  const pid_t pid = ::fork();
  if (pid == 0) ::_exit(0);
  int status = 0;
  ::waitpid(pid, &status, 0);
  return pid;
}

TEST_F(CliFaults, NextRunPutsBackTheOldResultAKilledCommitHadMovedAside) {
  // A kill between a commit's two renames leaves the previous result as DIR.old-PID and no DIR.
  ASSERT_EQ(oxystrat({"run", kSmallCase, "--out", "res"}).exit_code, 0);
  const auto before = snapshot(work() / "res");
  const std::string aside = "res.old-" + std::to_string(dead_pid());
  fs::rename(work() / "res", work() / aside);
  // Without --force the put-back result is then an existing folder, kept as it was.
  const auto r = oxystrat({"run", kSmallCase, "--out", "res"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("note: put back res from " + aside));
  EXPECT_THAT(r.err, HasSubstr("output folder res exists"));
  EXPECT_EQ(snapshot(work() / "res"), before);
  EXPECT_EQ(work_listing(), std::vector<std::string>{"res"});
}

TEST_F(CliFaults, NextRunRemovesAnOldResultLeftBesideTheNewOne) {
  // A kill after a commit's second rename leaves the old result beside the new one: garbage.
  ASSERT_EQ(oxystrat({"run", kSmallCase, "--out", "res"}).exit_code, 0);
  fs::create_directory(work() / ("res.old-" + std::to_string(dead_pid())));
  ASSERT_EQ(oxystrat({"run", kSmallCase, "--out", "res", "--force"}).exit_code, 0);
  EXPECT_EQ(work_listing(), std::vector<std::string>{"res"});
}

TEST_F(CliFaults, LeftoversOfALiveProcessAreLeftAlone) {
  // This test's own process is alive: its staging folder may be in use.
  const std::string mine = "res.partial-" + std::to_string(::getpid()) + "-0";
  fs::create_directory(work() / mine);
  ASSERT_EQ(oxystrat({"run", kSmallCase, "--out", "res"}).exit_code, 0);
  EXPECT_EQ(work_listing(), (std::vector<std::string>{"res", mine}));
}

}  // namespace
}  // namespace oxystrat::test
