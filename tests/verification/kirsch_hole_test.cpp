// Stress concentration at a circular hole.
//
// Kirsch (1898), in Timoshenko & Goodier, Theory of Elasticity, 1970, sec. 35:
// for remote uniaxial stress S along x, around a hole of radius a,
//   s_rr = S/2 (1 - a^2/r^2) + S/2 (1 - 4 a^2/r^2 + 3 a^4/r^4) cos 2t
//   s_tt = S/2 (1 + a^2/r^2) - S/2 (1 + 3 a^4/r^4) cos 2t
//   s_rt = -S/2 (1 + 2 a^2/r^2 - 3 a^4/r^4) sin 2t
// so s_tt(a, 90 deg) = 3 S and s_tt(a, 0) = -S; equibiaxial S gives 2 S. An
// annulus loaded on its outer edge by exactly these tractions has this field
// as its solution, with no finite-size error. The in-plane stresses of a
// plane traction problem do not depend on the elastic constants (Michell's
// theorem, Timoshenko & Goodier 1970, sec. 41), so they are the same for any
// nu and for plane stress and plane strain: we check nu = 0.3 and 0.49 in
// plane strain and also generalized plane strain with free lambda3 (which is
// not plane stress, but is another plane traction problem).
//
// Finite-width strip with a central hole: Roark's Formulas for Stress and
// Strain (Young & Budynas, 7th ed., 2002), Table 17.1, case 1a, net-section
// Ktn = 3 - 3.13 x + 3.66 x^2 - 1.53 x^3, x = d/W.
//
// The solver is finite-strain: loads are tiny (S = 1e-6 E) so that the
// response is linear to about 1e-6, and stress ratios need no scaling.
#include "fe/support.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/solver/post.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

using namespace plystrain;
using solver::Kinematics;

namespace {

struct KirschCase {
  double sx = 1.0;  // remote stress along x
  double sy = 0.0;  // remote stress along y
};

// Kirsch's field for remote (sx, sy) by superposition of the two uniaxial ones.
Eigen::Matrix2d kirsch_polar(double a, double r, double t, double s, double angle_of_load) {
  const double c = std::cos(2.0 * (t - angle_of_load));
  const double sn = std::sin(2.0 * (t - angle_of_load));
  const double q = a * a / (r * r);
  Eigen::Matrix2d m;
  m(0, 0) = s / 2 * (1 - q) + s / 2 * (1 - 4 * q + 3 * q * q) * c;
  m(1, 1) = s / 2 * (1 + q) - s / 2 * (1 + 3 * q * q) * c;
  m(0, 1) = m(1, 0) = -s / 2 * (1 + 2 * q - 3 * q * q) * sn;
  return m;
}

Eigen::Vector2d kirsch_traction(double a, const Eigen::Vector2d& X, const KirschCase& load) {
  const double r = X.norm();
  const double t = std::atan2(X.y(), X.x());
  const Eigen::Matrix2d polar = kirsch_polar(a, r, t, load.sx, 0.0) +
                                kirsch_polar(a, r, t, load.sy, std::numbers::pi / 2);
  Eigen::Matrix2d rotation;  // columns e_r, e_t
  rotation << std::cos(t), -std::sin(t), std::sin(t), std::cos(t);
  const Eigen::Matrix2d cartesian = rotation * polar * rotation.transpose();
  return cartesian * (X / r);  // outward normal of the outer edge is e_r
}

struct HoleStresses {
  double across = 0.0;  // s_xx at (0, a): the hoop stress at 90 degrees
  double along = 0.0;   // s_yy at (a, 0): the hoop stress at 0 degrees
};

HoleStresses solve_annulus(int refinement, double poisson, Kinematics kinematics, const KirschCase& load,
                           double youngs = 1.0) {
  mesh::AnnulusSectorSpec spec;
  spec.inner_radius = 1.0;
  spec.outer_radius = 6.0;
  spec.cells_radial = 8 * refinement;
  spec.cells_angular = 8 * refinement;
  spec.radial_grading = 8.0;
  spec.cell_type = mesh::CellType::quad9;
  const mesh::Mesh mesh = mesh::annulus_sector(spec);
  solver::ModelDefinition def;
  def.kinematics = kinematics;
  def.regions = {{test::neo_hookean_from_young(youngs, poisson), solver::LockingCure::automatic}};
  def.displacements = {solver::symmetry("start", 1), solver::symmetry("end", 0)};
  const double scale = 1e-6 * youngs;
  solver::DeadTraction traction;
  traction.edge_set = "outer";
  traction.traction = [load, scale](const Eigen::Vector2d& X, double lambda) {
    return Eigen::Vector2d(lambda * scale * kirsch_traction(1.0, X, load));
  };
  def.tractions.push_back(traction);
  solver::Model model(mesh, def);
  const test::NewtonOutcome solution = test::solve(model, 1, 1.0, 1e-12);
  const solver::PointResults points = solver::evaluate_points(model, solution.q, 1.0);
  REQUIRE(points.status.ok());
  const solver::RegionNodalField stress = solver::recover_to_nodes(
      mesh, points,
      [](const solver::PointResult& p) {
        return Eigen::Vector2d(p.cauchy_stress(0, 0), p.cauchy_stress(1, 1)).eval();
      },
      2);
  HoleStresses out;
  for (const int n : mesh.node_sets.at("inner")) {
    const Eigen::Vector2d X = mesh.nodes[static_cast<std::size_t>(n)];
    if (std::abs(X.x()) < 1e-9) {
      out.across = stress.by_region[0](n, 0) / scale;
    }
    if (std::abs(X.y()) < 1e-9) {
      out.along = stress.by_region[0](n, 1) / scale;
    }
  }
  return out;
}

}  // namespace

