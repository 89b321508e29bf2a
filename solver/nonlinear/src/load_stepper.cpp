#include "plystrain/nonlinear/load_stepper.hpp"

#include "path_planner.hpp"
#include "step_size_control.hpp"

#include <algorithm>
#include <cmath>
#include <exception>
#include <stdexcept>
#include <string>
#include <utility>

namespace plystrain::nonlinear {

namespace {

using detail::PathPoint;
using detail::PathState;
using detail::Plan;

// The residual norm of the start point, Newton's scale; 0 when it cannot be
// evaluated (Newton then scales by its own first residual).
double residual_norm_at(NonlinearSystem& system, const Eigen::VectorXd& q, double load_factor) {
  Eigen::VectorXd residual;
  const Evaluation evaluation = system.evaluate(q, load_factor, residual, nullptr);
  if (!evaluation.ok()) {
    return 0.0;
  }
  const double norm = residual.norm();
  return std::isfinite(norm) ? norm : 0.0;
}

void check_options(const LoadStepperOptions& options, int size) {
  if (options.steps < 1 || options.max_steps < 1) {
    throw std::invalid_argument("load stepper: steps and max_steps must be at least 1");
  }
  if (!(options.cutback_factor > 0.0 && options.cutback_factor < 1.0) || !(options.growth_factor >= 1.0) ||
      !(options.min_increment > 0.0) || !(options.max_increment >= options.min_increment)) {
    throw std::invalid_argument(
        "load stepper: need 0 < cutback_factor < 1, growth_factor >= 1, 0 < min_increment <= max_increment");
  }
  if (options.control == ControlMode::displacement &&
      (options.controlled_unknown < 0 || options.controlled_unknown >= size)) {
    throw std::invalid_argument("load stepper: controlled_unknown " + std::to_string(options.controlled_unknown) +
                                " is not an unknown of a system of size " + std::to_string(size));
  }
  if (options.geometric_ramp && !(options.ramp_first_fraction > 0.0 && options.ramp_growth_factor > 1.0)) {
    throw std::invalid_argument("load stepper: the geometric ramp needs ramp_first_fraction > 0, ramp_growth_factor > 1");
  }
}

// The attempts along one load path: Newton from each plan, and the record
// of what converged.
class PathAttempts {
 public:
  PathAttempts(NonlinearSystem& system, LinearSolver& linear_solver, const LoadStepperOptions& options,
               const LoadStepperCallbacks& callbacks, LoadPathResult& result)
      : system_(system), linear_solver_(linear_solver), options_(options), callbacks_(callbacks), result_(result) {}

  // Newton from the predictor; if the predicted start cannot even be
  // evaluated (an element inverted by the extrapolation), from the last
  // converged state.
  NewtonResult solve(const Plan& plan, const PathState& state) {
    Eigen::VectorXd q_moved = state.current.q;
    if (options_.control == ControlMode::displacement) {
      q_moved(options_.controlled_unknown) = plan.q_predicted(options_.controlled_unknown);
    }
    system_.begin_attempt();
    const double reference = residual_norm_at(system_, q_moved, plan.load_predicted);
    NewtonResult newton = run_newton(plan, plan.q_predicted, plan.load_predicted, reference);
    if (newton.status == NewtonStatus::evaluation_failed && newton.iterations.empty() &&
        (plan.q_predicted - q_moved).norm() > 0.0) {
      ++result_.attempts;
      system_.begin_attempt();
      newton = run_newton(plan, q_moved, plan.path ? state.current.load_factor : plan.load_predicted, reference);
    }
    return newton;
  }

  // Keeps a converged increment and moves the path state on; false when the
  // caller asks to stop.
  bool record(const NewtonResult& newton, double new_position, double increment_size, PathState& state) {
    ConvergedIncrement increment;
    increment.index = static_cast<int>(result_.increments.size()) + 1;
    increment.load_factor = newton.load_factor;
    increment.path_position = new_position;
    increment.increment = increment_size;
    increment.newton_iterations = static_cast<int>(newton.iterations.size()) - 1;
    increment.residual_norm = newton.residual_norm;
    increment.negative_pivots = newton.last_factorization.negative_pivots;
    increment.determinant_sign = newton.last_factorization.determinant_sign;
    if (options_.keep_states) {
      increment.q = newton.q;
    }
    result_.newton_iterations += increment.newton_iterations;
    system_.accept_increment(newton.q, newton.load_factor);
    state.previous = std::move(state.current);
    state.current = PathPoint{newton.q, newton.load_factor};
    state.position = new_position;
    state.last_size = increment_size;
    result_.q = state.current.q;
    result_.load_factor = state.current.load_factor;
    result_.path_position = state.position;
    result_.increments.push_back(std::move(increment));
    return callbacks_.on_increment ? callbacks_.on_increment(result_.increments.back()) : true;
  }

  // Reports a failed attempt and keeps its Newton history.
  FailedAttempt fail(NewtonResult&& newton, double attempted, double next) {
    ++result_.failed_attempts;
    FailedAttempt failure;
    failure.attempt = result_.attempts;
    failure.increment = attempted;
    failure.next_increment = next;
    failure.status = newton.status;
    failure.detail = newton.detail;
    if (callbacks_.on_failure) {
      callbacks_.on_failure(failure);
    }
    newton.q.resize(0);
    result_.last_failure = std::move(newton);
    return failure;
  }

