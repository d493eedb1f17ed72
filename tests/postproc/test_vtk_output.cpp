// zones.vtu (the network revolved into sectors) and section.vtu (the (r, z) half-section), read
// back with VTK's own XML reader.
#include "postproc/io/vtk_writer.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>
#include <vtkCellData.h>
#include <vtkCellType.h>
#include <vtkDataArray.h>
#include <vtkIdList.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkSmartPointer.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <numbers>
#include <string>

#include "postproc/io/network_output.hpp"
#include "small_network.hpp"
#include "temp_folder.hpp"

namespace oxystrat::test {
namespace {

// vtkPoints store single-precision floats by default: coordinates (O(1) m) survive to about
// 1e-7 relative; 1e-6 m leaves margin. Cell data are double arrays in binary: exact.
constexpr double kPointTol = 1e-6;  // [m]

vtkSmartPointer<vtkUnstructuredGrid> read_vtu(const std::string& path) {
  vtkNew<vtkXMLUnstructuredGridReader> reader;
  reader->SetFileName(path.c_str());
  reader->Update();
  vtkSmartPointer<vtkUnstructuredGrid> grid = reader->GetOutput();
  return grid;
}

class VtkOutput : public testing::Test {
 protected:
  void SetUp() override {
    small_ = small_network();
    arrays_ = network_cell_arrays(small_.net);
  }
  TempFolder tmp_;
  SmallNetwork small_;
  std::vector<CellArray> arrays_;
};

TEST_F(VtkOutput, ZonesHaveOneCellPerZoneAndSector) {
  const int sectors = small_.loaded.data.output.sectors;
  ASSERT_EQ(sectors, 6);
  const auto path = (tmp_ / "zones.vtu").string();
  write_zones_vtu(path, small_.net, sectors, arrays_);
  const auto grid = read_vtu(path);
  ASSERT_EQ(grid->GetNumberOfCells(), static_cast<vtkIdType>(small_.net.size()) * sectors);
  for (const auto& a : arrays_) {
    auto* arr = grid->GetCellData()->GetArray(a.name.c_str());
    ASSERT_NE(arr, nullptr) << a.name;
    ASSERT_EQ(arr->GetNumberOfComponents(), 1) << a.name;
    for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
      EXPECT_EQ(arr->GetTuple1(c), a.values[static_cast<size_t>(c / sectors)]) << a.name << " cell " << c;
    }
  }
}

TEST_F(VtkOutput, ZoneCellsAreWedgesOnTheAxisAndHexahedraElsewhere) {
  const int sectors = 6;
  const auto path = (tmp_ / "zones.vtu").string();
  write_zones_vtu(path, small_.net, sectors, arrays_);
  const auto grid = read_vtu(path);
  const auto& net = small_.net;
  for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
    const auto k = static_cast<size_t>(c / sectors);
    EXPECT_EQ(grid->GetCellType(c), net.r0[k] == 0.0 ? VTK_WEDGE : VTK_HEXAHEDRON) << "cell " << c;
  }
}

TEST_F(VtkOutput, ZonePointsLieOnTheZoneBounds) {
  const int sectors = 6;
  const auto path = (tmp_ / "zones.vtu").string();
  write_zones_vtu(path, small_.net, sectors, arrays_);
  const auto grid = read_vtu(path);
  const auto& net = small_.net;
  for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
    const auto k = static_cast<size_t>(c / sectors);
    vtkNew<vtkIdList> ids;
    grid->GetCellPoints(c, ids);
    for (vtkIdType i = 0; i < ids->GetNumberOfIds(); ++i) {
      double p[3];
      grid->GetPoint(ids->GetId(i), p);
      const double r = std::hypot(p[0], p[1]);
      EXPECT_TRUE(std::abs(r - net.r0[k]) < kPointTol || std::abs(r - net.r1[k]) < kPointTol) << "cell " << c;
      EXPECT_GE(p[2], net.z0[k] - kPointTol);
      EXPECT_LE(p[2], net.z1[k] + kPointTol);
    }
  }
  double bounds[6];
  grid->GetBounds(bounds);
  EXPECT_NEAR(bounds[1], 0.25, kPointTol);  // x reaches the wall, R = 0.25 m
  EXPECT_NEAR(bounds[4], 0.0, kPointTol);
  EXPECT_NEAR(bounds[5], 0.75, kPointTol);  // the liquid surface
}

