#include "plystrain/solver/load_stepper.hpp"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <stdexcept>
#include <string>
#include <utility>

namespace plystrain::solver {

namespace {

struct PathPoint {
  Eigen::VectorXd q;
  double load_factor = 0.0;
};

// One planned Newton solve: where it starts and what it holds fixed.
struct Plan {
  Eigen::VectorXd q_predicted;
  double load_predicted = 0.0;
  std::optional<PathEquation> path;  // empty: load control at load_predicted
  double position = 0.0;             // path position reached if it converges
};

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

  const double nominal = std::min(1.0 / options.steps, options.max_increment);
  double size = options.geometric_ramp ? std::min(options.ramp_first_fraction, nominal) : nominal;
  bool ramping = options.geometric_ramp && size < nominal;
  constexpr double end_tolerance = 1e-12;

  PathPoint current{q_start, 0.0};
  std::optional<PathPoint> previous;
  double position = 0.0;
  double last_size = 0.0;
  // Growth after a cut-back stops short of the size that failed, and the
  // ceiling lifts only slowly: otherwise growth leads straight back into the
  // same failure, each one costing several indefinite factorizations.
  // The ceiling belongs to the stretch of the path where the failure
  // happened: once the path has gone well past it (the stiffness, the
  // touching set, the buckled shape have all changed since) growth is free
  // again, or a failure in the first per mille of a path would hold every
  // later increment down.
  double growth_ceiling = std::numeric_limits<double>::infinity();
  double ceiling_ends_at = 0.0;
  constexpr double ceiling_below_failure = 0.7;
  constexpr double ceiling_lift = 1.1;
  constexpr double ceiling_reach = 4.0;  // in sizes of the failed increment, past where it started
  const double shrink_floor = 0.25 * nominal;
  double q_scale = 1.0;  // arc-length scaling of q, set after the first increment
  const double controlled_start =
      options.control == ControlMode::displacement ? q_start(options.controlled_unknown) : 0.0;

