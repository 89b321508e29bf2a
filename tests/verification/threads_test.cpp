// The same finite-strain solution with 1 and 2 OpenMP threads: the element
// loop must be deterministic regardless of the thread count (architecture
// contract; common practice for reproducible FE results). Tolerance 1e-14
// relative on the converged unknowns.
#include "nonlinear/strip_support.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"

#include <catch2/catch.hpp>

namespace {

plystrain::nonlinear::LoadPathResult solve_with_threads(int threads) {
  plystrain::solver::Model model = plystrain::test::stretched_bilayer(12, threads);
  plystrain::nonlinear::DirectSparseSolver linear_solver;
  plystrain::nonlinear::LoadStepperOptions options;
  options.steps = 2;
  options.predictor = plystrain::nonlinear::Predictor::tangent;
  return plystrain::nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()), options);
}

}  // namespace

TEST_CASE("one and two threads give the same solution to 1e-14", "[verification][threads]") {
  const auto one = solve_with_threads(1);
  const auto two = solve_with_threads(2);
  REQUIRE(one.completed());
  REQUIRE(two.completed());
  REQUIRE(one.increments.size() == two.increments.size());
  for (size_t i = 0; i < one.increments.size(); ++i) {
    const Eigen::VectorXd& a = one.increments[i].q;
    const Eigen::VectorXd& b = two.increments[i].q;
    CHECK((a - b).norm() <= 1e-14 * a.norm());
    CHECK(one.increments[i].newton_iterations == two.increments[i].newton_iterations);
  }
}