TEST_F(VtkOutput, SectionHasOneQuadPerZone) {
  const auto path = (tmp_ / "section.vtu").string();
  write_section_vtu(path, small_.net, arrays_);
  const auto grid = read_vtu(path);
  const auto& net = small_.net;
  ASSERT_EQ(grid->GetNumberOfCells(), static_cast<vtkIdType>(net.size()));
  for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
    const auto k = static_cast<size_t>(c);
    EXPECT_EQ(grid->GetCellType(c), VTK_QUAD);
    vtkNew<vtkIdList> ids;
    grid->GetCellPoints(c, ids);
    ASSERT_EQ(ids->GetNumberOfIds(), 4);
    const double expected[4][3] = {{net.r0[k], 0.0, net.z_floor_inner[k]},
                                   {net.r1[k], 0.0, net.z_floor_outer[k]},
                                   {net.r1[k], 0.0, net.z1[k]},
                                   {net.r0[k], 0.0, net.z1[k]}};
    for (int i = 0; i < 4; ++i) {
      double p[3];
      grid->GetPoint(ids->GetId(i), p);
      for (int d = 0; d < 3; ++d) EXPECT_NEAR(p[d], expected[i][d], kPointTol) << "cell " << c << " point " << i;
    }
  }
  for (const auto& a : arrays_) {
    auto* arr = grid->GetCellData()->GetArray(a.name.c_str());
    ASSERT_NE(arr, nullptr) << a.name;
    for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) EXPECT_EQ(arr->GetTuple1(c), a.values[static_cast<size_t>(c)]);
  }
}

TEST_F(VtkOutput, NetworkArraysAreNamedAndComplete) {
  std::vector<std::string> names;
  for (const auto& a : arrays_) {
    names.push_back(a.name);
    EXPECT_EQ(a.values.size(), static_cast<size_t>(small_.net.size())) << a.name;
  }
  EXPECT_THAT(names, testing::IsSupersetOf({"zone", "volume", "depth", "pressure", "region", "discharge", "sparger"}));
}

TEST_F(VtkOutput, VectorArraysAreCartesianInEachSector) {
  const auto n = static_cast<size_t>(small_.net.size());
  CellArray velocity{"velocity", std::vector<double>(n, 2.0), std::vector<double>(n, -0.5)};
  const int sectors = 6;
  const auto path = (tmp_ / "zones.vtu").string();
  write_zones_vtu(path, small_.net, sectors, {velocity});
  const auto grid = read_vtu(path);
  auto* arr = grid->GetCellData()->GetArray("velocity");
  ASSERT_NE(arr, nullptr);
  ASSERT_EQ(arr->GetNumberOfComponents(), 3);
  for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
    // The radial component turns with the sector's mid-angle; the axial one stays z.
    const double th = (static_cast<double>(c % sectors) + 0.5) * 2.0 * std::numbers::pi / sectors;
    double v[3];
    arr->GetTuple(c, v);
    EXPECT_NEAR(v[0], 2.0 * std::cos(th), 1e-12);  // same formula: round-off
    EXPECT_NEAR(v[1], 2.0 * std::sin(th), 1e-12);
    EXPECT_EQ(v[2], -0.5);
  }
  // In the section (angle 0) the radial component is x.
  const auto section_path = (tmp_ / "section.vtu").string();
  write_section_vtu(section_path, small_.net, {velocity});
  const auto section = read_vtu(section_path);  // keeps the grid alive while its array is used
  auto* sec = section->GetCellData()->GetArray("velocity");
  ASSERT_NE(sec, nullptr);
  double v[3];
  sec->GetTuple(0, v);
  EXPECT_EQ(v[0], 2.0);
  EXPECT_EQ(v[1], 0.0);
  EXPECT_EQ(v[2], -0.5);
}

// Regression test for a fixed bug (vtk_writer.cpp:47, write_grid): vtkXMLUnstructuredGridWriter::Write() returns 1 even when
// the file cannot be opened (VTK 9.1 only logs "Error opening output file"), so the check
// `Write() != 1` never fires and a .vtu that could not be written goes unnoticed.
// Expected: std::runtime_error "cannot write <path>".
TEST_F(VtkOutput, UnwritablePathIsAnError) {
  EXPECT_THROW(write_section_vtu("/nonexistent/folder/section.vtu", small_.net, arrays_), std::runtime_error);
}

TEST_F(VtkOutput, PvdListsEveryFileWithItsTime) {
  const auto path = tmp_ / "series.pvd";
  write_pvd(path.string(), {0.0, 30.0, 60.0}, {"t0.vtu", "t1.vtu", "t2.vtu"});
  std::ifstream in(path);
  const std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  EXPECT_NE(text.find("<VTKFile type=\"Collection\""), std::string::npos);
  EXPECT_NE(text.find("timestep=\"0\" part=\"0\" file=\"t0.vtu\""), std::string::npos);
  EXPECT_NE(text.find("timestep=\"30\" part=\"0\" file=\"t1.vtu\""), std::string::npos);
  EXPECT_NE(text.find("timestep=\"60\" part=\"0\" file=\"t2.vtu\""), std::string::npos);
  EXPECT_NE(text.find("</VTKFile>"), std::string::npos);
}

}  // namespace
}  // namespace oxystrat::test
