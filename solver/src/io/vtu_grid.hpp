// The VTK side shared by the mesh and field writers (the only VTK users):
// a mesh's cells as an unstructured grid with its `layer` array, and the
// finished .vtu file as text.
#pragma once

#include "plystrain/mesh/mesh.hpp"

#include <vtkSmartPointer.h>
#include <vtkType.h>
#include <vtkUnstructuredGrid.h>

#include <functional>
#include <string>

namespace plystrain::io {

// The cells of `mesh` over `points`, each cell's corner i being the point
// point_of(cell, node) of its node, with the cell array `layer` (the cell's
// region, bottom layer 0).
[[nodiscard]] vtkSmartPointer<vtkUnstructuredGrid> layered_cell_grid(
    const mesh::Mesh& mesh, vtkPoints* points, const std::function<vtkIdType(int cell, int node)>& point_of);

enum class VtuCompression { zlib, lz4 };

// The whole .vtu file (binary inline data, well-formed XML). VTK writes it
// into memory and the caller writes the text: VTK 9.1's XML writer frees an
// invalid pointer when the disk fills up under it (measured: a segmentation
// fault under a file-size limit), and a write of our own reports the error.
[[nodiscard]] std::string vtu_file_text(vtkUnstructuredGrid* grid, VtuCompression compression);

}  // namespace plystrain::io
