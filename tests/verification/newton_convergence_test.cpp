// Newton's quadratic rate on a finite-strain FE case: a consistent tangent
// (including the mixed u-p condensation and the rigid-face constraint) gives
// r_{k+1} <= C r_k^2 near the solution (the local convergence theorem of
// Newton's method, Dennis & Schnabel, Numerical Methods for Unconstrained
// Optimization and Nonlinear Equations, 1983, thm. 5.2.1). An inconsistent
// tangent would show a linear rate instead.
#include "nonlinear/strip_support.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <vector>

TEST_CASE("Newton converges quadratically on a stretched and bent bilayer", "[verification][newton_rate]") {
  plystrain::solver::Model model = plystrain::test::stretched_bilayer(8, 0);
  plystrain::nonlinear::DirectSparseSolver linear_solver;
  plystrain::nonlinear::LoadStepperOptions options;
  options.steps = 4;
  options.growth_factor = 1.0;
  // The tangent predictor spreads the rigid face's motion over the strip
  // (starting from the last state would fold the cells along that face).
  options.predictor = plystrain::nonlinear::Predictor::tangent;
  options.newton.residual_tolerance = 1e-12;
  options.newton.increment_tolerance = 1e-12;
  std::map<int, std::vector<double>> residuals;  // per attempt
  plystrain::nonlinear::LoadStepperCallbacks callbacks;
  callbacks.on_iteration = [&](int attempt, const plystrain::nonlinear::NewtonIterationRecord& record) {
    residuals[attempt].push_back(record.residual_norm);
  };
  const auto path = plystrain::nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()),
                                                       options, callbacks);
  INFO(path.reason);
  REQUIRE(path.completed());
  CHECK(path.failed_attempts == 0);

  // Over the last iterations of each increment (the first ones are still
  // pre-asymptotic): log(r_{k+1}) / log(r_k) near 2, and C = r_{k+1} / r_k^2
  // (residuals relative to the first of the increment) bounded across
  // increments; for a linear rate C grows like 1/r_k.
  // Rounding: the smallest residual reached anywhere. A point counts only
  // well above it, where the rate is not yet drowned by rounding (the
  // predictor's start can be close enough that rounding is reached within
  // three iterations).
  double rounding = std::numeric_limits<double>::infinity();
  for (const auto& [attempt, history] : residuals) {
    rounding = std::min(rounding, *std::min_element(history.begin(), history.end()));
  }
  std::vector<double> constants;
  for (const auto& [attempt, history] : residuals) {
    CAPTURE(attempt);
    const double first = history.front();
    double last_now = 0.0;
    double last_next = 0.0;
    for (size_t k = 0; k + 1 < history.size(); ++k) {
      const double now = history[k] / first;
      const double next = history[k + 1] / first;
      // Only where the rate is visible: well below the start, above rounding.
      if (now < 1e-2 && history[k + 1] > 100.0 * rounding) {
        last_now = now;
        last_next = next;
      }
    }
    CHECK(history.size() <= 8);
    if (last_now > 0.0) {
      CAPTURE(last_now, last_next);
      CHECK(std::log(last_next) / std::log(last_now) > 1.8);
      constants.push_back(last_next / (last_now * last_now));
    }
  }
  REQUIRE(constants.size() >= 2);
  const auto [smallest, largest] = std::minmax_element(constants.begin(), constants.end());
  CHECK(*largest / *smallest < 100.0);
}
