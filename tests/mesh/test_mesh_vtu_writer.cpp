// The .vtu of a mesh reads back with VTK's own reader: cell types, points
// and the `layer` array.
#include "stack_fixtures.hpp"

#include "plystrain/mesh/stack_mesher.hpp"
#include "plystrain/solver/mesh_vtu_writer.hpp"

#include <catch2/catch.hpp>

#include <vtkCellData.h>
#include <vtkCellType.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>

#include <filesystem>

using namespace plystrain::mesh;
using namespace plystrain::mesh::testing;

namespace {

void round_trip(const Mesh& mesh, int expected_vtk_type) {
  const std::filesystem::path path =
      std::filesystem::temp_directory_path() / "plystrain_mesh_test_stack.vtu";
  plystrain::solver::write_mesh_vtu(mesh, path);
  CHECK_FALSE(std::filesystem::exists(path.string() + ".partial"));
  vtkNew<vtkXMLUnstructuredGridReader> reader;
  reader->SetFileName(path.string().c_str());
  reader->Update();
  vtkUnstructuredGrid* grid = reader->GetOutput();
  REQUIRE(grid != nullptr);
  REQUIRE(grid->GetNumberOfPoints() == mesh.node_count());
  REQUIRE(grid->GetNumberOfCells() == mesh.cell_count());
  vtkDataArray* layer = grid->GetCellData()->GetArray("layer");
  REQUIRE(layer != nullptr);
  for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
    REQUIRE(grid->GetCellType(c) == expected_vtk_type);
    REQUIRE(layer->GetTuple1(c) == mesh.cells[static_cast<std::size_t>(c)].region);
  }
  for (vtkIdType n = 0; n < grid->GetNumberOfPoints(); n += 97) {
    double p[3];
    grid->GetPoint(n, p);
    CHECK(p[0] == mesh.nodes[static_cast<std::size_t>(n)].x());
    CHECK(p[1] == mesh.nodes[static_cast<std::size_t>(n)].y());
    CHECK(p[2] == 0.0);
  }
  std::filesystem::remove(path);
}

}  // namespace

TEST_CASE(".vtu round trip of quadratic and linear stack meshes", "[vtu]") {
  StackDescription stack = four_layer_stack(StackShape::disk);
  stack.defects = {pinhole(2, 0.0, 2.0, CavityFill::above)};
  round_trip(build_stack_mesh(stack), VTK_BIQUADRATIC_QUAD);
  stack.order = 1;
  round_trip(build_stack_mesh(stack), VTK_QUAD);
  CHECK(plystrain::solver::vtk_cell_type(CellType::tri6) == VTK_QUADRATIC_TRIANGLE);
  CHECK(plystrain::solver::vtk_cell_type(CellType::quad8) == VTK_QUADRATIC_QUAD);
}