  // Tangent predictor at the last converged state; false when it cannot be
  // formed (the plan then starts from the last converged state).
  // The factorization the linear solver holds is that of the converged
  // Newton's last iterate, a tangent within the Newton tolerance of the one
  // at the converged state: the predictor reuses it instead of assembling
  // and factorizing again (a predictor needs only an approximate tangent).
  bool factor_at_current = false;
  auto tangent_predictor = [&](double load_step, Eigen::VectorXd& q) {
    Eigen::VectorXd residual;
    Eigen::VectorXd load_column;
    if (factor_at_current) {
      if (!system.evaluate(current.q, current.load_factor, residual, nullptr).ok() ||
          !system.load_derivative(current.q, current.load_factor, load_column).ok()) {
        return false;
      }
    } else {
      SparseMatrix tangent;
      if (!system.evaluate(current.q, current.load_factor, residual, &tangent).ok() ||
          !system.load_derivative(current.q, current.load_factor, load_column).ok() ||
          !linear_solver.factorize(tangent, options.newton.symmetry).ok()) {
        return false;
      }
    }
    Eigen::VectorXd change;
    if (!linear_solver.solve(-(residual + load_step * load_column), change).ok) {
      return false;
    }
    // Contact: the straight step pushes the surface through the nodes just
    // outside the touching set (and leaves the penalty to push them back
    // out, which costs Newton many short steps). Linearised about the set
    // the step predicts, the predictor lands near the new contact front; a
    // few rounds settle that set (a semi-smooth Newton iteration on the
    // linearised equations).
    constexpr int touch_rounds = 4;
    const double target_load = current.load_factor + load_step;
    system.hold_touch_at(current.q, current.load_factor);
    const Eigen::VectorXd straight_change = change;
    bool touch_changed = false;
    for (int round = 0; round < touch_rounds && system.hold_touch_at(current.q + change, target_load); ++round) {
      touch_changed = true;
      SparseMatrix tangent;
      factor_at_current = false;
      if (!system.evaluate(current.q, current.load_factor, residual, &tangent).ok() ||
          !system.load_derivative(current.q, current.load_factor, load_column).ok() ||
          !linear_solver.factorize(tangent, options.newton.symmetry).ok() ||
          !linear_solver.solve(-(residual + load_step * load_column), change).ok) {
        system.release_touch();
        return false;
      }
    }
    system.release_touch();
    q = current.q + change;
    if (touch_changed) {
      // Kept only where it is the better start (a released node can make
      // the linearised step overshoot).
      Eigen::VectorXd trial_residual;
      const auto norm_at = [&](const Eigen::VectorXd& point) {
        const Evaluation evaluation = system.evaluate(point, target_load, trial_residual, nullptr);
        const double norm = evaluation.ok() ? trial_residual.norm() : std::numeric_limits<double>::infinity();
        return std::isfinite(norm) ? norm : std::numeric_limits<double>::infinity();
      };
      Eigen::VectorXd straight = current.q + straight_change;
      if (norm_at(straight) < norm_at(q)) {
        q.swap(straight);
        change = straight_change;
      }
    }
    // Near a defect the path q(lambda) bends sharply (large local rotations),
    // and the straight tangent step lands far from it. The quadratic through
    // the previous converged state with the tangent slope at the current one
    // follows that bend; it is kept only where its residual is the smaller,
    // and only up to twice the span it was fitted over (a geometric ramp's
    // threefold step extrapolates the bend too far).
    constexpr double longest_extrapolation = 2.0;
    const double last_load_step = previous ? current.load_factor - previous->load_factor : 0.0;
    const double ratio = last_load_step != 0.0 ? load_step / last_load_step : 0.0;
    if (previous && ratio > 0.0 && ratio <= longest_extrapolation) {
      Eigen::VectorXd curved = q + (ratio * ratio) * (previous->q - current.q + change / ratio);
      Eigen::VectorXd trial_residual;
      const auto norm_at = [&](const Eigen::VectorXd& point) {
        const Evaluation evaluation = system.evaluate(point, target_load, trial_residual, nullptr);
        const double norm = evaluation.ok() ? trial_residual.norm() : std::numeric_limits<double>::infinity();
        return std::isfinite(norm) ? norm : std::numeric_limits<double>::infinity();
      };
      if (norm_at(curved) < norm_at(q)) {
        q.swap(curved);
      }
    }
    return true;
  };

  auto secant_predictor = [&](double ratio, Eigen::VectorXd& q, double& load) {
    q = current.q;
    load = current.load_factor;
    if (previous && options.predictor != Predictor::none && last_size > 0.0) {
      q += ratio * (current.q - previous->q);
      load += ratio * (current.load_factor - previous->load_factor);
    }
  };

  // Plans the next solve of size `size` from `current`.
  auto plan_attempt = [&]() {
    Plan plan;
    const bool arc_mode = options.control == ControlMode::arc_length && previous.has_value();
    if (!arc_mode) {
      const double target = std::min(position + size, 1.0);
      const double step = target - position;
      plan.position = target;
      secant_predictor(last_size > 0.0 ? step / last_size : 0.0, plan.q_predicted, plan.load_predicted);
      if (options.control == ControlMode::displacement) {
        const int i = options.controlled_unknown;
        const double value = controlled_start + target * (options.controlled_target - controlled_start);
        plan.q_predicted(i) = value;
        PathEquation equation;
        equation.q_coefficients = Eigen::VectorXd::Zero(system.size());
        equation.q_coefficients(i) = 1.0;
        equation.value = value;
        plan.path = std::move(equation);
      } else {
        // Load control (also the first arc-length increment).
        plan.load_predicted = std::min(target, options.control == ControlMode::arc_length ? options.load_factor_end : 1.0);
        if (options.predictor == Predictor::tangent && !tangent_predictor(plan.load_predicted - current.load_factor, plan.q_predicted)) {
          plan.q_predicted = current.q;
        }
      }
      return plan;
    }
    // Arc length: normal plane through the secant predictor in the scaled
    // space z = (q / q_scale, lambda).
    const double arc = size * std::sqrt(2.0);
    Eigen::VectorXd direction_q = (current.q - previous->q) / q_scale;
    double direction_load = current.load_factor - previous->load_factor;
    const double length = std::sqrt(direction_q.squaredNorm() + direction_load * direction_load);
    direction_q /= length;
    direction_load /= length;
    plan.q_predicted = current.q + (arc * q_scale) * direction_q;
    plan.load_predicted = current.load_factor + arc * direction_load;
    PathEquation equation;
    equation.q_coefficients = direction_q / q_scale;
    equation.load_coefficient = direction_load;
    equation.value = equation.q_coefficients.dot(current.q) + direction_load * current.load_factor + arc;
    plan.path = std::move(equation);
    plan.position = position + size;
    return plan;
  };