TEST_CASE("Kirsch: uniaxial stress concentration 3 and -1, independent of nu", "[verification][kirsch]") {
  const double poisson = GENERATE(0.3, 0.49);
  const Kinematics kinematics = GENERATE(Kinematics::plane_strain, Kinematics::generalized_plane_strain);
  CAPTURE(poisson, solver::kinematics_name(kinematics));
  const HoleStresses fine = solve_annulus(4, poisson, kinematics, {1.0, 0.0});
  CHECK(std::abs(fine.across / 3.0 - 1.0) < 0.005);    // Kirsch 1898: Kt = 3
  CHECK(std::abs(fine.along / -1.0 - 1.0) < 0.005);    // Kirsch 1898: -1 along the load
  // Halving the mesh size changes the compared values by less than the tolerance.
  const HoleStresses coarse = solve_annulus(2, poisson, kinematics, {1.0, 0.0});
  CHECK(std::abs(coarse.across / fine.across - 1.0) < 0.005);
  CHECK(std::abs(coarse.along / fine.along - 1.0) < 0.005);
}

TEST_CASE("Kirsch: equibiaxial stress concentration 2", "[verification][kirsch]") {
  const HoleStresses fine = solve_annulus(4, 0.3, Kinematics::plane_strain, {1.0, 1.0});
  CHECK(std::abs(fine.across / 2.0 - 1.0) < 0.005);  // Kirsch 1898: Kt = 2 (equibiaxial)
  CHECK(std::abs(fine.along / 2.0 - 1.0) < 0.005);
  const HoleStresses coarse = solve_annulus(2, 0.3, Kinematics::plane_strain, {1.0, 1.0});
  CHECK(std::abs(coarse.across / fine.across - 1.0) < 0.005);
}

namespace {

double strip_concentration(double diameter_ratio, int refinement) {
  mesh::StripWithHoleSpec spec;
  spec.width = 10.0;
  spec.length = 60.0;
  spec.hole_diameter = diameter_ratio * spec.width;
  spec.cells_around = 6 * refinement;
  spec.cells_radial = 6 * refinement;
  spec.cells_beyond = 8 * refinement;
  spec.radial_grading = 3.0;
  spec.cell_type = mesh::CellType::quad9;
  const mesh::Mesh mesh = mesh::strip_with_hole(spec);
  solver::ModelDefinition def;
  def.kinematics = Kinematics::plane_strain;
  def.regions = {{test::neo_hookean_from_young(1.0, 0.3), solver::LockingCure::automatic}};
  def.displacements = {solver::symmetry("bottom", 1), solver::symmetry("left", 0)};
  const double stress = 1e-6;
  solver::DeadTraction pull;
  pull.edge_set = "top";
  pull.traction = [stress](const Eigen::Vector2d&, double lambda) {
    return Eigen::Vector2d(0.0, lambda * stress);
  };
  def.tractions.push_back(pull);
  solver::Model model(mesh, def);
  const test::NewtonOutcome solution = test::solve(model, 1, 1.0, 1e-12);
  const solver::PointResults points = solver::evaluate_points(model, solution.q, 1.0);
  REQUIRE(points.status.ok());
  const solver::RegionNodalField szz = solver::recover_to_nodes(
      mesh, points, [](const solver::PointResult& p) { return Eigen::VectorXd::Constant(1, p.cauchy_stress(1, 1)); }, 1);
  const double a = 0.5 * spec.hole_diameter;
  double peak = 0.0;
  for (const int n : mesh.node_sets.at("bottom")) {
    if (std::abs(mesh.nodes[static_cast<std::size_t>(n)].x() - a) < 1e-9) {
      peak = szz.by_region[0](n, 0);
    }
  }
  // Net-section nominal stress: S W / (W - d).
  const double nominal = stress * spec.width / (spec.width - spec.hole_diameter);
  return peak / nominal;
}

}  // namespace

TEST_CASE("finite-width strip with a central hole (Roark Table 17.1)", "[verification][kirsch]") {
  const double x = GENERATE(0.2, 0.5);
  CAPTURE(x);
  // Roark's Formulas for Stress and Strain, 7th ed., Table 17.1 case 1a.
  const double roark = 3.0 - 3.13 * x + 3.66 * x * x - 1.53 * x * x * x;
  const double fine = strip_concentration(x, 4);
  CAPTURE(roark, fine);
  CHECK(std::abs(fine / roark - 1.0) < 0.015);
  const double coarse = strip_concentration(x, 2);
  CHECK(std::abs(coarse / fine - 1.0) < 0.015);
}
