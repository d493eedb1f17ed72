// End to end: heat, shear and cost in the outputs of run, transient, sweep and compare, with units;
// values that do not apply are absent, never NaN; infeasible points name what they break.
#include <gmock/gmock.h>

#include <cmath>
#include <regex>

#include "cli_runner.hpp"
#include "h5_read.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

class LimitsCli : public CliTest {};

const fs::path kCooled = kDataDir / "cooled-case.toml";
const fs::path kPlain = kDataDir / "small-case.toml";

TEST_F(LimitsCli, RunPrintsAndWritesHeatShearAndCostWithUnits) {
  const auto r = oxystrat({"run", kCooled.string(), "--out", "res"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  for (const char* line : {"Heat ", "into the broth", "cooling        required", "Shear ", "eddies", "Power and cost",
                           "compressor", "EUR/h"}) {
    EXPECT_THAT(r.out, HasSubstr(line));
  }
  const auto f = open_h5((work() / "res/result.h5").string());
  for (const auto& [path, unit] : std::vector<std::pair<std::string, std::string>>{
           {"/summary/heat_metabolic", "W"}, {"/summary/heat_agitation", "W"}, {"/summary/heat_gas", "W"},
           {"/summary/cooling_required", "W"}, {"/summary/cooling_available", "W"}, {"/summary/max_biomass_heat", "kg/m3"},
           {"/summary/compressor_power", "W"}, {"/summary/operating_cost", "EUR/h"}, {"/fields/kolmogorov_length", "m"},
           {"/impellers/dissipation_max", "W/kg"}}) {
    EXPECT_EQ(read_attribute(f, path, "units"), unit) << path;
  }
  EXPECT_EQ(read_attribute(f, "/summary/operating_cost", "currency"), "EUR");
  EXPECT_EQ(read_doubles(f, "/fields/kolmogorov_length").size(), read_doubles(f, "/zones/volume").size());
  // The metabolic heat is 440 kJ per mol O2 taken up (Cordier et al. 1987): round-off only.
  EXPECT_NEAR(read_doubles(f, "/summary/heat_metabolic")[0] / (440e3 * read_doubles(f, "/summary/our_total")[0]), 1.0,
              1e-12);
}

TEST_F(LimitsCli, WithoutCoolingOrPricesTheValuesAreAbsentNotNaN) {
  const auto r = oxystrat({"run", kPlain.string(), "--out", "res"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto f = open_h5((work() / "res/result.h5").string());
  const auto walk = walk_datasets(f);
  EXPECT_THAT(walk.all, testing::Contains("summary/cooling_required"));
  EXPECT_THAT(walk.all, testing::Not(testing::Contains("summary/cooling_available")));
  EXPECT_THAT(walk.all, testing::Not(testing::Contains("summary/operating_cost")));
  EXPECT_THAT(walk.all, testing::Not(testing::Contains("summary/max_biomass_heat")));
  for (const auto& name : {"summary/heat_metabolic", "summary/compressor_power", "summary/total_power",
                           "summary/dissipation_max", "summary/kolmogorov_length_min"}) {
    const auto v = read_doubles(f, std::string("/") + name);
    ASSERT_EQ(v.size(), 1u) << name;
    EXPECT_TRUE(std::isfinite(v[0])) << name;
  }
  EXPECT_THAT(r.out, HasSubstr("no [cooling] table to compare with"));
}

TEST_F(LimitsCli, TransientTracesTheHeatLoad) {
  const auto r = oxystrat({"transient", kCooled.string(), "--duration", "2 min", "--interval", "1 min", "--out", "tr"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(read_file(work() / "tr/trace.csv"), HasSubstr("heat load [kW]"));
  const auto f = open_h5((work() / "tr/result.h5").string());
  EXPECT_EQ(read_attribute(f, "/transient/heat_load", "units"), "W");
  const auto load = read_doubles(f, "/transient/heat_load");
  EXPECT_EQ(load.size(), read_doubles(f, "/transient/time").size());
  EXPECT_GT(load.back(), 0.0);
}

int chosen_point(const std::string& out) {
  std::smatch m;
  if (!std::regex_search(out, m, std::regex("chosen point ([0-9]+)"))) return -1;
  return std::stoi(m[1]);
}

TEST_F(LimitsCli, CheapestSweepPointIsNotTheLeastAgitatorPowerPoint) {
  // The 300 L pilot over speed and gas flow (invented electricity price). The least gassed power is
  // at the most gas (gassed power falls with gas); compressing that gas costs more than it saves.
  std::vector<std::string> args{"sweep", (kSourceDir / "cases/pilot-300L.toml").string(), "--vary",
                                "operation.speed=300:500:3:rpm", "--vary", "operation.gas_flow=0.5:2:4:vvm",
                                "--no-biomass", "--set", "grid.radial=4", "--set", "grid.axial=12", "--set",
                                "prices.currency=EUR", "--set", "prices.electricity=0.15 EUR/kWh"};
  auto cost = args, agitation = args;
  for (const auto& s : {"--objective", "operating_cost", "--out", "cost"}) cost.emplace_back(s);
  for (const auto& s : {"--objective", "power_gassed", "--out", "agitation"}) agitation.emplace_back(s);
  const auto a = oxystrat(cost), b = oxystrat(agitation);
  ASSERT_EQ(a.exit_code, 0) << a.err;
  ASSERT_EQ(b.exit_code, 0) << b.err;
  ASSERT_GE(chosen_point(a.out), 0) << a.out;
  ASSERT_GE(chosen_point(b.out), 0) << b.out;
  EXPECT_NE(chosen_point(a.out), chosen_point(b.out));
  const auto csv = read_file(work() / "cost/sweep.csv");
  EXPECT_THAT(csv, HasSubstr("operating_cost [EUR/h]"));
  EXPECT_THAT(csv, HasSubstr(",violated,error"));
  const auto f = open_h5((work() / "cost/result.h5").string());
  EXPECT_EQ(read_strings(f, "/sweep/violated").size(), 12u);
  EXPECT_EQ(read_ints(f, "/sweep/chosen_on_edge").size(), 1u);
}

TEST_F(LimitsCli, InfeasiblePointsNameTheirConstraintsAndTheEdgeIsFlagged) {
  // Two speeds with a tip-speed limit between them: the faster point breaks it; the chosen point is
  // then the slower one, the lowest swept speed: on the edge.
  const auto r = oxystrat({"sweep", kCooled.string(), "--vary", "operation.speed=200:400:2:rpm", "--no-biomass",
                           "--set", "constraints.max_tip_speed=3 m/s", "--out", "sw"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("tip_speed (1)"));
  EXPECT_THAT(r.out, HasSubstr("EDGE: the chosen point has the smallest or largest swept value of operation.speed"));
  EXPECT_THAT(read_file(work() / "sw/sweep.csv"), HasSubstr("tip_speed"));
}

TEST_F(LimitsCli, CostObjectiveWithoutPricesIsRefusedBeforeRunning) {
  const auto r = oxystrat({"sweep", kPlain.string(), "--vary", "operation.speed=200:400:2:rpm", "--objective",
                           "operating_cost", "--out", "sw"});
  EXPECT_NE(r.exit_code, 0);
  EXPECT_THAT(r.err, HasSubstr("[prices]"));
  EXPECT_FALSE(fs::exists(work() / "sw"));
}

TEST_F(LimitsCli, CompareKeepsACostRowForTheCaseWithPrices) {
  const auto r = oxystrat({"compare", kCooled.string(), kPlain.string(), "--no-mixing", "--out", "cmp"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto csv = read_file(work() / "cmp/compare.csv");
  EXPECT_THAT(csv, testing::ContainsRegex("operating_cost,EUR/h,[0-9.e+-]+,\n"));
  EXPECT_THAT(csv, HasSubstr("violated,text,"));
}

}  // namespace
}  // namespace oxystrat::test
