#include "vtu_grid.hpp"

#include "plystrain/solver/mesh_vtu_writer.hpp"

#include <vtkCellData.h>
#include <vtkIntArray.h>
#include <vtkNew.h>
#include <vtkXMLUnstructuredGridWriter.h>

#include <array>
#include <stdexcept>

namespace plystrain::io {

vtkSmartPointer<vtkUnstructuredGrid> layered_cell_grid(
    const mesh::Mesh& mesh, vtkPoints* points, const std::function<vtkIdType(int cell, int node)>& point_of) {
  auto grid = vtkSmartPointer<vtkUnstructuredGrid>::New();
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
      ids[static_cast<std::size_t>(i)] = point_of(c, cell.nodes[static_cast<std::size_t>(i)]);
    }
    grid->InsertNextCell(solver::vtk_cell_type(cell.type), cell.size(), ids.data());
    layer->SetValue(c, cell.region);
  }
  grid->GetCellData()->AddArray(layer);
  return grid;
}

std::string vtu_file_text(vtkUnstructuredGrid* grid, VtuCompression compression) {
  vtkNew<vtkXMLUnstructuredGridWriter> writer;
  writer->WriteToOutputStringOn();
  writer->SetInputData(grid);
  // The default appended raw data is not well-formed XML (toolchain notes).
  writer->SetDataModeToBinary();
  if (compression == VtuCompression::lz4) {
    writer->SetCompressorTypeToLZ4();
  } else {
    writer->SetCompressorTypeToZLib();
  }
  if (writer->Write() != 1) {
    throw std::runtime_error("VTK could not format the grid as .vtu");
  }
  return writer->GetOutputString();
}

}  // namespace plystrain::io
