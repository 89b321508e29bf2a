#include "plystrain/nonlinear/load_stepper.hpp"

#include "nonlinear/test_systems.hpp"

#include <Eigen/Cholesky>
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <map>
#include <vector>

using plystrain::nonlinear::ControlMode;
using plystrain::nonlinear::DirectSparseSolver;
using plystrain::nonlinear::LoadStepperCallbacks;
using plystrain::nonlinear::LoadStepperOptions;
using plystrain::nonlinear::PathStatus;
using plystrain::nonlinear::Predictor;
using plystrain::nonlinear::solve_load_path;
using plystrain::test::FailureInjector;
using plystrain::test::HardeningSpringChain;
using plystrain::test::VonMisesTruss;

namespace {

// Every converged state on the chain matches Cardano's closed form, to the
// accuracy the Newton tolerance (1e-8 on the residual) allows with the
// chain's condition number (about 4 n^2 / pi^2 for n springs).
void check_chain_states(const HardeningSpringChain& chain, const plystrain::nonlinear::LoadPathResult& result) {
  for (const auto& increment : result.increments) {
    const Eigen::VectorXd exact = chain.exact(increment.load_factor);
    CHECK((increment.q - exact).norm() <= 1e-7 * exact.norm());
  }
}

}  // namespace

TEST_CASE("Load control reaches the end and grows easy increments", "[load_stepper]") {
  HardeningSpringChain chain(20, 1.0, 1.0, 2.0);
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 8;
  int callbacks_seen = 0;
  int iteration_lines = 0;
  LoadStepperCallbacks callbacks;
  callbacks.on_increment = [&](const plystrain::nonlinear::ConvergedIncrement&) {
    ++callbacks_seen;
    return true;
  };
  callbacks.on_iteration = [&](int, const plystrain::nonlinear::NewtonIterationRecord&) { ++iteration_lines; };
  const auto result = solve_load_path(chain, solver, Eigen::VectorXd::Zero(20), options, callbacks);
  REQUIRE(result.completed());
  CHECK(result.load_factor == 1.0);
  CHECK(result.failed_attempts == 0);
  CHECK(callbacks_seen == static_cast<int>(result.increments.size()));
  CHECK(iteration_lines >= result.newton_iterations);
  // Growth by 1.5 after easy increments: fewer than the 8 nominal increments.
  CHECK(result.increments.size() < 8);
  CHECK(result.increments[1].increment == Approx(1.5 * result.increments[0].increment));
  check_chain_states(chain, result);
}

TEST_CASE("The secant predictor saves Newton iterations", "[load_stepper]") {
  HardeningSpringChain chain(20, 1.0, 1.0, 2.0);
  LoadStepperOptions options;
  options.steps = 10;
  options.growth_factor = 1.0;
  options.predictor = Predictor::none;
  DirectSparseSolver solver;
  const auto plain = solve_load_path(chain, solver, Eigen::VectorXd::Zero(20), options);
  options.predictor = Predictor::secant;
  const auto predicted = solve_load_path(chain, solver, Eigen::VectorXd::Zero(20), options);
  REQUIRE(plain.completed());
  REQUIRE(predicted.completed());
  CHECK(predicted.newton_iterations < plain.newton_iterations);
  check_chain_states(chain, predicted);
}

TEST_CASE("Cut-back recovers from forced failures from the last converged state", "[load_stepper]") {
  HardeningSpringChain chain(10, 1.0, 1.0, 2.0);
  FailureInjector failing(chain);
  failing.max_jump = 0.15;  // any increment larger than 0.15 fails
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 4;
  int failures_seen = 0;
  LoadStepperCallbacks callbacks;
  callbacks.on_failure = [&](const plystrain::nonlinear::FailedAttempt& failure) {
    ++failures_seen;
    CHECK(failure.next_increment == Approx(0.5 * failure.increment));
  };
  const auto result = solve_load_path(failing, solver, Eigen::VectorXd::Zero(10), options, callbacks);
  REQUIRE(result.completed());
  CHECK(result.load_factor == 1.0);
  CHECK(result.failed_attempts > 0);
  CHECK(failures_seen == result.failed_attempts);
  CHECK(failing.accepted == static_cast<int>(result.increments.size()));
  double previous_load = 0.0;
  for (const auto& increment : result.increments) {
    CHECK(increment.load_factor - previous_load <= 0.15 + 1e-12);
    previous_load = increment.load_factor;
  }
  check_chain_states(chain, result);
}