  auto run_newton = [&](const Plan& plan, const Eigen::VectorXd& q_from, double load_from, double reference) {
    const int attempt = result.attempts;
    NewtonIterationCallback on_iteration;
    if (callbacks.on_iteration) {
      on_iteration = [&callbacks, attempt](const NewtonIterationRecord& record) {
        callbacks.on_iteration(attempt, record);
      };
    }
    return solve_newton(system, linear_solver, q_from, load_from, options.newton,
                        plan.path ? &*plan.path : nullptr, reference, on_iteration);
  };

  // Newton from the predictor; if the predicted start cannot even be
  // evaluated (an element inverted by the extrapolation), from the last
  // converged state.
  auto solve_plan = [&](const Plan& plan) {
    Eigen::VectorXd q_moved = current.q;
    if (options.control == ControlMode::displacement) {
      q_moved(options.controlled_unknown) = plan.q_predicted(options.controlled_unknown);
    }
    system.begin_attempt();
    const double reference = residual_norm_at(system, q_moved, plan.load_predicted);
    NewtonResult newton = run_newton(plan, plan.q_predicted, plan.load_predicted, reference);
    if (newton.status == NewtonStatus::evaluation_failed && newton.iterations.empty() &&
        (plan.q_predicted - q_moved).norm() > 0.0) {
      ++result.attempts;
      system.begin_attempt();
      newton = run_newton(plan, q_moved, plan.path ? current.load_factor : plan.load_predicted, reference);
    }
    return newton;
  };

  auto record_increment = [&](const NewtonResult& newton, double new_position, double increment_size) {
    ConvergedIncrement increment;
    increment.index = static_cast<int>(result.increments.size()) + 1;
    increment.load_factor = newton.load_factor;
    increment.path_position = new_position;
    increment.increment = increment_size;
    increment.newton_iterations = static_cast<int>(newton.iterations.size()) - 1;
    increment.residual_norm = newton.residual_norm;
    increment.negative_pivots = newton.last_factorization.negative_pivots;
    increment.determinant_sign = newton.last_factorization.determinant_sign;
    if (options.keep_states) {
      increment.q = newton.q;
    }
    result.newton_iterations += increment.newton_iterations;
    system.accept_increment(newton.q, newton.load_factor);
    previous = std::move(current);
    current = PathPoint{newton.q, newton.load_factor};
    position = new_position;
    last_size = increment_size;
    result.q = current.q;
    result.load_factor = current.load_factor;
    result.path_position = position;
    result.increments.push_back(std::move(increment));
    return callbacks.on_increment ? callbacks.on_increment(result.increments.back()) : true;
  };

  auto finish = [&](PathStatus status, std::string reason) {
    result.status = status;
    result.reason = std::move(reason);
    return std::move(result);
  };

