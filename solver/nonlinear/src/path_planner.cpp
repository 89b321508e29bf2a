#include "path_planner.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>

namespace plystrain::nonlinear::detail {

PathPlanner::PathPlanner(NonlinearSystem& system, LinearSolver& linear_solver, const LoadStepperOptions& options,
                         double controlled_start)
    : system_(system), linear_solver_(linear_solver), options_(options), controlled_start_(controlled_start) {}

double PathPlanner::residual_norm_at(const Eigen::VectorXd& q, double load_factor) {
  Eigen::VectorXd residual;
  const Evaluation evaluation = system_.evaluate(q, load_factor, residual, nullptr);
  const double norm = evaluation.ok() ? residual.norm() : std::numeric_limits<double>::infinity();
  return std::isfinite(norm) ? norm : std::numeric_limits<double>::infinity();
}

// -K^-1 (R + dR/dlambda dlambda) at the converged state.
bool PathPlanner::linearised_change(const PathState& state, double load_step, bool factorize,
                                    Eigen::VectorXd& change) {
  const PathPoint& current = state.current;
  Eigen::VectorXd residual;
  Eigen::VectorXd load_column;
  if (!factorize) {
    if (!system_.evaluate(current.q, current.load_factor, residual, nullptr).ok() ||
        !system_.load_derivative(current.q, current.load_factor, load_column).ok()) {
      return false;
    }
  } else {
    SparseMatrix tangent;
    if (!system_.evaluate(current.q, current.load_factor, residual, &tangent).ok() ||
        !system_.load_derivative(current.q, current.load_factor, load_column).ok() ||
        !linear_solver_.factorize(tangent, options_.newton.symmetry).ok()) {
      return false;
    }
  }
  return linear_solver_.solve(-(residual + load_step * load_column), change).ok;
}

// Contact: the straight step pushes the surface through the nodes just
// outside the touching set (and leaves the penalty to push them back out,
// which costs Newton many short steps). Linearised about the set the step
// predicts, the predictor lands near the new contact front; a few rounds
// settle that set (a semi-smooth Newton iteration on the linearised
// equations). The result is kept only where it is the better start (a
// released node can make the linearised step overshoot).
bool PathPlanner::settle_touching_set(const PathState& state, double load_step, Eigen::VectorXd& change,
                                      std::optional<double>& chosen_norm) {
  constexpr int touch_rounds = 4;
  const PathPoint& current = state.current;
  const double target_load = current.load_factor + load_step;
  system_.hold_touch_at(current.q, current.load_factor);
  const Eigen::VectorXd straight_change = change;
  bool touch_changed = false;
  for (int round = 0; round < touch_rounds && system_.hold_touch_at(current.q + change, target_load); ++round) {
    touch_changed = true;
    factor_at_current_ = false;
    if (!linearised_change(state, load_step, true, change)) {
      system_.release_touch();
      return false;
    }
  }
  system_.release_touch();
  if (touch_changed) {
    const double straight_norm = residual_norm_at(current.q + straight_change, target_load);
    const double settled_norm = residual_norm_at(current.q + change, target_load);
    if (straight_norm < settled_norm) {
      change = straight_change;
    }
    chosen_norm = std::min(straight_norm, settled_norm);
  }
  return true;
}

// Near a defect the path q(lambda) bends sharply (large local rotations),
// and the straight tangent step lands far from it. The quadratic through
// the previous converged state with the tangent slope at the current one
// follows that bend; it is kept only where its residual is the smaller, and
// only up to twice the span it was fitted over (a geometric ramp's
// threefold step extrapolates the bend too far).
void PathPlanner::prefer_curved(const PathState& state, double load_step, const Eigen::VectorXd& change,
                                std::optional<double> known_norm, Eigen::VectorXd& q) {
  constexpr double longest_extrapolation = 2.0;
  const PathPoint& current = state.current;
  const std::optional<PathPoint>& previous = state.previous;
  const double last_load_step = previous ? current.load_factor - previous->load_factor : 0.0;
  const double ratio = last_load_step != 0.0 ? load_step / last_load_step : 0.0;
  if (previous && ratio > 0.0 && ratio <= longest_extrapolation) {
    Eigen::VectorXd curved = q + (ratio * ratio) * (previous->q - current.q + change / ratio);
    const double target_load = current.load_factor + load_step;
    if (residual_norm_at(curved, target_load) < (known_norm ? *known_norm : residual_norm_at(q, target_load))) {
      q.swap(curved);
    }
  }
}

// Tangent predictor at the last converged state; false when it cannot be
// formed (the plan then starts from the last converged state).
bool PathPlanner::tangent_predictor(const PathState& state, double load_step, Eigen::VectorXd& q) {
  Eigen::VectorXd change;
  std::optional<double> norm_at_q;  // |R| at the predictor, where already evaluated
  if (!linearised_change(state, load_step, !factor_at_current_, change) ||
      !settle_touching_set(state, load_step, change, norm_at_q)) {
    return false;
  }
  q = state.current.q + change;
  prefer_curved(state, load_step, change, norm_at_q, q);
  return true;
}

Plan PathPlanner::plan(const PathState& state, double size) {
  Plan plan;
  const PathPoint& current = state.current;
  const std::optional<PathPoint>& previous = state.previous;
  if (options_.control != ControlMode::arc_length || !previous) {
    const double target = std::min(state.position + size, 1.0);
    plan.position = target;
    // The secant predictor: the last converged increment extrapolated.
    plan.q_predicted = current.q;
    plan.load_predicted = current.load_factor;
    if (previous && options_.predictor != Predictor::none && state.last_size > 0.0) {
      const double ratio = (target - state.position) / state.last_size;
      plan.q_predicted += ratio * (current.q - previous->q);
      plan.load_predicted += ratio * (current.load_factor - previous->load_factor);
    }
    if (options_.control == ControlMode::displacement) {
      const int i = options_.controlled_unknown;
      const double value = controlled_start_ + target * (options_.controlled_target - controlled_start_);
      plan.q_predicted(i) = value;
      PathEquation equation;
      equation.q_coefficients = Eigen::VectorXd::Zero(system_.size());
      equation.q_coefficients(i) = 1.0;
      equation.value = value;
      plan.path = std::move(equation);
    } else {
      // Load control (also the first arc-length increment).
      plan.load_predicted =
          std::min(target, options_.control == ControlMode::arc_length ? options_.load_factor_end : 1.0);
      if (options_.predictor == Predictor::tangent &&
          !tangent_predictor(state, plan.load_predicted - current.load_factor, plan.q_predicted)) {
        plan.q_predicted = current.q;
      }
    }
    return plan;
  }
  // Arc length: normal plane through the secant predictor in the scaled
  // space z = (q / q_scale, lambda).
  const double arc = size * std::sqrt(2.0);
  Eigen::VectorXd direction_q = (current.q - previous->q) / state.q_scale;
  double direction_load = current.load_factor - previous->load_factor;
  const double length = std::sqrt(direction_q.squaredNorm() + direction_load * direction_load);
  direction_q /= length;
  direction_load /= length;
  plan.q_predicted = current.q + (arc * state.q_scale) * direction_q;
  plan.load_predicted = current.load_factor + arc * direction_load;
  PathEquation equation;
  equation.q_coefficients = direction_q / state.q_scale;
  equation.load_coefficient = direction_load;
  equation.value = equation.q_coefficients.dot(current.q) + direction_load * current.load_factor + arc;
  plan.path = std::move(equation);
  plan.position = state.position + size;
  return plan;
}

}  // namespace plystrain::nonlinear::detail
