#include "plystrain/mesh/msh_writer.hpp"

#include "plystrain/mesh/gmsh_session.hpp"
#include "plystrain/mesh/mesh_error.hpp"

#include <algorithm>
#include <fstream>
#include <string>
#include <system_error>

namespace plystrain::mesh {

namespace {

bool ends_with_section_end(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary | std::ios::ate);
  if (!in) {
    return false;
  }
  const std::streamoff size = in.tellg();
  const std::streamoff tail = std::min<std::streamoff>(size, 80);
  std::string end(static_cast<std::size_t>(tail), '\0');
  in.seekg(size - tail);
  in.read(end.data(), tail);
  while (!end.empty() && (end.back() == '\n' || end.back() == '\r')) {
    end.pop_back();
  }
  const std::size_t line_start = end.find_last_of('\n');
  const std::string last_line = end.substr(line_start == std::string::npos ? 0 : line_start + 1);
  return in && last_line.rfind("$End", 0) == 0;
}

}  // namespace

void write_msh(const GmshSession& session, const std::filesystem::path& path) {
  // The temporary ends in .msh whatever the target's name: Gmsh picks the
  // format from the extension.
  std::filesystem::path temporary = path;
  temporary.replace_filename(path.filename().string() + ".partial.msh");
  session.write(temporary);
  // Gmsh does not report a failed write (a full disk, a file-size limit):
  // it leaves a file cut short. A complete file ends with a section's end.
  if (!ends_with_section_end(temporary)) {
    std::error_code ignored;
    std::filesystem::remove(temporary, ignored);
    throw MeshError("Gmsh stopped before the end of the file (disk full or a file-size limit?)");
  }
  std::error_code error;
  std::filesystem::rename(temporary, path, error);
  if (error) {
    std::filesystem::remove(temporary, error);
    throw MeshError("cannot write " + path.string() + ": " + error.message());
  }
}

}  // namespace plystrain::mesh
