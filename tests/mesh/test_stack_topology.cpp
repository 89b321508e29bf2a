// Structure of stack meshes: elements through every layer, edge sets and
// their orientation, the separate faces of delaminations, grading,
// reproducibility.
#include "stack_fixtures.hpp"

#include "plystrain/mesh/quality.hpp"
#include "plystrain/mesh/stack_mesher.hpp"

#include <catch2/catch.hpp>

#include <set>

using namespace plystrain::mesh;
using namespace plystrain::mesh::testing;

namespace {

double edge_length(const Mesh& mesh, const Edge& edge) {
  return (mesh.nodes[static_cast<std::size_t>(edge.nodes[1])] -
          mesh.nodes[static_cast<std::size_t>(edge.nodes[0])])
      .norm();
}

double set_length(const Mesh& mesh, const std::string& name) {
  double total = 0.0;
  for (const Edge& edge : mesh.edge_sets.at(name)) {
    total += edge_length(mesh, edge);
  }
  return total;
}

Eigen::Vector2d centroid(const Mesh& mesh, const Cell& cell) {
  Eigen::Vector2d sum = Eigen::Vector2d::Zero();
  for (int i = 0; i < corner_count(cell.type); ++i) {
    sum += mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])];
  }
  return sum / corner_count(cell.type);
}

// Every edge of every set: its cell lies to the left (the normal
// (dz, -dx) points away from the cell) and its nodes are that cell's.
void require_oriented_sets(const Mesh& mesh) {
  for (const auto& [name, edges] : mesh.edge_sets) {
    INFO("edge set " << name);
    for (const Edge& edge : edges) {
      REQUIRE(edge.cell >= 0);
      const Cell& cell = mesh.cells[static_cast<std::size_t>(edge.cell)];
      const Eigen::Vector2d a = mesh.nodes[static_cast<std::size_t>(edge.nodes[0])];
      const Eigen::Vector2d b = mesh.nodes[static_cast<std::size_t>(edge.nodes[1])];
      const Eigen::Vector2d normal((b - a).y(), -(b - a).x());
      CHECK(normal.dot(0.5 * (a + b) - centroid(mesh, cell)) > 0.0);
      CHECK(edge.node_count == (polynomial_order(cell.type) == 2 ? 3 : 2));
      if (edge.node_count == 3) {
        const Eigen::Vector2d m = mesh.nodes[static_cast<std::size_t>(edge.nodes[2])];
        CHECK((m - 0.5 * (a + b)).norm() < 1e-12 * (1.0 + a.norm()));
      }
    }
  }
}

constexpr double H = 10.0 + 0.2 + 0.1 + 2.0;

}  // namespace

TEST_CASE("elements through every layer, beside and through defects", "[stack][through]") {
  StackDescription stack = four_layer_stack(StackShape::strip, false);
  stack.layers[1].elements_through = 4;
  stack.layers[2].elements_through = 2;
  stack.defects = {pinhole(2, -8.0, 2.0, CavityFill::above, 1),
                   thin_spot(1, 0.0, 3.0, 0.5, 0.0, CavityFill::above, 2),
                   thin_spot(3, 9.0, 3.0, 0.5, 1.0, CavityFill::empty, 3),
                   pinhole(1, 14.0, 1.0, CavityFill::empty, 4)};
  const Mesh mesh = build_stack_mesh(stack);
  const std::vector<double> lines{-19.37, -8.0123, -7.1234, -6.8, 0.0123, 1.4321, 1.6123, 8.1234,
                                  9.0123, 10.377, 13.8123, 14.6123, 19.9};
  for (const double x : lines) {
    INFO("x = " << x);
    CHECK(cells_across(mesh, 0, x) >= 3);
    const bool in_electrode_hole = x > 13.5 && x < 14.5;
    CHECK(cells_across(mesh, 1, x) >= (in_electrode_hole ? 0 : 4));
    CHECK((in_electrode_hole || cells_across(mesh, 1, x) > 0));
    const bool in_active_hole = x > -9.0 && x < -7.0;
    if (in_active_hole) {
      CHECK(cells_across(mesh, 2, x) == 0);
      // The cap fills the hole with the active layer's elements and its own.
      CHECK(cells_across(mesh, 3, x) >= 2 + 3);
    } else {
      CHECK(cells_across(mesh, 2, x) >= 2);
      CHECK(cells_across(mesh, 3, x) >= 3);
    }
  }
  // Inside the stepped spot the thinned electrode keeps its 4 and the
  // active layer, filling the step, gets more than its 2.
  CHECK(cells_across(mesh, 1, 0.0123) >= 4);
  CHECK(cells_across(mesh, 2, 0.0123) > 2);
}

