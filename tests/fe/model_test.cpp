// The assembled model: global tangent against finite differences with every
// kind of constraint and load, pattern reuse, thread determinism and the
// constraint elimination.
#include "fe/support.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/solver/constraints.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

using namespace plystrain;
using solver::Kinematics;

namespace {

mesh::Mesh two_layer_mesh(mesh::CellType type, double x_start = 0.3) {
  mesh::LayeredRectangleSpec spec;
  spec.x_start = x_start;
  spec.width = 2.0;
  spec.cells_along = 3;
  spec.layers = {{"soft", 0.6, 2, 1.0}, {"stiff", 0.3, 1, 1.0}};
  spec.cell_type = type;
  spec.interior_jitter = 0.2;
  return mesh::layered_rectangle(spec);
}

solver::ModelDefinition rich_definition(Kinematics kinematics) {
  solver::ModelDefinition def;
  def.kinematics = kinematics;
  def.regions = {{test::neo_hookean(1.0, 500.0), solver::LockingCure::automatic},
                 {test::neo_hookean(20.0, 60.0), solver::LockingCure::automatic}};
  def.displacements.push_back(solver::symmetry("bottom", 1));
  def.displacements.push_back(solver::symmetry("corner-bottom-left", 0));
  solver::RigidFace face;
  face.node_set = "right";
  face.reference_point = Eigen::Vector2d(2.3, 0.0);
  face.angle = solver::ScaledValue{0.2, {}};
  def.rigid_faces.push_back(face);
  solver::FollowerPressure pressure;
  pressure.edge_set = "top";
  pressure.pressure = solver::ScaledValue{0.3, {}};
  def.pressures.push_back(pressure);
  return def;
}

Eigen::VectorXd trial_q(int n, double scale) {
  Eigen::VectorXd q(n);
  for (int i = 0; i < n; ++i) {
    q(i) = scale * std::sin(0.37 * i + 0.2);
  }
  return q;
}

}  // namespace

TEST_CASE("global tangent equals the finite difference of the global residual", "[fe][model]") {
  const Kinematics kinematics = GENERATE(Kinematics::plane_strain, Kinematics::generalized_plane_strain,
                                         Kinematics::axisymmetric);
  const mesh::CellType type = GENERATE(mesh::CellType::quad9, mesh::CellType::tri6, mesh::CellType::quad4);
  CAPTURE(solver::kinematics_name(kinematics), mesh::cell_type_name(type));
  const mesh::Mesh mesh = two_layer_mesh(type);
  solver::ModelDefinition def = rich_definition(kinematics);
  // A multi-point constraint: the two top corners move together vertically.
  solver::LinearConstraint tie;
  tie.terms = {{mesh.node_sets.at("corner-top-left")[0], 1, 1.0},
               {mesh.node_sets.at("corner-top-right")[0], 1, -1.0}};
  tie.value = solver::ScaledValue{0.0, {}};
  def.linear_constraints.push_back(tie);
  solver::Model model(mesh, def);
  CHECK_FALSE(model.tangent_is_symmetric());
  CHECK(model.region_treatments()[0].mixed);
  CHECK_FALSE(model.region_treatments()[1].mixed);

  const test::TangentComparison comparison =
      test::compare_tangent_with_differences(model, trial_q(model.size(), 0.01), 0.7, 1e-6);
  CHECK(comparison.worst_difference < 1e-6 * comparison.largest_entry);
}

TEST_CASE("the tangent's pattern is built once and reused", "[fe][model]") {
  const mesh::Mesh mesh = two_layer_mesh(mesh::CellType::quad9);
  solver::Model model(mesh, rich_definition(Kinematics::plane_strain));
  Eigen::VectorXd r;
  nonlinear::SparseMatrix K;
  REQUIRE(model.evaluate(trial_q(model.size(), 0.01), 0.5, r, &K).ok());
  const double* values = K.valuePtr();
  const int* inner = K.innerIndexPtr();
  const Eigen::MatrixXd first = Eigen::MatrixXd(K);
  REQUIRE(model.evaluate(trial_q(model.size(), 0.02), 0.5, r, &K).ok());
  REQUIRE(model.evaluate(trial_q(model.size(), 0.01), 0.5, r, &K).ok());
  CHECK(K.valuePtr() == values);  // no reallocation: values were zeroed and scattered
  CHECK(K.innerIndexPtr() == inner);
  CHECK((Eigen::MatrixXd(K) - first).cwiseAbs().maxCoeff() == 0.0);
}

TEST_CASE("assembly is identical with one and two threads", "[fe][model][threads]") {
  mesh::LayeredRectangleSpec spec;
  spec.width = 10.0;
  spec.cells_along = 80;  // 640 cells: more than one parallel chunk
  spec.layers = {{"soft", 1.0, 6, 1.0}, {"stiff", 0.2, 2, 1.0}};
  spec.cell_type = mesh::CellType::tri6;
  spec.interior_jitter = 0.2;
  const mesh::Mesh mesh = mesh::layered_rectangle(spec);
  std::vector<Eigen::VectorXd> residuals;
  std::vector<Eigen::VectorXd> values;
  for (const int threads : {1, 2}) {
    solver::ModelDefinition def = rich_definition(Kinematics::generalized_plane_strain);
    def.rigid_faces[0].reference_point = Eigen::Vector2d(10.0, 0.0);
    def.rigid_faces[0].angle = solver::ScaledValue{0.005, {}};
    def.threads = threads;
    solver::Model model(mesh, def);
    Eigen::VectorXd r;
    nonlinear::SparseMatrix K;
    REQUIRE(model.evaluate(trial_q(model.size(), 0.002), 0.5, r, &K).ok());
    residuals.push_back(r);
    values.push_back(Eigen::Map<const Eigen::VectorXd>(K.valuePtr(), K.nonZeros()));
  }
  // Cells are computed in parallel; each thread then adds every cell into
  // the columns it owns, in cell order, so the results agree bit for bit.
  CHECK((residuals[0] - residuals[1]).cwiseAbs().maxCoeff() == 0.0);
  CHECK((values[0] - values[1]).cwiseAbs().maxCoeff() == 0.0);
}

