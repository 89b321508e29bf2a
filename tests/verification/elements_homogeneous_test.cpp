// Homogeneous finite stretches of a nearly incompressible solid against the
// incompressible closed forms for the nominal stress (Ogden, Non-linear
// Elastic Deformations, 1984, ch. 7; Holzapfel, Nonlinear Solid Mechanics,
// 2000, sec. 6.5):
//   neo-Hookean   uniaxial mu (l - l^-2), equibiaxial mu (l - l^-5),
//                 pure shear mu (l - l^-3);
//   Mooney-Rivlin uniaxial 2 (l - l^-2)(C1 + C2 / l).
// With kappa/mu = 1e4 the compressible solution differs from them by
// O(mu/kappa); the check allows 3 mu/kappa. Each deformation needs the right
// kinematics: uniaxial needs a free third direction (generalized plane strain
// with free lambda3), plane strain with a free lateral side is pure shear (the
// third direction is held), and the equibiaxial state is an axisymmetric disk
// stretched radially.
//
// The stretch is a prescribed displacement of one face. Newton from rest
// folds the cells along that face at kappa/mu = 1e4, so the path starts with
// a geometric ramp of tiny increments; the secant predictor then carries the
// homogeneous field into the interior for the larger ones.
#include "fe/support.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"
#include "plystrain/solver/post.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

using namespace plystrain;
using solver::Kinematics;

namespace {

constexpr double shear_modulus = 1.0;
constexpr double bulk_modulus = 1e4;

mesh::Mesh block(double width, double height, mesh::CellType type) {
  mesh::LayeredRectangleSpec spec;
  spec.width = width;
  spec.cells_along = 2;
  spec.layers = {{"block", height, 2, 1.0}};
  spec.cell_type = type;
  return mesh::layered_rectangle(spec);
}

// The load path from rest to lambda = 1; a test fails (with the reason)
// unless the path completes.
Eigen::VectorXd solve_path(solver::Model& model) {
  nonlinear::DirectSparseSolver linear_solver;
  nonlinear::LoadStepperOptions options;
  options.steps = 10;
  options.geometric_ramp = true;
  options.ramp_first_fraction = 1e-3;
  options.predictor = nonlinear::Predictor::secant;
  options.newton.residual_tolerance = 1e-10;
  options.newton.symmetry =
      model.tangent_is_symmetric() ? nonlinear::MatrixSymmetry::symmetric : nonlinear::MatrixSymmetry::unsymmetric;
  const nonlinear::LoadPathResult path =
      nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()), options);
  INFO(nonlinear::status_name(path.status) << ": " << path.reason << " after " << path.increments.size()
                                        << " increments, lambda = " << path.load_factor);
  REQUIRE(path.completed());
  return path.q;
}

double force_on(const solver::Model& model, const Eigen::VectorXd& q, const std::string& set, int component) {
  const Eigen::MatrixX2d f = model.nodal_forces(q, 1.0);
  double total = 0.0;
  for (const int n : model.mesh().node_sets.at(set)) {
    total += f(n, component);
  }
  return total;
}

// Stretch the block along x to `stretch` (left face held in x, bottom in z).
double stretched_block_stress(Kinematics kinematics, const materials::LawParameters& law, double stretch,
                              mesh::CellType type) {
  const mesh::Mesh mesh = block(1.0, 1.0, type);
  solver::ModelDefinition def;
  def.kinematics = kinematics;
  def.regions = {{law, solver::LockingCure::automatic}};
  def.displacements = {solver::symmetry("left", 0), solver::symmetry("bottom", 1)};
  solver::PrescribedDisplacement pull;
  pull.node_set = "right";
  pull.component = 0;
  pull.value = solver::ScaledValue{stretch - 1.0, {}};
  def.displacements.push_back(pull);
  solver::Model model(mesh, def);
  REQUIRE(model.region_treatments()[0].mixed);
  const Eigen::VectorXd q = solve_path(model);
  // Nominal stress: force per reference area (height 1, unit depth).
  return force_on(model, q, "right", 0) / 1.0;
}

}  // namespace

