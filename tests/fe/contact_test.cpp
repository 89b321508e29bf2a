// Frictionless contact between two coincident faces: closed-form checks on
// two blocks stacked without bond, the tangent against finite differences,
// and the open state.
#include "fe/support.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using namespace plystrain;

namespace {

constexpr double width = 2.0;
constexpr double lower_thickness = 1.0;
constexpr double upper_thickness = 0.5;

// Two blocks, one on the other, with separate nodes on the shared face:
// "gap-lower" is the lower block's top face, "gap-upper" the upper block's
// bottom face. "left" holds both blocks' left edges.
mesh::Mesh stacked_blocks() {
  mesh::LayeredRectangleSpec lower_spec;
  lower_spec.width = width;
  lower_spec.cells_along = 4;
  lower_spec.layers = {{"lower", lower_thickness, 2, 1.0}};
  mesh::Mesh mesh = mesh::layered_rectangle(lower_spec);
  mesh::LayeredRectangleSpec upper_spec = lower_spec;
  // The same cells along: the faces start with nodes at the same places.
  upper_spec.layers = {{"upper", upper_thickness, 1, 1.0}};
  const mesh::Mesh upper = mesh::layered_rectangle(upper_spec);

  const int offset = mesh.node_count();
  for (const Eigen::Vector2d& x : upper.nodes) {
    mesh.nodes.push_back(x + Eigen::Vector2d(0.0, lower_thickness));
  }
  for (mesh::Cell cell : upper.cells) {
    for (int& node : cell.nodes) {
      node += offset;
    }
    cell.region = 1;
    mesh.cells.push_back(cell);
  }
  mesh.region_names.push_back("upper");
  auto shifted_edges = [&](const std::string& name) {
    std::vector<mesh::Edge> edges = upper.edge_sets.at(name);
    for (mesh::Edge& edge : edges) {
      for (int a = 0; a < edge.node_count; ++a) {
        edge.nodes[static_cast<std::size_t>(a)] += offset;
      }
      edge.cell += static_cast<int>(mesh.cells.size() - upper.cells.size());
    }
    return edges;
  };
  auto shifted_nodes = [&](const std::string& name) {
    std::vector<int> nodes = upper.node_sets.at(name);
    for (int& node : nodes) {
      node += offset;
    }
    return nodes;
  };
  mesh.edge_sets["gap-lower"] = mesh.edge_sets.at("top");
  mesh.edge_sets["gap-upper"] = shifted_edges("bottom");
  mesh.node_sets["upper-top"] = shifted_nodes("top");
  std::vector<int> left = mesh.node_sets.at("left");
  for (const int node : shifted_nodes("left")) {
    left.push_back(node);
  }
  mesh.node_sets["both-left"] = left;
  return mesh;
}

// Lower block: E = 1, nu = 0.3; upper block: E = 4, nu = 0.45 (so that the
// two blocks expand sideways by different amounts under the same stress).
solver::ModelDefinition pressed_blocks(double top_displacement) {
  solver::ModelDefinition def;
  def.kinematics = solver::Kinematics::plane_strain;
  def.regions = {{test::neo_hookean_from_young(1.0, 0.3), solver::LockingCure::off},
                 {test::neo_hookean_from_young(4.0, 0.45), solver::LockingCure::off}};
  def.displacements.push_back(solver::symmetry("bottom", 1));
  def.displacements.push_back(solver::symmetry("both-left", 0));
  solver::PrescribedDisplacement push;
  push.node_set = "upper-top";
  push.component = 1;
  push.value = solver::ScaledValue{top_displacement, {}};
  def.displacements.push_back(push);
  def.contacts.push_back({"gap-lower", "gap-upper", 1e3});
  return def;
}

// Through the project's load stepper and Newton, which update the contact
// active set after convergence.
Eigen::VectorXd solve_path(solver::Model& model) {
  nonlinear::DirectSparseSolver linear_solver;
  nonlinear::LoadStepperOptions options;
  options.steps = 1;
  const nonlinear::LoadPathResult path =
      nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()), options, {});
  REQUIRE(path.completed());
  return path.q;
}