TEST_CASE("edge sets of a symmetric strip cover the boundary, oriented", "[stack][sets]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.defects = {thin_spot(1, 0.0, 3.0, 0.5, 0.5, CavityFill::above)};
  const Mesh mesh = build_stack_mesh(stack);
  CHECK(check_consistency(mesh).empty());
  CHECK(set_length(mesh, "bottom") == Approx(20.0).epsilon(1e-12));
  CHECK(set_length(mesh, "top") == Approx(20.0).epsilon(1e-12));
  CHECK(set_length(mesh, "symmetry") == Approx(H).epsilon(1e-12));
  CHECK(set_length(mesh, "outer") == Approx(H).epsilon(1e-12));
  CHECK(set_length(mesh, "interface-substrate") == Approx(20.0).epsilon(1e-12));
  // The electrode's top face dips into the spot: its length is the flat
  // part plus the two slopes of the (half) trapezoid.
  const double depth = 0.5 * 0.2;
  const double slope = std::hypot(0.5, depth);
  CHECK(set_length(mesh, "interface-electrode") == Approx(20.0 - 0.5 + slope).epsilon(1e-12));
  CHECK(set_length(mesh, "interface-active") == Approx(20.0).epsilon(1e-12));
  CHECK_FALSE(mesh.edge_sets.contains("outer-left"));
  CHECK_FALSE(mesh.edge_sets.contains("axis"));
  require_oriented_sets(mesh);
  for (const Edge& edge : mesh.edge_sets.at("bottom")) {
    CHECK(mesh.nodes[static_cast<std::size_t>(edge.nodes[0])].y() == 0.0);
    CHECK(mesh.cells[static_cast<std::size_t>(edge.cell)].region == 0);
  }
  for (const Edge& edge : mesh.edge_sets.at("interface-electrode")) {
    CHECK(mesh.cells[static_cast<std::size_t>(edge.cell)].region == 1);
  }
  for (const auto& [name, nodes] : mesh.node_sets) {
    CHECK(nodes == nodes_of_edge_set(mesh, name));
    CHECK_FALSE(nodes.empty());
  }
}

TEST_CASE("edge sets of full strips and disks", "[stack][sets]") {
  SECTION("full strip: outer-left and outer") {
    const Mesh mesh = build_stack_mesh(four_layer_stack(StackShape::strip, false));
    CHECK(set_length(mesh, "outer-left") == Approx(H).epsilon(1e-12));
    CHECK(set_length(mesh, "outer") == Approx(H).epsilon(1e-12));
    CHECK(set_length(mesh, "bottom") == Approx(40.0).epsilon(1e-12));
    CHECK_FALSE(mesh.edge_sets.contains("symmetry"));
    require_oriented_sets(mesh);
  }
  SECTION("disk: axis at r = 0 and no node with r < 0") {
    StackDescription stack = four_layer_stack(StackShape::disk);
    stack.defects = {pinhole(2, 0.0, 2.0, CavityFill::above), pinhole(1, 7.0, 2.0, CavityFill::empty, 2)};
    const Mesh mesh = build_stack_mesh(stack);
    CHECK(set_length(mesh, "axis") == Approx(H).epsilon(1e-12));
    for (const int n : mesh.node_sets.at("axis")) {
      CHECK(mesh.nodes[static_cast<std::size_t>(n)].x() == 0.0);
    }
    for (const Eigen::Vector2d& x : mesh.nodes) {
      REQUIRE(x.x() >= 0.0);
    }
    require_oriented_sets(mesh);
    // The cavity under the void ring is no interface.
    CHECK(set_length(mesh, "interface-substrate") == Approx(20.0 - 2.0).epsilon(1e-12));
  }
}

