// result.h5 contents: the case and the zone network, read back and compared with what was written;
// every dataset in the file carries a "units" attribute.
#include "postproc/io/network_output.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "h5_read.hpp"
#include "small_network.hpp"
#include "temp_folder.hpp"

namespace oxystrat::test {
namespace {

class H5Network : public testing::Test {
 protected:
  void SetUp() override {
    small_ = small_network({parse_override("grid.axial=10")});
    path_ = (tmp_ / "result.h5").string();
    H5Writer h5(path_);
    write_case_h5(h5, small_.loaded);
    write_network_h5(h5, small_.net);
    h5.close();
  }
  TempFolder tmp_;
  SmallNetwork small_;
  std::string path_;
};

TEST_F(H5Network, EveryDatasetHasUnits) {
  const auto f = open_h5(path_);
  const auto walk = walk_datasets(f);
  // The layout is a contract for users' scripts (ARCHITECTURE.md): these datasets must be there
  // (later stages may add more).
  const std::vector<std::string> expected{
      "case/notes",         "case/overrides",      "case/source_text", "case/text",       "faces/area",
      "faces/orientation",  "faces/spacing",       "faces/zone_a",     "faces/zone_b",    "grid/r_lines",
      "grid/z_lines",       "zones/column",        "zones/depth",      "zones/discharge", "zones/pressure",
      "zones/r",            "zones/r_inner",       "zones/r_outer",    "zones/region",    "zones/row",
      "zones/sparger",      "zones/sparger_share", "zones/volume",     "zones/z",         "zones/z_bottom",
      "zones/z_top"};
  EXPECT_THAT(walk.all, testing::IsSupersetOf(expected));
  EXPECT_TRUE(walk.without_units.empty()) << "first without units: " << walk.without_units.front();
}

TEST_F(H5Network, CaseTextAndAttributes) {
  const auto f = open_h5(path_);
  EXPECT_EQ(read_string(f, "/case/text"), small_.loaded.effective_text);
  EXPECT_EQ(read_string(f, "/case/source_text"), small_.loaded.source_text);
  EXPECT_EQ(read_strings(f, "/case/overrides"), std::vector<std::string>{"grid.axial=10"});
  EXPECT_EQ(read_strings(f, "/case/notes"), small_.loaded.notes);
  EXPECT_EQ(read_attribute(f, "/case/text", "file"), small_.loaded.file_name);
  EXPECT_EQ(read_attribute(f, "/case/text", "title"), "small test vessel (invented)");
}

TEST_F(H5Network, ZoneArraysAreThoseOfTheNetwork) {
  const auto f = open_h5(path_);
  const auto& net = small_.net;
  // Doubles are stored in binary: read back bit for bit.
  EXPECT_EQ(read_doubles(f, "/zones/volume"), net.volume);
  EXPECT_EQ(read_doubles(f, "/zones/r"), net.r);
  EXPECT_EQ(read_doubles(f, "/zones/z"), net.z);
  EXPECT_EQ(read_doubles(f, "/zones/r_inner"), net.r0);
  EXPECT_EQ(read_doubles(f, "/zones/r_outer"), net.r1);
  EXPECT_EQ(read_doubles(f, "/zones/z_bottom"), net.z0);
  EXPECT_EQ(read_doubles(f, "/zones/z_top"), net.z1);
  EXPECT_EQ(read_doubles(f, "/zones/depth"), net.depth);
  EXPECT_EQ(read_doubles(f, "/zones/pressure"), net.pressure);
  EXPECT_EQ(read_doubles(f, "/zones/sparger_share"), net.sparger_share);
  EXPECT_EQ(read_ints(f, "/zones/column"), net.column);
  EXPECT_EQ(read_ints(f, "/zones/row"), net.row);
  EXPECT_EQ(read_doubles(f, "/grid/r_lines"), net.r_lines);
  EXPECT_EQ(read_doubles(f, "/grid/z_lines"), net.z_lines);
  const auto region = read_ints(f, "/zones/region");
  const auto discharge = read_ints(f, "/zones/discharge");
  const auto sparger = read_ints(f, "/zones/sparger");
  ASSERT_EQ(region.size(), static_cast<size_t>(net.size()));
  for (int k = 0; k < net.size(); ++k) {
    EXPECT_EQ(region[k], net.region[k].domain);
    EXPECT_EQ(discharge[k], net.region[k].discharge);
    EXPECT_EQ(sparger[k], net.region[k].sparger ? 1 : 0);
  }
}

TEST_F(H5Network, FaceArraysAreThoseOfTheNetwork) {
  const auto f = open_h5(path_);
  const auto& faces = small_.net.faces;
  const auto a = read_ints(f, "/faces/zone_a");
  const auto b = read_ints(f, "/faces/zone_b");
  const auto area = read_doubles(f, "/faces/area");
  const auto orientation = read_ints(f, "/faces/orientation");
  const auto spacing = read_doubles(f, "/faces/spacing");
  ASSERT_EQ(a.size(), faces.size());
  ASSERT_FALSE(faces.empty());
  for (size_t i = 0; i < faces.size(); ++i) {
    EXPECT_EQ(a[i], faces[i].zone_a);
    EXPECT_EQ(b[i], faces[i].zone_b);
    EXPECT_EQ(area[i], faces[i].area);
    EXPECT_EQ(orientation[i], faces[i].orientation == FaceOrientation::radial ? 0 : 1);
    EXPECT_EQ(spacing[i], faces[i].spacing);
  }
}

TEST_F(H5Network, UnitsAreTheDocumentedOnes) {
  const auto f = open_h5(path_);
  EXPECT_EQ(read_attribute(f, "/zones/volume", "units"), "m3");
  EXPECT_EQ(read_attribute(f, "/zones/pressure", "units"), "Pa");
  EXPECT_EQ(read_attribute(f, "/zones/depth", "units"), "m");
  EXPECT_EQ(read_attribute(f, "/faces/area", "units"), "m2");
  EXPECT_EQ(read_attribute(f, "/zones/region", "units"), "1");
  EXPECT_FALSE(read_attribute(f, "/zones/discharge", "meaning").empty());
  EXPECT_FALSE(read_attribute(f, "/faces/orientation", "meaning").empty());
}

}  // namespace
}  // namespace oxystrat::test
