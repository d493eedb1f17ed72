// Sweep and compare tables name the constraints a point breaks, and the names survive the journal
// (an interrupted sweep resumed, or points gathered from MPI ranks); a value that applies to some
// cases only keeps its own row.
#include <gtest/gtest.h>

#include <fstream>
#include <iterator>

#include "postproc/report/table_output.hpp"
#include "temp_folder.hpp"

namespace oxystrat::test {
namespace {

PointResult infeasible_point() {
  PointResult r;
  r.ok = true;
  r.feasible = false;
  r.values = {{"power_gassed", "W", 2500.0, "P gassed", "kW", 1e-3}, {"operating_cost", "EUR/h", 0.75, "operating cost", "EUR/h", 1.0}};
  r.checks = {{"do_min", false, "DO min 0.01 mmol/L | 3 % below"}, {"cooling", false, "cooling 10 kW for 12 kW"},
              {"tip_speed", true, "3 m/s"}};
  return r;
}

std::string read(const std::filesystem::path& p) {
  std::ifstream in(p);
  return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
}

TEST(SweepViolations, ChecksSurviveTheJournal) {
  const auto line = encode_point(7, infeasible_point());
  size_t index = 0;
  PointResult back;
  ASSERT_TRUE(decode_point(line, index, back));
  EXPECT_EQ(index, 7u);
  ASSERT_EQ(back.values.size(), 2u);  // the checks are not mistaken for values
  ASSERT_EQ(back.checks.size(), 3u);
  EXPECT_EQ(back.checks[0].name, "do_min");
  EXPECT_FALSE(back.checks[0].satisfied);
  EXPECT_TRUE(back.checks[2].satisfied);
  EXPECT_EQ(back.checks[1].detail, "cooling 10 kW for 12 kW");
}

TEST(SweepViolations, SweepCsvNamesTheBrokenConstraints) {
  TempFolder dir;
  const auto plan = full_factorial({{"operation.speed", 100, 200, 2, "rpm", ""}});
  PointResult good;
  good.ok = true;
  good.feasible = true;
  good.values = {{"power_gassed", "W", 3000.0, "P gassed", "kW", 1e-3}};  // no operating_cost here: an empty cell
  const std::vector<PointResult> results{infeasible_point(), good};
  write_sweep_csv((dir / "sweep.csv").string(), plan, results, {false, true}, 1);
  const auto text = read(dir / "sweep.csv");
  EXPECT_NE(text.find("power_gassed [kW],operating_cost [EUR/h],violated,error"), std::string::npos) << text;
  EXPECT_NE(text.find(",\"do_min; cooling\","), std::string::npos) << text;
  EXPECT_NE(text.find("1,200,1,1,1,1,3,,\"\","), std::string::npos) << text;
}

TEST(SweepViolations, CompareKeepsRowsThatApplyToSomeCases) {
  TempFolder dir;
  const std::vector<std::vector<SummaryValue>> values{{{"power_gassed", "W", 2000.0, "P", "kW", 1e-3}, {"operating_cost", "EUR/h", 1.5, "c", "EUR/h", 1.0}},
                                                      {{"power_gassed", "W", 3000.0, "P", "kW", 1e-3}}};
  write_compare_csv((dir / "compare.csv").string(), {"a", "b"}, values, {"", "do_min; heat"});
  const auto text = read(dir / "compare.csv");
  EXPECT_NE(text.find("power_gassed,kW,2,3\n"), std::string::npos) << text;
  EXPECT_NE(text.find("operating_cost,EUR/h,1.5,\n"), std::string::npos) << text;
  EXPECT_NE(text.find("violated,text,\"\",\"do_min; heat\"\n"), std::string::npos) << text;
  const auto shown = compare_text({"a", "b"}, values, {true, false}, {"", "do_min; heat"});
  EXPECT_NE(shown.find("do_min; heat"), std::string::npos) << shown;
}

}  // namespace
}  // namespace oxystrat::test