TEST_CASE("uniaxial stretch via generalized plane strain with free lambda3", "[verification][homogeneous]") {
  const mesh::CellType type = GENERATE(mesh::CellType::quad9, mesh::CellType::tri6, mesh::CellType::quad4);
  const double stretch = GENERATE(1.5, 0.8);
  const double computed = stretched_block_stress(Kinematics::generalized_plane_strain,
                                                 test::neo_hookean(shear_modulus, bulk_modulus), stretch, type);
  const double closed_form = shear_modulus * (stretch - 1.0 / (stretch * stretch));  // Ogden 1984
  CHECK(std::abs(computed / closed_form - 1.0) < 3.0 * shear_modulus / bulk_modulus);
}

TEST_CASE("pure shear via plane strain with a free lateral face", "[verification][homogeneous]") {
  const double stretch = GENERATE(1.5, 2.0);
  const double computed = stretched_block_stress(Kinematics::plane_strain,
                                                 test::neo_hookean(shear_modulus, bulk_modulus), stretch,
                                                 mesh::CellType::quad9);
  const double closed_form = shear_modulus * (stretch - std::pow(stretch, -3.0));  // Ogden 1984
  CHECK(std::abs(computed / closed_form - 1.0) < 3.0 * shear_modulus / bulk_modulus);
}

TEST_CASE("Mooney-Rivlin uniaxial stretch", "[verification][homogeneous]") {
  materials::LawParameters law;
  law.kind = materials::ModelKind::mooney_rivlin;
  law.c10 = 0.3;
  law.c01 = 0.2;
  law.bulk_modulus = 1e4 * 2.0 * (law.c10 + law.c01);
  const double stretch = 1.6;
  const double computed = stretched_block_stress(Kinematics::generalized_plane_strain, law, stretch,
                                                 mesh::CellType::quad9);
  // 2 (l - l^-2)(C1 + C2 / l) (Ogden 1984; Holzapfel 2000, eq. 6.125 form).
  const double closed_form = 2.0 * (stretch - 1.0 / (stretch * stretch)) * (law.c10 + law.c01 / stretch);
  CHECK(std::abs(computed / closed_form - 1.0) < 3e-4);
}

TEST_CASE("equibiaxial stretch via an axisymmetric disk", "[verification][homogeneous]") {
  const mesh::CellType type = GENERATE(mesh::CellType::quad9, mesh::CellType::tri6);
  const double stretch = 1.4;
  const double radius = 2.0, thickness = 0.5;
  const mesh::Mesh mesh = block(radius, thickness, type);
  solver::ModelDefinition def;
  def.kinematics = Kinematics::axisymmetric;
  def.regions = {{test::neo_hookean(shear_modulus, bulk_modulus), solver::LockingCure::automatic}};
  def.displacements = {solver::symmetry("bottom", 1)};
  solver::PrescribedDisplacement pull;
  pull.node_set = "right";
  pull.component = 0;
  pull.value = solver::ScaledValue{(stretch - 1.0) * radius, {}};
  def.displacements.push_back(pull);
  solver::Model model(mesh, def);
  const Eigen::VectorXd q = solve_path(model);
  // Ring force over the reference rim area 2 pi R H gives the nominal stress.
  const double computed = force_on(model, q, "right", 0) / (2.0 * std::numbers::pi * radius * thickness);
  const double closed_form = shear_modulus * (stretch - std::pow(stretch, -5.0));  // Ogden 1984
  CHECK(std::abs(computed / closed_form - 1.0) < 3.0 * shear_modulus / bulk_modulus);
  // Through the thickness: lambda_z = lambda^-2 (incompressible).
  const solver::PointResults points = solver::evaluate_points(model, q, 1.0);
  REQUIRE(points.status.ok());
  for (const solver::PointResult& p : points.points) {
    CHECK(p.deformation_gradient(1, 1) == Approx(1.0 / (stretch * stretch)).epsilon(3e-4));
    CHECK(p.principal_stretches(2) == Approx(stretch).epsilon(1e-10));
  }
}