  while (true) {
    if (static_cast<int>(result.increments.size()) >= options.max_steps) {
      return finish(PathStatus::step_limit, "reached " + std::to_string(options.max_steps) +
                                                " converged increments at path position " + std::to_string(position));
    }
    ++result.attempts;
    const Plan plan = plan_attempt();
    const double attempted_size = plan.position - position;
    NewtonResult newton;
    bool crossed_end = false;
    try {
      newton = solve_plan(plan);
      const bool arc = options.control == ControlMode::arc_length && plan.path.has_value();
      if (arc && newton.converged() && newton.load_factor >= options.load_factor_end &&
          current.load_factor < options.load_factor_end) {
        // Crossed the end: interpolate and solve exactly at the end load.
        crossed_end = true;
        const double fraction = (options.load_factor_end - current.load_factor) / (newton.load_factor - current.load_factor);
        Plan final_plan;
        final_plan.q_predicted = current.q + fraction * (newton.q - current.q);
        final_plan.load_predicted = options.load_factor_end;
        final_plan.position = position + fraction * attempted_size;
        ++result.attempts;
        newton = solve_plan(final_plan);
      }
    } catch (const std::exception& error) {
      return finish(PathStatus::exception, std::string("the system threw: ") + error.what());
    }

    factor_at_current = newton.converged() && newton.last_factorization.method != FactorizationMethod::none &&
                        newton.last_factorization.ok();
    if (newton.converged()) {
      const bool first_arc_reached_end = options.control == ControlMode::arc_length && !plan.path &&
                                         newton.load_factor >= options.load_factor_end - end_tolerance;
      const bool load_controlled_end =
          (options.control != ControlMode::arc_length && plan.position >= 1.0 - end_tolerance) || crossed_end ||
          first_arc_reached_end;
      const bool go_on = record_increment(newton, crossed_end ? position + attempted_size : plan.position,
                                          attempted_size);
      if (options.control == ControlMode::arc_length && result.increments.size() == 1) {
        const double load_change = current.load_factor - previous->load_factor;
        const double q_change = (current.q - previous->q).norm();
        q_scale = (load_change != 0.0 && q_change > 0.0) ? q_change / std::abs(load_change) : 1.0;
      }
      if (load_controlled_end) {
        return finish(PathStatus::completed, "reached the end of the path in " +
                                                 std::to_string(result.increments.size()) + " increments");
      }
      if (!go_on) {
        return finish(PathStatus::stopped_by_caller, "stopped after increment " +
                                                         std::to_string(result.increments.size()));
      }
      const int iterations = static_cast<int>(newton.iterations.size()) - 1;
      if (iterations <= options.easy_iterations) {
        size = ramping ? std::min(size * options.ramp_growth_factor, nominal) : size * options.growth_factor;
        size = std::min({size, options.max_increment, std::max(growth_ceiling, attempted_size)});
        growth_ceiling *= ceiling_lift;
        if (position > ceiling_ends_at) {
          growth_ceiling = std::numeric_limits<double>::infinity();
        }
      } else {
        // A hard increment warns that the next one of the same size may fail
        // outright; Newton's work grows roughly with the square of the step
        // beyond its basin, hence the square root. Where the count does not
        // fall with the size (a strict tolerance, contact chatter) shrinking
        // would stall the path, so it stops at a quarter of the nominal size.
        const double shrink = std::max(options.cutback_factor,
                                       std::sqrt(static_cast<double>(options.easy_iterations) / iterations));
        size = std::max(size * shrink, std::min(size, shrink_floor));
      }
      ramping = ramping && size < nominal;
      continue;
    }

    ++result.failed_attempts;
    FailedAttempt failure;
    failure.attempt = result.attempts;
    failure.increment = attempted_size;
    failure.next_increment = size * options.cutback_factor;
    failure.status = newton.status;
    failure.detail = newton.detail;
    if (callbacks.on_failure) {
      callbacks.on_failure(failure);
    }
    newton.q.resize(0);
    result.last_failure = std::move(newton);
    size = failure.next_increment;
    growth_ceiling = ceiling_below_failure * attempted_size;
    ceiling_ends_at = position + ceiling_reach * attempted_size;
    ramping = false;
    if (size < options.min_increment) {
      return finish(PathStatus::increment_too_small,
                    "increment of " + std::to_string(failure.increment) + " failed (" + status_name(failure.status) +
                        ": " + failure.detail + ") and the next, " + std::to_string(size) + ", is below the minimum " +
                        std::to_string(options.min_increment) + "; reached path position " + std::to_string(position));
    }
  }
}

}  // namespace plystrain::solver
