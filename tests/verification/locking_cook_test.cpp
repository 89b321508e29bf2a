// Cook's membrane (Cook, J. Struct. Div. ASCE 100, 1851, 1974): corners
// (0,0), (48,44), (48,60), (0,44), left edge clamped, a total vertical shear
// force F spread uniformly over the right edge.
//  - Linear plane stress, E = 1, nu = 1/3, F = 1: vertical displacement at
//    the loaded edge about 23.96, the fine-mesh value commonly quoted for
//    this problem since Cook's paper, at the mid-point of the loaded edge
//    (48, 52) (from memory).
//  - Nearly incompressible plane strain, E = 240.565, nu = 0.4999, F = 100:
//    the top corner (48, 60) moves about 8.0 in the linear problem and about
//    6.9 with a neo-Hookean law (from memory: the problem as posed by
//    Elguedj et al., CMAME 197, 2732, 2008, and de Souza Neto et al., IJSS
//    33, 3277, 1996; the two figures are recalled, not read from them).
// Plane stress is modelled in plane strain with the equivalent constants
// E' = E (1 + 2 nu)/(1 + nu)^2, nu' = nu/(1 + nu), which give the same 2D
// equations (Timoshenko & Goodier, Theory of Elasticity, 1970, sec. 16).
// Linear problems use a small fraction of the stated load and scale back.
#include "fe/support.hpp"
#include "plystrain/mesh/structured.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using namespace plystrain;
using solver::Kinematics;

namespace {

double cook_displacement(int cells, mesh::CellType type, const materials::LawParameters& law,
                         solver::LockingCure cure, double force, double scale, int steps,
                         const std::string& node_set) {
  mesh::CooksMembraneSpec spec;
  spec.cells_per_side = cells;
  spec.cell_type = type;
  const mesh::Mesh mesh = mesh::cooks_membrane(spec);
  solver::ModelDefinition def;
  def.kinematics = Kinematics::plane_strain;
  def.regions = {{law, cure}};
  def.displacements = {solver::symmetry("left", 0), solver::symmetry("left", 1)};
  solver::DeadTraction shear;
  shear.edge_set = "right";
  const double traction = force * scale / 16.0;  // the loaded edge is 16 long
  shear.traction = [traction](const Eigen::Vector2d&, double lambda) {
    return Eigen::Vector2d(0.0, lambda * traction);
  };
  def.tractions.push_back(shear);
  solver::Model model(mesh, def);
  const test::NewtonOutcome solution = test::solve(model, steps, 1.0, 1e-9);
  const Eigen::MatrixX2d u = model.displacements(solution.q, 1.0);
  return u(mesh.node_sets.at(node_set)[0], 1) / scale;
}

}  // namespace

TEST_CASE("Cook's membrane, linear plane stress", "[verification][cook]") {
  const double nu = 1.0 / 3.0;
  const double E_equivalent = (1 + 2 * nu) / ((1 + nu) * (1 + nu));
  const double nu_equivalent = nu / (1 + nu);
  const materials::LawParameters law = test::neo_hookean_from_young(E_equivalent, nu_equivalent);
  const double fine = cook_displacement(16, mesh::CellType::quad9, law, solver::LockingCure::automatic, 1.0, 1e-6, 1, "mid-right");
  CHECK(std::abs(fine / 23.96 - 1.0) < 0.01);
  const double coarse = cook_displacement(8, mesh::CellType::quad9, law, solver::LockingCure::automatic, 1.0, 1e-6, 1, "mid-right");
  CHECK(std::abs(coarse / fine - 1.0) < 0.01);
}

TEST_CASE("Cook's membrane, nearly incompressible, linear", "[verification][cook][locking]") {
  const mesh::CellType type = GENERATE(mesh::CellType::quad9, mesh::CellType::tri6);
  CAPTURE(mesh::cell_type_name(type));
  const materials::LawParameters law = test::neo_hookean_from_young(240.565, 0.4999);
  // Load 1e-3 of F: strains about 1e-4, and round-off in kappa (J - 1) with
  // kappa = 4e5 MPa stays well below the stresses.
  const double fine = cook_displacement(16, type, law, solver::LockingCure::automatic, 100.0, 1e-3, 1, "corner-top-right");
  CAPTURE(fine);
  CHECK(std::abs(fine / 8.0 - 1.0) < 0.02);
  const double coarse = cook_displacement(8, type, law, solver::LockingCure::automatic, 100.0, 1e-3, 1, "corner-top-right");
  CHECK(std::abs(coarse / fine - 1.0) < 0.02);
}

TEST_CASE("Cook's membrane, nearly incompressible neo-Hookean at finite strain", "[verification][cook][locking]") {
  const materials::LawParameters law = test::neo_hookean_from_young(240.565, 0.4999);
  const double fine = cook_displacement(16, mesh::CellType::quad9, law, solver::LockingCure::automatic, 100.0, 1.0, 10, "corner-top-right");
  CAPTURE(fine);
  CHECK(std::abs(fine / 6.9 - 1.0) < 0.02);
  const double coarse = cook_displacement(8, mesh::CellType::quad9, law, solver::LockingCure::automatic, 100.0, 1.0, 10, "corner-top-right");
  CHECK(std::abs(coarse / fine - 1.0) < 0.02);
}
