#include "plystrain/mesh/msh_writer.hpp"

#include "plystrain/mesh/gmsh_session.hpp"
#include "plystrain/mesh/mesh_error.hpp"

#include <system_error>

namespace plystrain::mesh {

void write_msh(const GmshSession& session, const std::filesystem::path& path) {
  // The temporary ends in .msh whatever the target's name: Gmsh picks the
  // format from the extension.
  std::filesystem::path temporary = path;
  temporary.replace_filename(path.filename().string() + ".partial.msh");
  session.write(temporary);
  std::error_code error;
  std::filesystem::rename(temporary, path, error);
  if (error) {
    std::filesystem::remove(temporary, error);
    throw MeshError("cannot write " + path.string() + ": " + error.message());
  }
}

}  // namespace plystrain::mesh