 private:
  NewtonResult run_newton(const Plan& plan, const Eigen::VectorXd& q_from, double load_from, double reference) {
    const int attempt = result_.attempts;
    NewtonIterationCallback on_iteration;
    if (callbacks_.on_iteration) {
      on_iteration = [this, attempt](const NewtonIterationRecord& record) {
        callbacks_.on_iteration(attempt, record);
      };
    }
    return solve_newton(system_, linear_solver_, q_from, load_from, options_.newton,
                        plan.path ? &*plan.path : nullptr, reference, on_iteration);
  }

  NonlinearSystem& system_;
  LinearSolver& linear_solver_;
  const LoadStepperOptions& options_;
  const LoadStepperCallbacks& callbacks_;
  LoadPathResult& result_;
};

// Arc length: the first increment (load-controlled) fixes the scaling of q,
// so that the path starts at 45 degrees in the scaled space.
double arc_length_scale(const PathState& state) {
  const double load_change = state.current.load_factor - state.previous->load_factor;
  const double q_change = (state.current.q - state.previous->q).norm();
  return (load_change != 0.0 && q_change > 0.0) ? q_change / std::abs(load_change) : 1.0;
}

}  // namespace

const char* status_name(PathStatus status) {
  switch (status) {
    case PathStatus::completed: return "completed";
    case PathStatus::increment_too_small: return "increment cut back below the minimum";
    case PathStatus::step_limit: return "increment limit reached";
    case PathStatus::stopped_by_caller: return "stopped by the caller";
    case PathStatus::exception: return "exception in the system";
  }
  return "unknown";
}

LoadPathResult solve_load_path(NonlinearSystem& system, LinearSolver& linear_solver, const Eigen::VectorXd& q_start,
                               const LoadStepperOptions& options, const LoadStepperCallbacks& callbacks) {
  check_options(options, system.size());
  LoadPathResult result;
  result.q = q_start;
  constexpr double end_tolerance = 1e-12;
  const auto finish = [&](PathStatus status, std::string reason) {
    result.status = status;
    result.reason = std::move(reason);
    return std::move(result);
  };

  PathState state{PathPoint{q_start, 0.0}, std::nullopt};
  detail::StepSizeControl sizes(options);
  detail::PathPlanner planner(system, linear_solver, options,
                              options.control == ControlMode::displacement ? q_start(options.controlled_unknown) : 0.0);
  PathAttempts attempts(system, linear_solver, options, callbacks, result);
  const bool arc = options.control == ControlMode::arc_length;
  while (true) {
    if (static_cast<int>(result.increments.size()) >= options.max_steps) {
      return finish(PathStatus::step_limit, "reached " + std::to_string(options.max_steps) +
                                                " converged increments at path position " +
                                                std::to_string(state.position));
    }
    ++result.attempts;
    NewtonResult newton;
    Plan plan;
    double attempted = 0.0;
    bool crossed_end = false;
    try {
      plan = planner.plan(state, sizes.size());
      attempted = plan.position - state.position;
      newton = attempts.solve(plan, state);
      if (arc && plan.path && newton.converged() && newton.load_factor >= options.load_factor_end &&
          state.current.load_factor < options.load_factor_end) {
        // Crossed the end: interpolate and solve exactly at the end load.
        crossed_end = true;
        const double fraction = (options.load_factor_end - state.current.load_factor) /
                                (newton.load_factor - state.current.load_factor);
        Plan final_plan;
        final_plan.q_predicted = state.current.q + fraction * (newton.q - state.current.q);
        final_plan.load_predicted = options.load_factor_end;
        final_plan.position = state.position + fraction * attempted;
        ++result.attempts;
        newton = attempts.solve(final_plan, state);
      }
    } catch (const std::exception& error) {
      return finish(PathStatus::exception, std::string("the system threw: ") + error.what());
    }

    planner.set_factor_at_current(newton.converged() &&
                                  newton.last_factorization.method != FactorizationMethod::none &&
                                  newton.last_factorization.ok());
    if (!newton.converged()) {
      const double from = state.position;
      const FailedAttempt failure = attempts.fail(std::move(newton), attempted, sizes.size() * options.cutback_factor);
      sizes.failed(attempted, from);
      if (sizes.size() < options.min_increment) {
        return finish(PathStatus::increment_too_small,
                      "increment of " + std::to_string(failure.increment) + " failed (" +
                          status_name(failure.status) + ": " + failure.detail + ") and the next, " +
                          std::to_string(sizes.size()) + ", is below the minimum " +
                          std::to_string(options.min_increment) + "; reached path position " +
                          std::to_string(state.position));
      }
      continue;
    }
    const bool reached_end =
        (!arc && plan.position >= 1.0 - end_tolerance) || crossed_end ||
        (arc && !plan.path && newton.load_factor >= options.load_factor_end - end_tolerance);
    const int iterations = static_cast<int>(newton.iterations.size()) - 1;
    const bool go_on =
        attempts.record(newton, crossed_end ? state.position + attempted : plan.position, attempted, state);
    if (arc && result.increments.size() == 1) {
      state.q_scale = arc_length_scale(state);
    }
    if (reached_end) {
      return finish(PathStatus::completed,
                    "reached the end of the path in " + std::to_string(result.increments.size()) + " increments");
    }
    if (!go_on) {
      return finish(PathStatus::stopped_by_caller,
                    "stopped after increment " + std::to_string(result.increments.size()));
    }
    sizes.converged(iterations, attempted, state.position);
  }
}

}  // namespace plystrain::nonlinear
