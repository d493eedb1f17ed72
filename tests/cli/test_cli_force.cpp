// --force replaces an old result, never a folder that holds what the run reads: not the folder of
// the case file or of a data file, not the working folder, nor any folder above them, however the
// path is spelt (relative, absolute, "..", a symbolic link, a trailing separator).
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class CliForce : public CliTest, public testing::WithParamInterface<std::string> {
 protected:
  void SetUp() override {
    CliTest::SetUp();
    fs::create_directories(work() / "proj" / "sub");
    fs::copy_file(kDataDir / "small-case.toml", work() / "proj" / "case.toml");
    fs::copy_file(kSourceDir / "cases" / "gassing-out-pilot.csv", work() / "proj" / "trace.csv");
    fs::copy_file(kSourceDir / "cases" / "pilot-300L-calib-kla.csv", work() / "proj" / "kla.csv");
    fs::create_directory_symlink("proj", work() / "link");
  }
  //! The --out argument of the parameter: "@" stands for the absolute path of work().
  std::string spelt() const {
    std::string s = GetParam();
    if (const auto at = s.find('@'); at != std::string::npos) s.replace(at, 1, work().string());
    return s;
  }
  void expect_refused(const RunResult& r, const std::string& what) {
    EXPECT_EQ(r.exit_code, 1) << r.err;
    EXPECT_THAT(r.err, HasSubstr("--force would delete"));
    EXPECT_THAT(r.err, HasSubstr(what));
    for (const auto* f : {"case.toml", "trace.csv", "kla.csv"}) EXPECT_TRUE(fs::exists(work() / "proj" / f)) << f;
    EXPECT_EQ(work_listing(), (std::vector<std::string>{"link", "proj"}));
  }
};

// Every spelling names proj (or a folder above it).
INSTANTIATE_TEST_SUITE_P(Spellings, CliForce,
                         testing::Values("proj", "proj/", "./proj", "proj//", "proj/sub/..", "@/proj", "@/proj/",
                                         "@/./proj/sub/../", "link", "link/", "@/link", "link/sub/.."),
                         [](const testing::TestParamInfo<std::string>& i) { return "spelling" + std::to_string(i.index); });

TEST_P(CliForce, NeverDeletesTheFolderOfTheCaseFile) {
  const auto r = oxystrat({"run", "proj/case.toml", "--out", spelt(), "--force"});
  expect_refused(r, "proj/case.toml");
  EXPECT_THAT(r.err, HasSubstr("which holds the input file"));
}

TEST_P(CliForce, NeverDeletesTheFolderOfAComparedCase) {
  expect_refused(oxystrat({"compare", (kDataDir / "small-case.toml").string(), "proj/case.toml", "--out", spelt(),
                           "--force"}),
                 "proj/case.toml");
}

TEST_P(CliForce, NeverDeletesTheFolderOfATrace) {
  expect_refused(oxystrat({"kla-fit", "proj/trace.csv", "--out", spelt(), "--force"}), "proj/trace.csv");
}

TEST_P(CliForce, NeverDeletesTheFolderOfCalibrationData) {
  expect_refused(oxystrat({"calibrate", (kSourceDir / "cases" / "pilot-300L.toml").string(), "--kla-data",
                           "proj/kla.csv", "--no-zone-check", "--out", spelt(), "--force"}),
                 "proj/kla.csv");
}

TEST_P(CliForce, NeverDeletesTheFolderOfAnIncludedFile) {
  // The case elsewhere, its included fragment in proj.
  std::ofstream(work() / "proj" / "model.toml") << "[model]\nkla_factor = 1.0\n";
  std::ofstream(work() / "case.toml") << "include = [\"proj/model.toml\"]\n" << read_file(kDataDir / "small-case.toml");
  const auto r = oxystrat({"run", "case.toml", "--out", spelt(), "--force"});
  EXPECT_EQ(r.exit_code, 1) << r.err;
  EXPECT_THAT(r.err, HasSubstr("proj/model.toml"));
  EXPECT_TRUE(fs::exists(work() / "proj" / "model.toml"));
}

using CliForceWorkingFolder = CliTest;

TEST_F(CliForceWorkingFolder, NeverDeletesTheWorkingFolderOrAFolderAboveIt) {
  fs::copy_file(kDataDir / "small-case.toml", work() / "case.toml");
  // The case lies in work() too; the working folder is named first in the message.
  const std::vector<std::string> spellings{work().string(), work().string() + "/", "../work", "../work/../work/.",
                                           work().parent_path().string()};
  for (const auto& out : spellings) {
    const auto r = oxystrat({"run", (kDataDir / "small-case.toml").string(), "--out", out, "--force"});
    EXPECT_EQ(r.exit_code, 1) << out << ": " << r.err;
    EXPECT_THAT(r.err, HasSubstr("which holds the working folder")) << out;
    EXPECT_TRUE(fs::exists(work() / "case.toml")) << out;
  }
  EXPECT_EQ(work_listing(), std::vector<std::string>{"case.toml"});
}

TEST_F(CliForceWorkingFolder, StillReplacesAnOldResult) {
  ASSERT_EQ(oxystrat({"run", (kDataDir / "small-case.toml").string(), "--out", "res"}).exit_code, 0);
  const auto r = oxystrat({"run", (kDataDir / "small-case.toml").string(), "--out", work().string() + "/res/", "--force"});
  EXPECT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(work_listing(), std::vector<std::string>{"res"});
}

}  // namespace
}  // namespace oxystrat::test