TEST_CASE("constraint elimination resolves chains of constraints", "[fe][constraints]") {
  // z0 = 0.5 lambda; z1 + 2 z2 = 3 lambda; z3 = t + 1 (t an extra unknown);
  // z2 - z3 = 0.
  solver::ConstraintSet set(4, 1);
  set.prescribe(0, [](double l) { return 0.5 * l; }, "z0");
  set.add_linear({{1, 1.0}, {2, 2.0}}, [](double l) { return 3.0 * l; }, "sum");
  set.follow(3, 4, [](double) { return 1.0; }, "rigid");
  set.add_linear({{2, 1.0}, {3, -1.0}}, [](double) { return 0.0; }, "tie");
  set.finish();
  REQUIRE(set.reduced_count() == 1);  // only one unknown remains
  CHECK_FALSE(set.is_selection());
  for (const double t : {0.0, 0.7}) {
    const Eigen::VectorXd z = set.expand(Eigen::VectorXd::Constant(1, t), 2.0);
    CHECK(z(0) == Approx(1.0));
    CHECK(z(1) + 2 * z(2) == Approx(6.0));
    CHECK(z(2) == Approx(z(3)));
  }
  CHECK_THROWS_AS(solver::ConstraintSet(2, 0).prescribe(5, [](double) { return 0.0; }, "bad"),
                  std::invalid_argument);
  solver::ConstraintSet twice(2, 0);
  twice.prescribe(0, [](double) { return 0.0; }, "first");
  CHECK_THROWS_AS(twice.prescribe(0, [](double) { return 1.0; }, "second"), std::invalid_argument);
}

TEST_CASE("many nodes tied to one reference node keep short definitions", "[fe][constraints]") {
  // z_i - z_0 = i lambda for i = 1..n (a straight edge tied to its bottom
  // node). Each tie must eliminate z_i, not the reference z_0: eliminating
  // the reference chains every later tie through the earlier ones.
  constexpr int n = 400;
  solver::ConstraintSet set(n + 1, 0);
  for (int i = 1; i <= n; ++i) {
    set.add_linear({{i, 1.0}, {0, -1.0}}, [i](double l) { return i * l; }, "tie");
  }
  set.finish();
  CHECK(set.is_free(0));
  REQUIRE(set.reduced_count() == 1);
  for (int i = 1; i <= n; ++i) {
    CHECK(set.reduced_row(i).size() == 1);
  }
  const Eigen::VectorXd z = set.expand(Eigen::VectorXd::Constant(1, 0.25), 2.0);
  CHECK(z(n) - z(0) == Approx(2.0 * n));
}

TEST_CASE("a rigid face follows a large rotation exactly", "[fe][constraints]") {
  // Rotate the right face of a strip by 60 degrees about its bottom corner:
  // the face's nodes must stay on the rotated straight line with their
  // spacing unchanged, whatever the translation the solution picks.
  mesh::LayeredRectangleSpec spec;
  spec.width = 4.0;
  spec.cells_along = 6;
  spec.layers = {{"strip", 1.0, 3, 1.0}};
  spec.cell_type = mesh::CellType::quad9;
  const mesh::Mesh mesh = mesh::layered_rectangle(spec);
  solver::ModelDefinition def;
  def.regions = {{test::neo_hookean(1.0, 10.0), solver::LockingCure::off}};
  def.displacements = {solver::symmetry("left", 0), solver::symmetry("corner-bottom-left", 1)};
  solver::RigidFace face;
  face.node_set = "right";
  face.reference_point = Eigen::Vector2d(4.0, 0.5);
  face.angle = solver::ScaledValue{std::numbers::pi / 3.0, {}};
  face.fixed_translation[1] = solver::ScaledValue{0.0, {}};
  def.rigid_faces.push_back(face);
  solver::Model model(mesh, def);
  const test::NewtonOutcome solution = test::solve(model, 10, 1.0, 1e-10);
  const Eigen::MatrixX2d u = model.displacements(solution.q, 1.0);
  const std::vector<int>& nodes = mesh.node_sets.at("right");
  const Eigen::Vector2d direction(-std::sin(std::numbers::pi / 3.0), std::cos(std::numbers::pi / 3.0));
  const Eigen::Vector2d base = mesh.nodes[static_cast<std::size_t>(nodes[0])] + u.row(nodes[0]).transpose();
  for (const int n : nodes) {
    const Eigen::Vector2d X = mesh.nodes[static_cast<std::size_t>(n)];
    const Eigen::Vector2d x = X + u.row(n).transpose();
    const Eigen::Vector2d expected = base + (X.y() - mesh.nodes[static_cast<std::size_t>(nodes[0])].y()) * direction;
    CHECK((x - expected).norm() < 1e-12);
  }
}
