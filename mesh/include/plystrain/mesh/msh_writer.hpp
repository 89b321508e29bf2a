// Writes the model and mesh held by a Gmsh session as a Gmsh .msh file
// (format 4.1), with one physical surface per layer and one physical curve
// per edge set, named as in the Mesh. The file is written to a temporary
// name beside the target and renamed, so a reader never sees half a file.
#pragma once

#include <filesystem>

namespace plystrain::mesh {

class GmshSession;

void write_msh(const GmshSession& session, const std::filesystem::path& path);

}  // namespace plystrain::mesh
