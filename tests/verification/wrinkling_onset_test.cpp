// Onset of wrinkling of a stiff film on a compliant substrate, seen as the
// loss of positive definiteness of the tangent along the flat (unbuckled)
// path.
//
// A film of plane-strain modulus Ef' = Ef / (1 - nuf^2) and thickness h,
// bonded to a deep substrate of plane-strain modulus Es' = Es / (1 - nus^2)
// and compressed along the film, wrinkles at the film strain
//     eps_c = (1/4) (3 Es' / Ef')^(2/3),
// with wavelength 2 pi h (Ef' / (3 Es'))^(1/3) (Chen & Hutchinson, J. Appl.
// Mech. 71 (2004) 597; Huang, Hong & Suo, J. Mech. Phys. Solids 53 (2005)
// 2101; formula recalled from memory). For a nearly incompressible substrate
// the bonded and the shear-free interface give the same value. Beyond eps_c
// the flat state is still an equilibrium but an unstable one: the tangent of
// the discretised problem has a negative eigenvalue, which the LDL'
// factorization reports as a negative pivot (Sylvester's law of inertia).
// The strain at which the negative pivot first appears is compared with
// eps_c; the film is perfect and flat, so Newton stays on the flat path.
#include "nonlinear/strip_support.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

TEST_CASE("The flat film turns unstable at the wrinkling strain", "[verification][wrinkling]") {
  using namespace plystrain;
  constexpr double film_modulus = 1000.0;  // MPa, invented for the check
  constexpr double film_poisson = 0.3;
  constexpr double substrate_modulus = 1.0;
  constexpr double substrate_poisson = 0.4999;
  constexpr double film_thickness = 1.0;  // um
  const double film_plane = film_modulus / (1.0 - film_poisson * film_poisson);
  const double substrate_plane = substrate_modulus / (1.0 - substrate_poisson * substrate_poisson);
  const double critical_strain = 0.25 * std::pow(3.0 * substrate_plane / film_plane, 2.0 / 3.0);
  const double wavelength =
      2.0 * std::numbers::pi * film_thickness * std::cbrt(film_plane / (3.0 * substrate_plane));
  INFO("critical strain " << critical_strain << ", wavelength " << wavelength << " um");

  // Four wavelengths wide, 1.5 deep (the wrinkle decays like exp(-2 pi z /
  // wavelength) into the substrate); 20 cells per wavelength along the film.
  mesh::LayeredRectangleSpec spec;
  spec.width = 4.0 * wavelength;
  spec.cells_along = 80;
  spec.layers = {{"substrate", 1.5 * wavelength, 24, 0.08}, {"film", film_thickness, 2, 1.0}};
  spec.cell_type = mesh::CellType::quad9;
  solver::ModelDefinition definition;
  definition.kinematics = solver::Kinematics::plane_strain;
  definition.regions = {{test::neo_hookean_young(substrate_modulus, substrate_poisson), solver::LockingCure::automatic},
                        {test::neo_hookean_young(film_modulus, film_poisson), solver::LockingCure::automatic}};
  definition.displacements.push_back(solver::symmetry("left", 0));
  definition.displacements.push_back(solver::symmetry("bottom", 1));
  // Compressed to 1.5 eps_c by its right edge, which stays free to move
  // vertically (so that the wrinkle fits between two free ends).
  constexpr double end_over_critical = 1.5;
  solver::PrescribedDisplacement squeeze;
  squeeze.node_set = "right";
  squeeze.component = 0;
  squeeze.value = solver::ScaledValue{-end_over_critical * critical_strain * spec.width, {}};
  definition.displacements.push_back(squeeze);
  solver::Model model(mesh::layered_rectangle(spec), definition);

  nonlinear::DirectSparseSolver linear_solver;
  nonlinear::LoadStepperOptions options;
  options.steps = 30;  // 0.05 eps_c per increment
  options.growth_factor = 1.0;
  options.predictor = nonlinear::Predictor::tangent;
  const nonlinear::LoadPathResult path =
      nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()), options);
  INFO(path.reason);
  REQUIRE(path.completed());

  double last_stable = 0.0;
  double first_unstable = -1.0;
  for (const nonlinear::ConvergedIncrement& increment : path.increments) {
    REQUIRE(increment.negative_pivots.has_value());
    const double strain = end_over_critical * critical_strain * increment.load_factor;
    if (*increment.negative_pivots == 0 && first_unstable < 0.0) {
      last_stable = strain;
    } else if (*increment.negative_pivots > 0 && first_unstable < 0.0) {
      first_unstable = strain;
    }
  }
  CAPTURE(last_stable / critical_strain, first_unstable / critical_strain);
  REQUIRE(first_unstable > 0.0);
  // The bracket [last stable, first unstable] is one increment (5 % of
  // eps_c) wide; allow 3 % beyond it for the discretisation, the finite
  // depth and the finite strain.
  CHECK(last_stable <= 1.03 * critical_strain);
  CHECK(first_unstable >= 0.97 * critical_strain);
  // Once unstable, the flat state stays so to the end of the path.
  CHECK(*path.increments.back().negative_pivots > 0);
}
