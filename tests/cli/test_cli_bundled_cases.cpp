// Every bundled case in cases/ is checked and run by the real executable, so the demos never rot.
// The list comes from a directory listing when the tests are discovered (at ctest start), so a
// new case file is covered without touching this file.
#include "input/case_reader.hpp"  // project headers first: see tests/case/unit_check.hpp
#include "mesh/zone_network.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <cctype>
#include <regex>
#include <string>
#include <vector>

#include "cli_runner.hpp"
#include "h5_read.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

std::vector<fs::path> bundled_cases() {
  std::vector<fs::path> cases;
  for (const auto& e : fs::directory_iterator(kSourceDir / "cases")) {
    if (e.is_regular_file() && e.path().extension() == ".toml") cases.push_back(e.path());
  }
  std::sort(cases.begin(), cases.end());
  return cases;
}

std::string case_test_name(const testing::TestParamInfo<fs::path>& info) {
  std::string name = info.param.stem().string();
  for (char& c : name) {
    if (!std::isalnum(static_cast<unsigned char>(c))) c = '_';
  }
  return name;
}

//! The integer after `attribute="` in the first <Piece> of a .vtu file's XML header.
long piece_attribute(const std::string& vtu, const std::string& attribute) {
  const std::regex re("<Piece[^>]*" + attribute + "=\"([0-9]+)\"");
  std::smatch m;
  if (!std::regex_search(vtu, m, re)) return -1;
  return std::stol(m[1]);
}

class BundledCase : public CliTest, public testing::WithParamInterface<fs::path> {};

TEST(BundledCases, ThereAreSome) { EXPECT_GE(bundled_cases().size(), 1u); }

TEST_P(BundledCase, ChecksAndWritesNothing) {
  const auto r = oxystrat({"check", GetParam().string()});
  EXPECT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("Case is valid."));
  EXPECT_THAT(r.err, testing::Not(HasSubstr("error")));
  EXPECT_TRUE(work_listing().empty());
}

TEST_P(BundledCase, RunsAndWritesTheResultFiles) {
  const auto r = oxystrat({"run", GetParam().string(), "--out", "result"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("Wrote result/result.h5"));
  for (const char* name : {"result.h5", "zones.vtu", "section.vtu"}) {
    EXPECT_TRUE(fs::is_regular_file(work() / "result" / name)) << name;
    EXPECT_GT(fs::file_size(work() / "result" / name), 0u) << name;
  }
  EXPECT_EQ(work_listing(), std::vector<std::string>{"result"});  // no staging folder left
  // HDF5 files start with the format signature \x89HDF\r\n\x1a\n (HDF5 file format spec., sec. II.A).
  EXPECT_EQ(read_file(work() / "result" / "result.h5").substr(0, 8), std::string("\x89HDF\r\n\x1a\n", 8));
}

TEST_P(BundledCase, EveryDatasetOfTheResultHasUnits) {
  const auto r = oxystrat({"run", GetParam().string(), "--out", "result"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto f = open_h5((work() / "result" / "result.h5").string());
  const auto walk = walk_datasets(f);
  EXPECT_THAT(walk.all, testing::IsSupersetOf({"case/text", "zones/volume", "zones/pressure", "faces/area"}));
  EXPECT_THAT(walk.without_units, testing::IsEmpty());
}

TEST_P(BundledCase, VtkFilesHoldEveryZone) {
  const auto r = oxystrat({"run", GetParam().string(), "--out", "result"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  // What the files must hold, from the same case read by the library.
  const auto loaded = read_case_file(GetParam().string());
  const long zones = build_zone_geometry(loaded.data).size();
  const int sectors = loaded.data.output.sectors;
  EXPECT_EQ(piece_attribute(read_file(work() / "result" / "zones.vtu"), "NumberOfCells"), zones * sectors);
  EXPECT_EQ(piece_attribute(read_file(work() / "result" / "section.vtu"), "NumberOfCells"), zones);
}

INSTANTIATE_TEST_SUITE_P(Cases, BundledCase, testing::ValuesIn(bundled_cases()), case_test_name);

TEST_F(CliTest, ASmallHoldupIsPrintedWithItsDigits) {
  // The cell-culture demo at 0.001 vvm holds ~0.015 % gas; one decimal printed it as "0.0 %".
  const auto r = oxystrat({"run", (kSourceDir / "cases/cell-culture-2m3.toml").string(), "--set",
                           "operation.gas_flow=0.001 vvm", "--no-levers", "--out", "result"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, testing::ContainsRegex("holdup 0\\.01[0-9]+ % mean"));
}

}  // namespace
}  // namespace oxystrat::test
