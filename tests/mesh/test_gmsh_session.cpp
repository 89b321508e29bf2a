// The Gmsh session: one at a time, OpenMP thread count restored, Gmsh
// errors turned into MeshError, .msh written with layer and set names.
#include "stack_fixtures.hpp"

#include "plystrain/mesh/gmsh_session.hpp"
#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/msh_writer.hpp"
#include "plystrain/mesh/stack_mesher.hpp"

#include <omp.h>
#include <catch2/catch.hpp>

#include <array>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

using namespace plystrain::mesh;
using namespace plystrain::mesh::testing;

TEST_CASE("one Gmsh session at a time, thread count kept", "[gmsh]") {
  omp_set_num_threads(2);
  {
    GmshSession session;
    CHECK(omp_get_max_threads() == 2);
    CHECK_THROWS_AS(GmshSession(), MeshError);
    const Mesh mesh = build_stack_mesh(session, four_layer_stack(StackShape::strip));
    CHECK(mesh.cell_count() > 0);
    CHECK(omp_get_max_threads() == 2);
  }
  CHECK(omp_get_max_threads() == 2);
  CHECK_NOTHROW(GmshSession());
}

TEST_CASE("Gmsh's own errors arrive as MeshError", "[gmsh]") {
  GmshSession session;
  session.new_model("probe");
  const int a = session.add_point(0.0, 0.0);
  // A line to a point that does not exist.
  CHECK_THROWS_AS(session.add_line(a, 12345), MeshError);
}

TEST_CASE("an error inside Gmsh's parallel meshing arrives as MeshError, not an abort", "[gmsh]") {
  // A transfinite patch whose opposite sides have different node counts:
  // Gmsh raises the error while it meshes the surfaces in an OpenMP loop,
  // where a thrown error would end the process (terminate).
  GmshSession session;
  session.new_model("mismatched");
  const std::array<int, 4> corners = {session.add_point(0.0, 0.0), session.add_point(1.0, 0.0),
                                      session.add_point(1.0, 1.0), session.add_point(0.0, 1.0)};
  std::vector<int> sides;
  for (std::size_t i = 0; i < corners.size(); ++i) {
    sides.push_back(session.add_line(corners[i], corners[(i + 1) % corners.size()]));
  }
  const int surface = session.add_plane_surface(sides);
  session.set_transfinite_curve(sides[0], 5, 1.0);
  session.set_transfinite_curve(sides[1], 3, 1.0);
  session.set_transfinite_curve(sides[2], 7, 1.0);
  session.set_transfinite_curve(sides[3], 3, 1.0);
  session.set_structured_quad_patch(surface, corners);
  try {
    session.generate(2);
    FAIL("meshing a mismatched transfinite patch did not fail");
  } catch (const MeshError& error) {
    CHECK(std::string(error.what()).find("transfinite") != std::string::npos);
  }
  // The session stays usable.
  const Mesh mesh = build_stack_mesh(session, four_layer_stack(StackShape::strip));
  CHECK(mesh.cell_count() > 0);
}

TEST_CASE(".msh output names layers and edge sets", "[gmsh][msh]") {
  const std::filesystem::path path =
      std::filesystem::temp_directory_path() / "plystrain_mesh_test_stack.msh";
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.defects = {delamination(0, 0.0, 4.0, 7)};
  Mesh mesh;
  {
    GmshSession session;
    mesh = build_stack_mesh(session, stack);
    write_msh(session, path);
    // Any target name gets the .msh format.
    const std::filesystem::path plain = path.parent_path() / "plystrain_mesh_test_stack_plain";
    write_msh(session, plain);
    std::ifstream plain_file(plain);
    std::string first_line;
    std::getline(plain_file, first_line);
    CHECK(first_line == "$MeshFormat");
    std::filesystem::remove(plain);
  }
  std::ifstream file(path);
  std::stringstream text;
  text << file.rdbuf();
  const std::string content = text.str();
  CHECK(content.rfind("$MeshFormat\n4.1", 0) == 0);
  for (const std::string name :
       {"\"substrate\"", "\"cap\"", "\"bottom\"", "\"symmetry\"", "\"delamination-7-lower\"",
        "\"delamination-7-upper\"", "\"interface-electrode\""}) {
    CHECK(content.find(name) != std::string::npos);
  }
  // $Nodes header: blocks, node count, min tag, max tag.
  const std::size_t nodes = content.find("$Nodes\n");
  REQUIRE(nodes != std::string::npos);
  std::istringstream header(content.substr(nodes + 7, 100));
  long blocks = 0;
  long count = 0;
  header >> blocks >> count;
  CHECK(count == mesh.node_count());
  std::filesystem::remove(path);
}
