// The executable's failures: a bad case or argument exits non-zero with one clear message on
// stderr and writes nothing; an existing result is kept unless --force is given.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <string>

#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

const std::string kBadCase = (kDataDir / "bad-unit.toml").string();

//! An old result folder in work() with one marker file.
void make_old_result(const fs::path& dir) {
  fs::create_directory(dir);
  std::ofstream(dir / "marker.txt") << "old result";
}

using CliErrors = CliTest;

TEST_F(CliErrors, RunIntoAnExistingFolderFailsAndKeepsIt) {
  make_old_result(work() / "result");
  const auto r = oxystrat({"run", kSmallCase, "--out", "result"});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("oxystrat: error: output folder result exists"));
  EXPECT_THAT(r.err, HasSubstr("--force"));
  EXPECT_EQ(read_file(work() / "result" / "marker.txt"), "old result");
  EXPECT_FALSE(fs::exists(work() / "result" / "result.h5"));
  EXPECT_EQ(work_listing(), std::vector<std::string>{"result"});
}

TEST_F(CliErrors, ForceReplacesAnExistingFolder) {
  make_old_result(work() / "result");
  const auto r = oxystrat({"run", kSmallCase, "--out", "result", "--force"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_FALSE(fs::exists(work() / "result" / "marker.txt"));
  EXPECT_TRUE(fs::exists(work() / "result" / "result.h5"));
  EXPECT_EQ(work_listing(), std::vector<std::string>{"result"});
}

TEST_F(CliErrors, BadCaseFailsWithTheMessageAndWritesNothing) {
  const auto r = oxystrat({"run", kBadCase, "--out", "result"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("oxystrat: error: " + kBadCase + ":15: operation.speed = \"300 rpx\""));
  EXPECT_THAT(r.err, HasSubstr("unknown unit 'rpx'; expected one of rpm"));
  EXPECT_TRUE(r.out.empty()) << r.out;
  EXPECT_TRUE(work_listing().empty());  // neither the folder nor a partial one
}

TEST_F(CliErrors, CheckOfABadCaseFails) {
  const auto r = oxystrat({"check", kBadCase});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr(kBadCase + ":15: operation.speed"));
  EXPECT_THAT(r.out, testing::Not(HasSubstr("Case is valid.")));
}

TEST_F(CliErrors, BadOverrideNamesTheArgument) {
  const auto r = oxystrat({"run", kSmallCase, "--out", "result", "--set", "impeller.5.type=rushton"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("--set 'impeller.5.type=rushton': 'impeller.5' does not exist"));
  EXPECT_TRUE(work_listing().empty());
}

TEST_F(CliErrors, OverrideWithoutEqualsIsRefused) {
  const auto r = oxystrat({"check", kSmallCase, "--set", "operation.speed"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_THAT(r.err, HasSubstr("--set 'operation.speed': expected KEY=VALUE"));
}

TEST_F(CliErrors, OverridesReachTheCase) {
  const auto r = oxystrat({"check", kSmallCase, "--set", "grid.axial=30", "--set", "operation.speed=110 rpm"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("asked 4 x 30"));
}

TEST_F(CliErrors, MissingCaseFile) {
  const auto r = oxystrat({"check", "no-such-case.toml"});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("no-such-case.toml"));
}

TEST_F(CliErrors, RunNeedsAnOutputFolder) {
  const auto r = oxystrat({"run", kSmallCase});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("--out"));
  EXPECT_TRUE(work_listing().empty());
}

TEST_F(CliErrors, ACommandIsRequired) {
  const auto r = oxystrat({});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("subcommand"));
}

TEST_F(CliErrors, UnknownCommand) {
  const auto r = oxystrat({"solve", kSmallCase});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_FALSE(r.err.empty());
}

}  // namespace
}  // namespace oxystrat::test
