// End to end: compare and sweep on bundled cases; an interrupted sweep resumes to the same table.
#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

class SweepCli : public CliTest {};

const std::vector<std::string> kSmallGrid{"--set", "grid.radial=4", "--set", "grid.axial=12"};

std::vector<std::string> sweep_args(const std::string& out, std::vector<std::string> extra = {}) {
  std::vector<std::string> a{"sweep", (kSourceDir / "cases/pilot-300L.toml").string(), "--vary",
                             "operation.speed=300:500:3", "--vary", "operation.gas_flow=0.5:1.5:2", "--out", out};
  a.insert(a.end(), kSmallGrid.begin(), kSmallGrid.end());
  a.insert(a.end(), extra.begin(), extra.end());
  return a;
}

TEST_F(SweepCli, InterruptedSweepResumesToTheSameResult) {
  ASSERT_EQ(oxystrat(sweep_args("whole")).exit_code, 0);
  // Stop after 2 and then 3 points; the journal keeps them; no result folder appears meanwhile.
  const auto first = oxystrat(sweep_args("parts", {"--max-points", "2"}));
  ASSERT_EQ(first.exit_code, 0) << first.err;
  EXPECT_FALSE(fs::exists(work() / "parts"));
  EXPECT_TRUE(fs::exists(work() / "parts.journal.csv"));
  ASSERT_EQ(oxystrat(sweep_args("parts", {"--max-points", "3", "--resume"})).exit_code, 0);
  ASSERT_EQ(oxystrat(sweep_args("parts", {"--resume"})).exit_code, 0);
  EXPECT_FALSE(fs::exists(work() / "parts.journal.csv"));  // removed once complete
  EXPECT_EQ(read_file(work() / "parts/sweep.csv"), read_file(work() / "whole/sweep.csv"));
}

TEST_F(SweepCli, ThreadsDoNotChangeTheTable) {
  ASSERT_EQ(oxystrat(sweep_args("one", {"--threads", "1"})).exit_code, 0);
  ASSERT_EQ(oxystrat(sweep_args("two", {"--threads", "2"})).exit_code, 0);
  EXPECT_EQ(read_file(work() / "one/sweep.csv"), read_file(work() / "two/sweep.csv"));
}

TEST_F(SweepCli, WritesTableHdf5AndReport) {
  const auto r = oxystrat(sweep_args("out", {"--sample", "lhs:4", "--set", "constraints.max_tip_speed=4.5 m/s"}));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  for (const auto* f : {"sweep.csv", "result.h5", "report.html"}) EXPECT_TRUE(fs::exists(work() / "out" / f)) << f;
  EXPECT_NE(read_file(work() / "out/sweep.csv").find("operation.speed [rpm]"), std::string::npos);
  EXPECT_NE(read_file(work() / "out/report.html").find("<svg"), std::string::npos);
}

TEST_F(SweepCli, BadVaryIsAClearError) {
  const auto r = oxystrat(sweep_args("out", {"--vary", "operation.speed=1:2"}));
  EXPECT_NE(r.exit_code, 0);
  EXPECT_NE(r.err.find("START:STOP:COUNT"), std::string::npos);
  EXPECT_FALSE(fs::exists(work() / "out"));
}

// Refused before any point runs: exit 1, the reason, no journal and no folder (it used to run every
// point to failure and exit 0, or fail only after all had run).
TEST_F(SweepCli, BadAxesAndObjectivesAreRefusedBeforeRunning) {
  const std::vector<std::pair<std::vector<std::string>, std::string>> bad = {
      {{"--vary", "operation.sped=300:400:2:rpm"}, "did you mean operation.speed?"},
      {{"--vary", "operation.speed=300:400:2:kg"}, "unknown unit 'kg'"},
      {{"--vary", "operation.speed=nan:400:2"}, "finite numbers"},
      {{"--vary", "operation.speed=300:1e6:2"}, "out of range"},
      {{"--objective", "foo"}, "--objective 'foo': no value named foo"},
      {{"--objective", "theta95"}, "theta95 needs --with-mixing"},
      {{"--vary", "vessel.diameter=1:2:400:m", "--vary", "vessel.liquid_height=1:2:400:m"}, "at most 100000 points"},
  };
  for (const auto& [extra, message] : bad) {
    const auto r = oxystrat(sweep_args("out", extra));
    EXPECT_EQ(r.exit_code, 1) << message;
    EXPECT_NE(r.err.find(message), std::string::npos) << r.err;
    EXPECT_EQ(r.out.find("points ("), std::string::npos) << "it started running: " << r.out;
    EXPECT_TRUE(work_listing().empty()) << message;
  }
}

TEST_F(SweepCli, CompareWritesOneColumnPerCase) {
  std::vector<std::string> a{"compare", (kSourceDir / "cases/tall-3rushton.toml").string(),
                             (kSourceDir / "cases/tall-rushton-hydrofoils.toml").string(), "--out", "cmp"};
  a.insert(a.end(), kSmallGrid.begin(), kSmallGrid.end());
  const auto r = oxystrat(a);
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto csv = read_file(work() / "cmp/compare.csv");
  EXPECT_NE(csv.find("\"tall-3rushton\",\"tall-rushton-hydrofoils\""), std::string::npos);
  EXPECT_NE(csv.find("theta95,s,"), std::string::npos);
  EXPECT_TRUE(fs::exists(work() / "cmp/report.html"));
}

}  // namespace
}  // namespace oxystrat::test