TEST_CASE("The path stops below the minimum increment and keeps what it reached", "[load_stepper]") {
  HardeningSpringChain chain(10, 1.0, 1.0, 2.0);
  FailureInjector failing(chain);
  failing.ceiling = 0.55;
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 5;
  options.min_increment = 1e-3;
  const auto result = solve_load_path(failing, solver, Eigen::VectorXd::Zero(10), options);
  CHECK(result.status == PathStatus::increment_too_small);
  CHECK_FALSE(result.reason.empty());
  REQUIRE_FALSE(result.increments.empty());
  CHECK(result.load_factor <= 0.55);
  CHECK(result.load_factor > 0.55 - 2e-3);
  REQUIRE(result.last_failure.has_value());
  check_chain_states(chain, result);
}

TEST_CASE("An exception in the system ends the path with the converged increments kept", "[load_stepper]") {
  HardeningSpringChain chain(10, 1.0, 1.0, 2.0);
  FailureInjector failing(chain);
  failing.throw_above = 0.45;
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 10;
  options.growth_factor = 1.0;
  const auto result = solve_load_path(failing, solver, Eigen::VectorXd::Zero(10), options);
  CHECK(result.status == PathStatus::exception);
  CHECK(result.reason.find("injected exception") != std::string::npos);
  CHECK(result.increments.size() == 4);
  CHECK(result.load_factor == Approx(0.4));
}

TEST_CASE("The caller can stop the path, and the step limit is honoured", "[load_stepper]") {
  HardeningSpringChain chain(5, 1.0, 1.0, 2.0);
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 10;
  options.growth_factor = 1.0;
  LoadStepperCallbacks callbacks;
  callbacks.on_increment = [](const plystrain::nonlinear::ConvergedIncrement& increment) { return increment.index < 3; };
  const auto stopped = solve_load_path(chain, solver, Eigen::VectorXd::Zero(5), options, callbacks);
  CHECK(stopped.status == PathStatus::stopped_by_caller);
  CHECK(stopped.increments.size() == 3);
  options.max_steps = 4;
  const auto limited = solve_load_path(chain, solver, Eigen::VectorXd::Zero(5), options);
  CHECK(limited.status == PathStatus::step_limit);
  CHECK(limited.increments.size() == 4);
}

TEST_CASE("The geometric ramp starts tiny and grows", "[load_stepper]") {
  HardeningSpringChain chain(10, 1.0, 1.0, 2.0);
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 10;
  options.geometric_ramp = true;
  const auto result = solve_load_path(chain, solver, Eigen::VectorXd::Zero(10), options);
  REQUIRE(result.completed());
  CHECK(result.increments.front().load_factor == Approx(1e-5));
  CHECK(result.increments[1].increment == Approx(3e-5));
  CHECK(result.increments.size() < 30);
  check_chain_states(chain, result);
}

