// Patch tests (Irons & Razzaque 1972; Zienkiewicz & Taylor, The Finite
// Element Method, vol. 1, 2000, ch. 10): a displacement field that gives a
// homogeneous deformation is an exact solution without body forces, so when
// it is prescribed on the boundary of a patch of distorted cells every
// interior node must reproduce it, for every cell type and kinematic kind, at
// finite strain (here 10 %, several Newton iterations) and with or without
// the mixed formulation.
#include "fe/support.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/solver/post.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>

using namespace plystrain;
using solver::Kinematics;

namespace {

struct Affine {
  Eigen::Matrix2d gradient;
  Eigen::Vector2d offset;
  [[nodiscard]] Eigen::Vector2d at(const Eigen::Vector2d& X) const { return gradient * X + offset; }
};

// Plane strain and generalized plane strain: any affine field. Axisymmetric:
// u_r = a r (so F_rr = F_tt and u_r = 0 on the axis), u_z = c z + e; for an
// isotropic law that is homogeneous and satisfies the radial equilibrium
// equation dP_rR/dR + dP_rZ/dZ + (P_rR - P_tt)/R = 0.
Affine field_for(Kinematics kinematics) {
  Affine f;
  if (kinematics == Kinematics::axisymmetric) {
    f.gradient << 0.1, 0.0, 0.0, -0.06;
    f.offset << 0.0, 0.02;
  } else {
    f.gradient << 0.1, 0.05, -0.03, 0.08;
    f.offset << 0.01, -0.02;
  }
  return f;
}

}  // namespace

TEST_CASE("patch test: homogeneous finite deformation is reproduced exactly", "[verification][patch]") {
  const mesh::CellType type = GENERATE(mesh::CellType::tri3, mesh::CellType::tri6, mesh::CellType::quad4,
                                       mesh::CellType::quad8, mesh::CellType::quad9);
  const Kinematics kinematics = GENERATE(Kinematics::plane_strain, Kinematics::generalized_plane_strain,
                                         Kinematics::axisymmetric);
  const solver::LockingCure cure = GENERATE(solver::LockingCure::off, solver::LockingCure::on);
  CAPTURE(mesh::cell_type_name(type), solver::kinematics_name(kinematics), static_cast<int>(cure));

  mesh::LayeredRectangleSpec spec;
  // The axisymmetric patch touches the axis (r = 0) to exercise its nodes.
  spec.x_start = kinematics == Kinematics::axisymmetric ? 0.0 : 0.5;
  spec.width = 2.0;
  spec.cells_along = 4;
  spec.layers = {{"lower", 0.7, 2, 1.0}, {"upper", 0.9, 3, 1.0}};
  spec.cell_type = type;
  spec.interior_jitter = 0.3;
  mesh::Mesh mesh = mesh::layered_rectangle(spec);
  std::vector<int>& boundary = mesh.node_sets["boundary"];
  for (const char* side : {"bottom", "top", "left", "right"}) {
    const std::vector<int>& nodes = mesh.node_sets.at(side);
    boundary.insert(boundary.end(), nodes.begin(), nodes.end());
  }
  std::sort(boundary.begin(), boundary.end());
  boundary.erase(std::unique(boundary.begin(), boundary.end()), boundary.end());

  const Affine affine = field_for(kinematics);
  solver::ModelDefinition def;
  def.kinematics = kinematics;
  // A compressible law (nu about 0.36).
  def.regions = {{test::neo_hookean(1.0, 4.0), cure}, {test::neo_hookean(1.0, 4.0), cure}};
  {
    for (int c = 0; c < 2; ++c) {
      solver::PrescribedDisplacement p;
      p.node_set = "boundary";
      p.component = c;
      p.field = [affine, c](const Eigen::Vector2d& X, double lambda) { return lambda * affine.at(X)(c); };
      def.displacements.push_back(p);
    }
  }
  solver::Model model(mesh, def);
  const test::NewtonOutcome solution = test::solve(model, 5, 1.0, 1e-13);
  const Eigen::MatrixX2d u = model.displacements(solution.q, 1.0);

  double worst = 0.0;
  for (int n = 0; n < mesh.node_count(); ++n) {
    const Eigen::Vector2d expected = affine.at(mesh.nodes[static_cast<std::size_t>(n)]);
    worst = std::max(worst, (u.row(n).transpose() - expected).norm());
  }
  CHECK(worst < 1e-10);

  // Homogeneous stress at every point, and the same F33.
  const solver::PointResults points = solver::evaluate_points(model, solution.q, 1.0);
  REQUIRE(points.status.ok());
  const solver::PointResult& first = points.points.front();
  double stress_scatter = 0.0;
  for (const solver::PointResult& p : points.points) {
    stress_scatter = std::max(stress_scatter, (p.cauchy_stress - first.cauchy_stress).cwiseAbs().maxCoeff());
    CHECK(std::abs(p.deformation_gradient(2, 2) - first.deformation_gradient(2, 2)) < 1e-10);
  }
  CHECK(stress_scatter < 1e-9 * first.cauchy_stress.cwiseAbs().maxCoeff());
  if (kinematics == Kinematics::generalized_plane_strain) {
    // Free e3: zero out-of-plane stress everywhere.
    CHECK(std::abs(first.cauchy_stress(2, 2)) < 1e-10);
  }
}
