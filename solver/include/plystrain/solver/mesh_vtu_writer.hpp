// Writes a Mesh as a VTK unstructured grid (.vtu) for inspection in
// ParaView: points (x, z, 0) or (r, z, 0), cells of the matching VTK linear
// or quadratic types, and the cell array `layer` (region index, bottom
// layer 0). The file is written under a temporary name and renamed.
#pragma once

#include "plystrain/mesh/mesh.hpp"

#include <filesystem>

namespace plystrain::solver {

// VTK cell type number of a mesh cell type (5, 22, 9, 23, 28).
[[nodiscard]] int vtk_cell_type(mesh::CellType type);

// Throws std::runtime_error if the file cannot be written.
void write_mesh_vtu(const mesh::Mesh& mesh, const std::filesystem::path& path);

}  // namespace plystrain::solver