TEST_CASE("Arc-length control follows the von Mises truss through snap-through", "[load_stepper]") {
  // P chosen so that the end load is twice the limit load: the end state lies
  // on the far branch v > 2H, reachable only by passing the limit point and
  // the falling branch (closed form in test_systems.hpp).
  const double height = 0.3;
  const double axial = 10.0;
  VonMisesTruss probe(1.0, height, axial, 1.0);
  const double limit_load = probe.load_factor_at(probe.limit_deflection());  // with P = 1
  VonMisesTruss truss(1.0, height, axial, 2.0 * limit_load);
  REQUIRE(truss.load_factor_at(truss.limit_deflection()) == Approx(0.5));

  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.control = ControlMode::arc_length;
  options.steps = 10;
  options.max_increment = 0.1;
  options.max_steps = 500;
  const auto result = solve_load_path(truss, solver, Eigen::Vector2d::Zero(), options);
  REQUIRE(result.completed());
  CHECK(result.load_factor == Approx(1.0).epsilon(1e-12));

  bool passed_limit = false;
  bool saw_falling_branch = false;
  bool saw_negative_load = false;
  double previous_v = 0.0;
  for (const auto& increment : result.increments) {
    const double v = increment.q(1);
    CHECK(std::abs(increment.q(0)) < 1e-12);
    // Equilibrium on the closed-form path.
    CHECK(increment.load_factor == Approx(truss.load_factor_at(v)).margin(1e-9));
    CHECK(v > previous_v);  // the deflection grows monotonically along this path
    previous_v = v;
    passed_limit = passed_limit || v > truss.limit_deflection();
    const bool unstable = v > truss.limit_deflection() && v < height * (1.0 + 1.0 / std::sqrt(3.0));
    if (unstable && increment.negative_pivots.has_value()) {
      saw_falling_branch = saw_falling_branch || *increment.negative_pivots == 1;
    }
    saw_negative_load = saw_negative_load || increment.load_factor < 0.0;
  }
  CHECK(passed_limit);
  CHECK(saw_falling_branch);
  CHECK(saw_negative_load);
  // End state: the root of lambda(v) = 1 beyond 2H.
  const double v_end = result.q(1);
  CHECK(v_end > 2.0 * height);
  CHECK(truss.load_factor_at(v_end) == Approx(1.0).epsilon(1e-9));
}

TEST_CASE("Displacement control passes the truss limit point", "[load_stepper]") {
  VonMisesTruss truss(1.0, 0.3, 10.0, 1.0);
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.control = ControlMode::displacement;
  options.controlled_unknown = 1;
  options.controlled_target = 0.75;  // 2.5 H
  options.steps = 20;
  const auto result = solve_load_path(truss, solver, Eigen::Vector2d::Zero(), options);
  REQUIRE(result.completed());
  CHECK(result.q(1) == Approx(0.75).epsilon(1e-14));
  for (const auto& increment : result.increments) {
    CHECK(increment.load_factor == Approx(truss.load_factor_at(increment.q(1))).margin(1e-10));
  }
  CHECK(result.load_factor == Approx(truss.load_factor_at(0.75)).epsilon(1e-10));
}

TEST_CASE("The tangent predictor follows the bend of the path", "[load_stepper]") {
  // On the hardening chain the straight tangent step from a converged state
  // misses the next one by O(dlambda^2); the quadratic through the previous
  // state with the tangent slope misses by O(dlambda^3). The straight step's
  // residual is formed here from the closed-form states (Cardano, see
  // test_systems.hpp) and the chain's own tangent, independently of the
  // stepper; the stepper's start must be well inside it.
  HardeningSpringChain chain(20, 1.0, 1.0, 2.0);
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 10;
  options.growth_factor = 1.0;
  options.predictor = Predictor::tangent;
  std::map<int, double> start_residual;  // attempt -> residual at the predicted start
  LoadStepperCallbacks callbacks;
  callbacks.on_iteration = [&](int attempt, const plystrain::nonlinear::NewtonIterationRecord& record) {
    if (record.iteration == 0) {
      start_residual[attempt] = record.residual_norm;
    }
  };
  const auto result = solve_load_path(chain, solver, Eigen::VectorXd::Zero(20), options, callbacks);
  REQUIRE(result.completed());
  REQUIRE(result.failed_attempts == 0);
  REQUIRE(result.increments.size() == 10);
  for (int attempt = 3; attempt <= 10; ++attempt) {
    CAPTURE(attempt);
    const double from = 0.1 * (attempt - 1);
    const Eigen::VectorXd state = chain.exact(from);
    Eigen::VectorXd residual;
    plystrain::nonlinear::SparseMatrix tangent;
    (void)chain.evaluate(state, from, residual, &tangent);
    Eigen::VectorXd load_column = Eigen::VectorXd::Zero(20);
    load_column(19) = -2.0;  // dR/dlambda: the end force P = 2 enters the residual with a minus sign
    const Eigen::VectorXd straight =
        state - Eigen::MatrixXd(tangent).ldlt().solve(residual + 0.1 * load_column);
    (void)chain.evaluate(straight, from + 0.1, residual, nullptr);
    const double straight_residual = residual.norm();
    REQUIRE(start_residual.count(attempt) == 1);
    CHECK(start_residual[attempt] < 0.5 * straight_residual);
  }
  check_chain_states(chain, result);
}

