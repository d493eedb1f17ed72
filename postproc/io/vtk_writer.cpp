#include "postproc/io/vtk_writer.hpp"
#include "postproc/io/file_output.hpp"
#include "input/errors.hpp"

#include <vtkCellData.h>
#include <vtkDoubleArray.h>
#include <vtkIdList.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridWriter.h>

#include <cmath>
#include <fstream>
#include <numbers>
#include <stdexcept>

namespace oxystrat {
namespace {

void add_arrays(vtkUnstructuredGrid* grid, const std::vector<CellArray>& arrays, const std::vector<int>& zone_of_cell,
                const std::vector<double>& angle_of_cell) {
  for (const auto& a : arrays) {
    vtkNew<vtkDoubleArray> arr;
    arr->SetName(a.name.c_str());
    const bool vector = !a.values_z.empty();
    arr->SetNumberOfComponents(vector ? 3 : 1);
    arr->SetNumberOfTuples(static_cast<vtkIdType>(zone_of_cell.size()));
    for (size_t c = 0; c < zone_of_cell.size(); ++c) {
      const auto k = static_cast<size_t>(zone_of_cell[c]);
      if (vector) {
        const double th = angle_of_cell[c];
        const double t[3] = {a.values[k] * std::cos(th), a.values[k] * std::sin(th), a.values_z[k]};
        arr->SetTuple(static_cast<vtkIdType>(c), t);
      } else {
        arr->SetValue(static_cast<vtkIdType>(c), a.values[k]);
      }
    }
    grid->GetCellData()->AddArray(arr);
  }
}

void write_grid(const std::string& path, vtkUnstructuredGrid* grid) {
  vtkNew<vtkXMLUnstructuredGridWriter> writer;
  writer->SetFileName(path.c_str());
  writer->SetInputData(grid);
  writer->SetDataModeToAppended();
  writer->SetCompressorTypeToZLib();
  // VTK 9.1 returns 1 from Write() even when the file could not be opened: check the error code.
  if (writer->Write() != 1 || writer->GetErrorCode() != 0) throw IoError("cannot write " + path);
}

}  // namespace

void write_zones_vtu(const std::string& path, const ZoneNetwork& net, int sectors, const std::vector<CellArray>& arrays) {
  vtkNew<vtkPoints> points;
  vtkNew<vtkUnstructuredGrid> grid;
  std::vector<int> zone_of_cell;
  std::vector<double> angle_of_cell;
  const double dth = 2.0 * std::numbers::pi / sectors;
  for (int k = 0; k < net.size(); ++k) {
    for (int s = 0; s < sectors; ++s) {
      const double t0 = s * dth, t1 = (s + 1) * dth;
      auto pt = [&](double r, double th, double z) { return points->InsertNextPoint(r * std::cos(th), r * std::sin(th), z); };
      const double r0 = net.r0[k], r1 = net.r1[k], zi = net.z_floor_inner[k], zo = net.z_floor_outer[k], z1 = net.z1[k];
      vtkNew<vtkIdList> ids;
      if (r0 == 0.0) {
        // Wedge: base triangle ordered so its right-hand normal points away from the top triangle.
        ids->InsertNextId(pt(0.0, 0.0, zi));
        ids->InsertNextId(pt(r1, t1, zo));
        ids->InsertNextId(pt(r1, t0, zo));
        ids->InsertNextId(pt(0.0, 0.0, z1));
        ids->InsertNextId(pt(r1, t1, z1));
        ids->InsertNextId(pt(r1, t0, z1));
        grid->InsertNextCell(VTK_WEDGE, ids);
      } else {
        // Hexahedron: base quad whose right-hand normal points towards the top quad.
        ids->InsertNextId(pt(r0, t0, zi));
        ids->InsertNextId(pt(r1, t0, zo));
        ids->InsertNextId(pt(r1, t1, zo));
        ids->InsertNextId(pt(r0, t1, zi));
        ids->InsertNextId(pt(r0, t0, z1));
        ids->InsertNextId(pt(r1, t0, z1));
        ids->InsertNextId(pt(r1, t1, z1));
        ids->InsertNextId(pt(r0, t1, z1));
        grid->InsertNextCell(VTK_HEXAHEDRON, ids);
      }
      zone_of_cell.push_back(k);
      angle_of_cell.push_back(0.5 * (t0 + t1));
    }
  }
  grid->SetPoints(points);
  add_arrays(grid, arrays, zone_of_cell, angle_of_cell);
  write_grid(path, grid);
}

void write_section_vtu(const std::string& path, const ZoneNetwork& net, const std::vector<CellArray>& arrays) {
  vtkNew<vtkPoints> points;
  vtkNew<vtkUnstructuredGrid> grid;
  std::vector<int> zone_of_cell;
  for (int k = 0; k < net.size(); ++k) {
    vtkNew<vtkIdList> ids;
    ids->InsertNextId(points->InsertNextPoint(net.r0[k], 0.0, net.z_floor_inner[k]));
    ids->InsertNextId(points->InsertNextPoint(net.r1[k], 0.0, net.z_floor_outer[k]));
    ids->InsertNextId(points->InsertNextPoint(net.r1[k], 0.0, net.z1[k]));
    ids->InsertNextId(points->InsertNextPoint(net.r0[k], 0.0, net.z1[k]));
    grid->InsertNextCell(VTK_QUAD, ids);
    zone_of_cell.push_back(k);
  }
  grid->SetPoints(points);
  add_arrays(grid, arrays, zone_of_cell, std::vector<double>(zone_of_cell.size(), 0.0));
  write_grid(path, grid);
}

void write_pvd(const std::string& path, const std::vector<double>& times_s, const std::vector<std::string>& files) {
  std::ofstream out(path);
  out << "<?xml version=\"1.0\"?>\n<VTKFile type=\"Collection\" version=\"0.1\">\n  <Collection>\n";
  for (size_t i = 0; i < files.size(); ++i) {
    out << "    <DataSet timestep=\"" << times_s[i] << "\" part=\"0\" file=\"" << files[i] << "\"/>\n";
  }
  out << "  </Collection>\n</VTKFile>\n";
  finish_file(out, path);
}

}  // namespace oxystrat