namespace {

// Checks that the nodes duplicated by the mesh are exactly those of the open
// span (a, b) of a delamination at height z (minus the tips at a and b that
// lie strictly inside the model), and that the two edge sets face each other.
void require_open_span(const Mesh& mesh, const std::string& pair, double z, double a, double b,
                       bool tip_at_a, bool tip_at_b) {
  REQUIRE(mesh.contact_pairs.size() == 1);
  CHECK(mesh.contact_pairs[0].name == pair);
  CHECK(mesh.contact_pairs[0].lower_edge_set == pair + "-lower");
  CHECK(mesh.contact_pairs[0].upper_edge_set == pair + "-upper");
  const std::vector<int>& lower = mesh.node_sets.at(pair + "-lower");
  const std::vector<int>& upper = mesh.node_sets.at(pair + "-upper");
  REQUIRE(lower.size() == upper.size());
  const double tolerance = 1e-9;
  const auto pairs = coincident_nodes(mesh, tolerance);
  REQUIRE_FALSE(pairs.empty());
  std::set<int> twins;
  for (const auto& [p, q] : pairs) {
    const Eigen::Vector2d& x = mesh.nodes[static_cast<std::size_t>(p)];
    INFO("twin nodes at (" << x.x() << ", " << x.y() << ")");
    CHECK(std::abs(x.y() - z) < tolerance);
    CHECK(x.x() > a - tolerance);
    CHECK(x.x() < b + tolerance);
    if (tip_at_a) CHECK(x.x() > a + tolerance);
    if (tip_at_b) CHECK(x.x() < b - tolerance);
    twins.insert(p);
    twins.insert(q);
  }
  // Every node of either face is a twin, except the shared tips.
  std::set<int> lower_set(lower.begin(), lower.end());
  std::set<int> upper_set(upper.begin(), upper.end());
  int shared = 0;
  for (const int n : lower) {
    if (upper_set.contains(n)) {
      ++shared;
      const double x = mesh.nodes[static_cast<std::size_t>(n)].x();
      CHECK(((tip_at_a && std::abs(x - a) < tolerance) || (tip_at_b && std::abs(x - b) < tolerance)));
    } else {
      CHECK(twins.contains(n));
    }
  }
  CHECK(shared == int(tip_at_a) + int(tip_at_b));
  CHECK(twins.size() == 2 * (lower.size() - static_cast<std::size_t>(shared)));
  // Material on the left: the lower face (material below) runs towards -x,
  // the upper face towards +x.
  for (const Edge& edge : mesh.edge_sets.at(pair + "-lower")) {
    CHECK(mesh.nodes[static_cast<std::size_t>(edge.nodes[0])].x() >
          mesh.nodes[static_cast<std::size_t>(edge.nodes[1])].x());
  }
  for (const Edge& edge : mesh.edge_sets.at(pair + "-upper")) {
    CHECK(mesh.nodes[static_cast<std::size_t>(edge.nodes[0])].x() <
          mesh.nodes[static_cast<std::size_t>(edge.nodes[1])].x());
  }
}

}  // namespace

