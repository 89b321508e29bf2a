#include "plystrain/solver/mesh_vtu_writer.hpp"

#include <vtkCellType.h>
#include <vtkIntArray.h>
#include <vtkCellData.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridWriter.h>

#include <array>
#include <stdexcept>
#include <system_error>

namespace plystrain::solver {

int vtk_cell_type(mesh::CellType type) {
  // Gmsh's node orders of these types equal VTK's (toolchain notes), so
  // nodes are passed through unchanged.
  switch (type) {
    case mesh::CellType::tri3: return VTK_TRIANGLE;
    case mesh::CellType::tri6: return VTK_QUADRATIC_TRIANGLE;
    case mesh::CellType::quad4: return VTK_QUAD;
    case mesh::CellType::quad8: return VTK_QUADRATIC_QUAD;
    case mesh::CellType::quad9: return VTK_BIQUADRATIC_QUAD;
  }
  return VTK_EMPTY_CELL;
}

void write_mesh_vtu(const mesh::Mesh& mesh, const std::filesystem::path& path) {
  vtkNew<vtkPoints> points;
  points->SetDataTypeToDouble();
  points->SetNumberOfPoints(mesh.node_count());
  for (int n = 0; n < mesh.node_count(); ++n) {
    const Eigen::Vector2d& x = mesh.nodes[static_cast<std::size_t>(n)];
    points->SetPoint(n, x.x(), x.y(), 0.0);
  }
  vtkNew<vtkUnstructuredGrid> grid;
  grid->SetPoints(points);
  grid->Allocate(mesh.cell_count());
  vtkNew<vtkIntArray> layer;
  layer->SetName("layer");
  layer->SetNumberOfComponents(1);
  layer->SetNumberOfTuples(mesh.cell_count());
  std::array<vtkIdType, mesh::max_nodes_per_cell> ids{};
  for (int c = 0; c < mesh.cell_count(); ++c) {
    const mesh::Cell& cell = mesh.cells[static_cast<std::size_t>(c)];
    for (int i = 0; i < cell.size(); ++i) {
      ids[static_cast<std::size_t>(i)] = cell.nodes[static_cast<std::size_t>(i)];
    }
    grid->InsertNextCell(vtk_cell_type(cell.type), cell.size(), ids.data());
    layer->SetValue(c, cell.region);
  }
  grid->GetCellData()->AddArray(layer);

  const std::filesystem::path temporary = path.string() + ".partial";
  vtkNew<vtkXMLUnstructuredGridWriter> writer;
  writer->SetFileName(temporary.string().c_str());
  writer->SetInputData(grid);
  // The default appended raw data is not well-formed XML.
  writer->SetDataModeToBinary();
  if (writer->Write() != 1) {
    std::error_code ignored;
    std::filesystem::remove(temporary, ignored);
    throw std::runtime_error("cannot write " + path.string());
  }
  std::error_code error;
  std::filesystem::rename(temporary, path, error);
  if (error) {
    throw std::runtime_error("cannot write " + path.string() + ": " + error.message());
  }
}

}  // namespace plystrain::solver
