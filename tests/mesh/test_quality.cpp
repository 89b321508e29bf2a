// Quality measures on hand-made cells with known values.
#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/quality.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

using namespace plystrain::mesh;

namespace {

// One quad9 or quad4 from its four corners (mid nodes at edge midpoints).
Mesh single_quad(const std::array<Eigen::Vector2d, 4>& corners, CellType type) {
  Mesh mesh;
  mesh.region_names = {"film"};
  Cell cell;
  cell.type = type;
  for (int i = 0; i < 4; ++i) {
    mesh.nodes.push_back(corners[static_cast<std::size_t>(i)]);
  }
  if (type == CellType::quad9) {
    for (int i = 0; i < 4; ++i) {
      mesh.nodes.push_back(0.5 * (corners[static_cast<std::size_t>(i)] +
                                  corners[static_cast<std::size_t>((i + 1) % 4)]));
    }
    mesh.nodes.push_back(0.25 * (corners[0] + corners[1] + corners[2] + corners[3]));
  }
  for (int i = 0; i < node_count(type); ++i) {
    cell.nodes[static_cast<std::size_t>(i)] = i;
  }
  mesh.cells.push_back(cell);
  return mesh;
}

}  // namespace

TEST_CASE("scaled Jacobian and aspect ratio of simple quads", "[quality]") {
  // Scaled Jacobian det J / (|J1| |J2|) (Knupp, "Achieving finite element
  // mesh quality via optimization of the Jacobian matrix norm and associated
  // quantities", Int. J. Numer. Meth. Engng 48, 2000) (from memory):
  // 1 for a rectangle, sin(angle) for a parallelogram.
  for (const CellType type : {CellType::quad4, CellType::quad9}) {
    const Mesh rectangle = single_quad({{{0, 0}, {2, 0}, {2, 1}, {0, 1}}}, type);
    CHECK(scaled_jacobian(rectangle, rectangle.cells[0]) == Approx(1.0).epsilon(1e-14));
    CHECK(aspect_ratio(rectangle, rectangle.cells[0]) == Approx(2.0).epsilon(1e-14));
    const double angle = std::numbers::pi / 3.0;
    const Eigen::Vector2d side(std::cos(angle), std::sin(angle));
    const Mesh rhombus = single_quad({{{0, 0}, {1, 0}, Eigen::Vector2d(1, 0) + side, side}}, type);
    CHECK(scaled_jacobian(rhombus, rhombus.cells[0]) == Approx(std::sin(angle)).epsilon(1e-12));
    CHECK(aspect_ratio(rhombus, rhombus.cells[0]) == Approx(1.0).epsilon(1e-12));
  }
}

TEST_CASE("inverted cells are counted and refused", "[quality]") {
  // A non-convex ("arrowhead") quad: det J < 0 at the re-entrant corner.
  Mesh mesh = single_quad({{{0, 0}, {2, 0}, {0.5, 0.5}, {0, 2}}}, CellType::quad9);
  CHECK(scaled_jacobian(mesh, mesh.cells[0]) < 0.0);
  const MeshQuality quality = measure_quality(mesh);
  CHECK(quality.inverted_cells() == 1);
  CHECK(quality.layers[0].layer == "film");
  try {
    require_no_inverted_cells(mesh, quality);
    FAIL("an inverted cell was accepted");
  } catch (const MeshError& error) {
    CHECK(error.subject() == MeshError::Subject::layer);
    CHECK(error.index() == 0);
  }
  // Clockwise node order is inverted as well.
  const Mesh clockwise = single_quad({{{0, 0}, {0, 1}, {1, 1}, {1, 0}}}, CellType::quad4);
  CHECK(scaled_jacobian(clockwise, clockwise.cells[0]) == Approx(-1.0).epsilon(1e-14));
}

TEST_CASE("triangles: equilateral gives 1, a right isosceles corner 45 degrees", "[quality]") {
  Mesh mesh;
  mesh.region_names = {"film"};
  mesh.nodes = {{0, 0}, {1, 0}, {0.5, std::sqrt(3.0) / 2.0}};
  Cell cell;
  cell.type = CellType::tri3;
  cell.nodes[0] = 0;
  cell.nodes[1] = 1;
  cell.nodes[2] = 2;
  mesh.cells.push_back(cell);
  CHECK(scaled_jacobian(mesh, mesh.cells[0]) == Approx(1.0).epsilon(1e-12));
  mesh.nodes[2] = {0, 1};
  // The 45-degree corners: sin(45) * 2 / sqrt(3) (equilateral scaling, Knupp 2000, from memory).
  CHECK(scaled_jacobian(mesh, mesh.cells[0]) ==
        Approx(std::sin(std::numbers::pi / 4) * 2.0 / std::sqrt(3.0)).epsilon(1e-12));
}
