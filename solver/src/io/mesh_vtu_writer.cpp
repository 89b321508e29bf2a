#include "plystrain/solver/mesh_vtu_writer.hpp"

#include "plystrain/solver/atomic_file.hpp"
#include "vtu_grid.hpp"

#include <vtkCellType.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkUnstructuredGrid.h>


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
  const auto grid = io::layered_cell_grid(mesh, points, [](int, int node) { return vtkIdType{node}; });
  write_file_atomically(path, io::vtu_file_text(grid, io::VtuCompression::zlib));
}

}  // namespace plystrain::solver