TEST_CASE("delamination: separate nodes exactly along the open span", "[stack][delamination]") {
  SECTION("centred on the symmetry plane: open at x = 0, tip at 4") {
    StackDescription stack = four_layer_stack(StackShape::strip);
    stack.defects = {delamination(0, 0.0, 8.0, 3)};
    const Mesh mesh = build_stack_mesh(stack);
    require_open_span(mesh, "delamination-3", 10.0, 0.0, 4.0, false, true);
    require_oriented_sets(mesh);
    CHECK(set_length(mesh, "delamination-3-lower") == Approx(4.0).epsilon(1e-12));
    CHECK(set_length(mesh, "interface-substrate") == Approx(16.0).epsilon(1e-12));
  }
  SECTION("off-centre on a full strip: two tips, linear cells") {
    StackDescription stack = four_layer_stack(StackShape::strip, false);
    stack.order = 1;
    stack.defects = {delamination(1, 5.0, 4.0, 1)};
    const Mesh mesh = build_stack_mesh(stack);
    require_open_span(mesh, "delamination-1", 10.2, 3.0, 7.0, true, true);
    require_oriented_sets(mesh);
  }
  SECTION("ring on a disk") {
    StackDescription stack = four_layer_stack(StackShape::disk);
    stack.defects = {delamination(2, 8.0, 3.0, 2)};
    require_open_span(build_stack_mesh(stack), "delamination-2", 10.3, 6.5, 9.5, true, true);
  }
  SECTION("reaching the outer edge: open there") {
    StackDescription stack = four_layer_stack(StackShape::strip);
    stack.defects = {delamination(0, 17.0, 6.0, 1)};
    require_open_span(build_stack_mesh(stack), "delamination-1", 10.0, 14.0, 20.0, true, false);
  }
  SECTION("under a thin spot in the layer above") {
    StackDescription stack = four_layer_stack(StackShape::strip);
    stack.defects = {delamination(0, 0.0, 6.0, 1),
                     thin_spot(1, 0.0, 3.0, 0.5, 0.5, CavityFill::above, 2)};
    require_open_span(build_stack_mesh(stack), "delamination-1", 10.0, 0.0, 3.0, false, true);
  }
  SECTION("with a filled pinhole in the layer above inside it") {
    StackDescription stack = four_layer_stack(StackShape::strip);
    stack.defects = {delamination(1, 0.0, 6.0, 1), pinhole(2, 0.0, 1.0, CavityFill::above, 2)};
    const Mesh mesh = build_stack_mesh(stack);
    require_open_span(mesh, "delamination-1", 10.2, 0.0, 3.0, false, true);
    // Inside the pinhole the cap lies on the open face.
    bool cap_on_face = false;
    for (const Edge& edge : mesh.edge_sets.at("delamination-1-upper")) {
      cap_on_face = cap_on_face || mesh.cells[static_cast<std::size_t>(edge.cell)].region == 3;
    }
    CHECK(cap_on_face);
  }
}

TEST_CASE("in-plane grading from size_near at defect edges to size_far", "[stack][grading]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.width = 60.0;
  stack.defects = {pinhole(2, 0.0, 2.0, CavityFill::above)};
  const Mesh mesh = build_stack_mesh(stack);
  // Distinct corner x positions along the bottom face.
  std::set<double> xs;
  for (const Edge& edge : mesh.edge_sets.at("bottom")) {
    xs.insert(mesh.nodes[static_cast<std::size_t>(edge.nodes[0])].x());
    xs.insert(mesh.nodes[static_cast<std::size_t>(edge.nodes[1])].x());
  }
  const std::vector<double> x(xs.begin(), xs.end());
  double smallest_at_edge = 1e300;
  double largest = 0.0;
  double worst_growth = 1.0;
  for (std::size_t k = 0; k + 1 < x.size(); ++k) {
    const double h = x[k + 1] - x[k];
    largest = std::max(largest, h);
    if (std::abs(x[k] - 1.0) < 1e-9 || std::abs(x[k + 1] - 1.0) < 1e-9) {
      smallest_at_edge = std::min(smallest_at_edge, h);
    }
    if (k + 2 < x.size()) {
      const double next = x[k + 2] - x[k + 1];
      worst_growth = std::max(worst_growth, std::max(next / h, h / next));
    }
  }
  CHECK(smallest_at_edge <= stack.size_near * (1.0 + 1e-9));
  CHECK(smallest_at_edge > 0.5 * stack.size_near);
  CHECK(largest <= stack.size_far * (1.0 + 1e-9));
  // r = (G - h0) / (G - hf) for a geometric series that grows from h0 to hf
  // over G (sum of a geometric series, common practice).
  const double ratio = (5.0 - 0.05) / (5.0 - 1.0);
  CHECK(worst_growth < ratio * 1.25);
}