double top_force(const solver::Model& model, const Eigen::VectorXd& q) {
  const Eigen::MatrixX2d forces = model.nodal_forces(q, 1.0);
  double total = 0.0;
  for (const int node : model.mesh().node_sets.at("upper-top")) {
    total += forces(node, 1);
  }
  return total;
}

}  // namespace

TEST_CASE("frictionless contact: stacked blocks pressed together slide freely", "[fe][contact]") {
  // Plane-strain uniaxial compression of each block with free sides
  // (Hooke's law, e.g. Timoshenko & Goodier, Theory of Elasticity, 1970,
  // sec. 6): sigma_zz = sigma in both blocks, eps_zz = sigma (1 - nu^2) / E,
  // eps_xx = -sigma nu (1 + nu) / E. A frictionless face lets each block take
  // its own eps_xx, so the faces slide by the difference times the width.
  const double delta = -1e-5;
  const mesh::Mesh mesh = stacked_blocks();
  solver::Model model(mesh, pressed_blocks(delta));
  const Eigen::VectorXd q = solve_path(model);

  const double compliance = (1.0 - 0.3 * 0.3) / 1.0 * lower_thickness + (1.0 - 0.45 * 0.45) / 4.0 * upper_thickness;
  const double sigma = delta / compliance;  // negative: compression
  // The penalty face adds its own small compliance: within 0.5 %.
  CHECK(top_force(model, q) == Approx(sigma * width).epsilon(5e-3));

  const solver::ContactState state = model.contact_state(q, 1.0);
  CHECK(state.pairs == 9);  // the 9 nodes of 4 quadratic edges; none shared
  CHECK(state.closed == state.pairs);
  // Penetration p h / (1e3 E): a thousandth of the elastic closing or less.
  CHECK(state.max_penetration < 1e-3 * std::abs(delta));
  CHECK(state.max_pressure == Approx(std::abs(sigma)).epsilon(1e-2));

  const double lower_lateral = -sigma * 0.3 * 1.3 / 1.0;
  const double upper_lateral = -sigma * 0.45 * 1.45 / 4.0;
  CHECK(state.max_slip == Approx(std::abs(lower_lateral - upper_lateral) * width).epsilon(1e-2));
}

TEST_CASE("frictionless contact: faces pulled apart carry nothing", "[fe][contact]") {
  const double delta = 1e-3;
  solver::Model model(stacked_blocks(), pressed_blocks(delta));
  const Eigen::VectorXd q = solve_path(model);
  const solver::ContactState state = model.contact_state(q, 1.0);
  CHECK(state.closed == 0);
  CHECK(state.max_opening == Approx(delta).epsilon(1e-6));
  CHECK(std::abs(top_force(model, q)) < 1e-12);
}

TEST_CASE("frictionless contact: the global tangent is the derivative of the residual", "[fe][contact]") {
  // Central differences of the residual (common practice for consistent
  // tangents), at a state where some pairs are closed and some open.
  solver::Model model(stacked_blocks(), pressed_blocks(0.0));
  Eigen::VectorXd q(model.size());
  for (int i = 0; i < model.size(); ++i) {
    q(i) = 0.01 * std::sin(0.71 * i + 0.3);
  }
  model.update_active_set(q, 1.0);  // opens the pairs pulled apart at q
  const solver::ContactState state = model.contact_state(q, 1.0);
  REQUIRE(state.closed > 0);
  REQUIRE(state.closed < state.pairs);
  const test::TangentComparison comparison = test::compare_tangent_with_differences(model, q, 1.0, 1e-7);
  CHECK(comparison.worst_difference < 1e-6 * comparison.largest_entry);
}

TEST_CASE("frictionless contact: a face without a partner is refused by name", "[fe][contact]") {
  mesh::Mesh mesh = stacked_blocks();
  mesh.nodes[static_cast<std::size_t>(mesh.edge_sets.at("gap-upper")[0].nodes[0])].x() += 1e-3;
  try {
    solver::Model model(mesh, pressed_blocks(0.0));
    FAIL("a face without a partner node was accepted");
  } catch (const std::invalid_argument& error) {
    CHECK(std::string(error.what()).find("gap-upper") != std::string::npos);
    CHECK(std::string(error.what()).find("no partner") != std::string::npos);
  }
}