TEST_CASE("Growth after a cut-back stays below the size that failed", "[load_stepper]") {
  HardeningSpringChain chain(10, 1.0, 1.0, 2.0);
  FailureInjector failing(chain);
  failing.max_jump = 0.15;  // any increment larger than 0.15 fails
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 4;
  // The sizes of all attempts in order; failed ones negative.
  std::vector<double> attempts;
  LoadStepperCallbacks callbacks;
  callbacks.on_increment = [&](const plystrain::nonlinear::ConvergedIncrement& increment) {
    attempts.push_back(increment.increment);
    return true;
  };
  callbacks.on_failure = [&](const plystrain::nonlinear::FailedAttempt& failure) {
    attempts.push_back(-failure.increment);
  };
  const auto result = solve_load_path(failing, solver, Eigen::VectorXd::Zero(10), options, callbacks);
  REQUIRE(result.completed());
  REQUIRE(result.failed_attempts > 0);
  // The attempt that follows the first success after a failure of size S is
  // at most 0.7 S: growth does not walk straight back into the failure.
  int checked = 0;
  for (std::size_t k = 0; k + 2 < attempts.size(); ++k) {
    if (attempts[k] < 0.0 && attempts[k + 1] > 0.0) {
      CAPTURE(k, attempts[k], attempts[k + 2]);
      CHECK(std::abs(attempts[k + 2]) <= 0.7 * -attempts[k] + 1e-12);
      ++checked;
    }
  }
  CHECK(checked > 0);
  // Sizes worked through by hand for this injector: with the ceiling the
  // path fails at 0.25, 0.175 and 0.163; without it, fail-halve-grow by 1.5
  // repeats and it fails five times.
  CHECK(result.failed_attempts <= 3);
  check_chain_states(chain, result);
}

TEST_CASE("A hard increment shrinks the next one", "[load_stepper]") {
  HardeningSpringChain chain(10, 1.0, 1.0, 2.0);
  DirectSparseSolver solver;
  LoadStepperOptions options;
  options.steps = 10;
  options.predictor = Predictor::none;
  options.easy_iterations = 1;  // every increment of the chain needs more
  const auto result = solve_load_path(chain, solver, Eigen::VectorXd::Zero(10), options);
  REQUIRE(result.completed());
  REQUIRE(result.increments.size() >= 3);
  const auto& first = result.increments[0];
  REQUIRE(first.newton_iterations > 1);
  const double expected = first.increment * std::max(0.5, std::sqrt(1.0 / first.newton_iterations));
  CHECK(result.increments[1].increment == Approx(expected));
  // Every increment stays hard, yet the sizes stop shrinking at a quarter
  // of the nominal 0.1 (the last one only reaches the end of the path).
  for (std::size_t k = 0; k + 1 < result.increments.size(); ++k) {
    CHECK(result.increments[k].increment >= 0.025 - 1e-12);
  }
  CHECK(result.increments.size() <= 40);
  check_chain_states(chain, result);
}