TEST_CASE("the same description gives the same mesh twice", "[stack][reproducible]") {
  StackDescription stack = four_layer_stack(StackShape::disk);
  stack.defects = {pinhole(2, 0.0, 2.0, CavityFill::above, 1), delamination(0, 6.0, 4.0, 2),
                   thin_spot(1, 12.0, 3.0, 0.4, 0.5, CavityFill::empty, 3)};
  const Mesh first = build_stack_mesh(stack);
  const Mesh second = build_stack_mesh(stack);
  REQUIRE(first.node_count() == second.node_count());
  REQUIRE(first.cell_count() == second.cell_count());
  for (int n = 0; n < first.node_count(); ++n) {
    REQUIRE(first.nodes[static_cast<std::size_t>(n)] == second.nodes[static_cast<std::size_t>(n)]);
  }
  for (int c = 0; c < first.cell_count(); ++c) {
    REQUIRE(first.cells[static_cast<std::size_t>(c)].nodes == second.cells[static_cast<std::size_t>(c)].nodes);
    REQUIRE(first.cells[static_cast<std::size_t>(c)].region == second.cells[static_cast<std::size_t>(c)].region);
  }
  CHECK(first.node_sets == second.node_sets);
}

TEST_CASE("cell types and quality of stack meshes", "[stack][quality]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  SECTION("defect-free: all rectangles, scaled Jacobian 1") {
    const Mesh mesh = build_stack_mesh(stack);
    for (const Cell& cell : mesh.cells) {
      REQUIRE(cell.type == CellType::quad9);
    }
    const MeshQuality quality = measure_quality(mesh);
    CHECK(quality.min_scaled_jacobian() == Approx(1.0).epsilon(1e-12));
    CHECK(quality.inverted_cells() == 0);
  }
  SECTION("filled cavities with steps: the nodes line up, still all rectangles") {
    stack.defects = {pinhole(2, 0.0, 2.0, CavityFill::above, 1),
                     thin_spot(1, 0.0, 4.0, 0.5, 0.0, CavityFill::above, 2),
                     pinhole(1, 9.0, 1.0, CavityFill::above, 3),
                     pinhole(2, 9.0, 1.0, CavityFill::above, 4),
                     thin_spot(0, 15.0, 2.0, 0.3, 0.0, CavityFill::empty, 5),
                     thin_spot(1, 12.5, 1.0, 0.5, 0.0, CavityFill::empty, 6)};
    const MeshQuality quality = measure_quality(build_stack_mesh(stack));
    CHECK(quality.min_scaled_jacobian() == Approx(1.0).epsilon(1e-9));
  }
  SECTION("linear on request, sloped cells in a taper stay valid") {
    stack.order = 1;
    stack.defects = {thin_spot(3, 0.0, 4.0, 0.5, 1.0, CavityFill::empty)};
    const Mesh mesh = build_stack_mesh(stack);
    for (const Cell& cell : mesh.cells) {
      REQUIRE(cell.type == CellType::quad4);
    }
    const MeshQuality quality = measure_quality(mesh);
    CHECK(quality.inverted_cells() == 0);
    CHECK(quality.layers[3].min_scaled_jacobian > 0.5);
    CHECK(quality.layers[3].min_scaled_jacobian < 1.0);
    CHECK(quality.layers[0].min_scaled_jacobian == Approx(1.0).epsilon(1e-12));
  }
}
