#include "newton_convergence.hpp"

#include <algorithm>
#include <limits>

namespace plystrain::nonlinear::detail {

ConvergenceMonitor::ConvergenceMonitor(const NewtonOptions& options, double start_norm, double reference_residual,
                                       double q_start_norm)
    : options_(options),
      residual_norm_(start_norm),
      previous_residual_norm_(start_norm),
      residual_reference_(std::max(start_norm, reference_residual)),
      residual_limit_(std::max(options.residual_tolerance * residual_reference_, options.residual_floor)),
      increment_rounding_(options.increment_rounding * q_start_norm),
      last_increment_(std::numeric_limits<double>::infinity()) {}

void ConvergenceMonitor::start_iteration() { history_.push_back(residual_norm_); }

ConvergenceMonitor::Test ConvergenceMonitor::test(int iteration, bool path_satisfied) const {
  // The next correction is estimated from the last one and the residual
  // contraction, so that a step that already solved the equations (a
  // linear problem) is recognised without one more solve.
  const double predicted_increment =
      last_increment_ * std::min(1.0, residual_norm_ / std::max(previous_residual_norm_, 1e-300));
  const bool increment_small =
      iteration > 0 && predicted_increment <= std::max({options_.increment_tolerance * increment_reference_,
                                                        options_.increment_floor, increment_rounding_});
  // Stalled: no longer contracting (rounding), tiny predicted correction.
  const bool stalled = increment_small && residual_norm_ > residual_limit_ &&
                       residual_norm_ >= 0.5 * previous_residual_norm_ &&
                       residual_norm_ <= options_.stalled_residual_tolerance * residual_reference_;
  Test result;
  result.converged = path_satisfied && ((residual_norm_ <= residual_limit_ && increment_small) || stalled ||
                                        residual_norm_ <= options_.residual_floor);
  result.stalled_at_rounding = result.converged && stalled;
  return result;
}

void ConvergenceMonitor::restart_equations(double residual_norm) {
  residual_norm_ = residual_norm;
  last_increment_ = std::numeric_limits<double>::infinity();
  // A contact that closes from a force-free state starts from nothing: the
  // new equations' own start residual is the scale, and the progress rule
  // starts over.
  residual_reference_ = std::max(residual_reference_, residual_norm);
  residual_limit_ = std::max(options_.residual_tolerance * residual_reference_, options_.residual_floor);
  history_.back() = residual_norm;
  equations_since_ = history_.size() - 1;
}

std::optional<std::pair<NewtonStatus, std::string>> ConvergenceMonitor::stop_reason(int iteration) const {
  if (iteration >= options_.max_iterations) {
    return std::pair{NewtonStatus::iteration_limit, "no convergence in " + std::to_string(options_.max_iterations) +
                                                        " iterations (residual " + std::to_string(residual_norm_) +
                                                        ")"};
  }
  // Not near rounding level, where halving is not to be expected. The
  // window counts only iterations on the current equations.
  const std::size_t window = static_cast<std::size_t>(std::max(options_.progress_window, 0));
  const std::size_t current = history_.size() - 1;
  if (window > 0 && current >= equations_since_ + window &&
      residual_norm_ > options_.stalled_residual_tolerance * residual_reference_ &&
      residual_norm_ > options_.progress_factor * history_[current - window]) {
    return std::pair{NewtonStatus::stagnated, "the residual fell only from " +
                                                  std::to_string(history_[current - window]) + " to " +
                                                  std::to_string(residual_norm_) + " in " +
                                                  std::to_string(options_.progress_window) + " iterations"};
  }
  if (residual_norm_ > options_.divergence_factor * residual_reference_) {
    return std::pair{NewtonStatus::diverged, "residual grew to " + std::to_string(residual_norm_) + " from " +
                                                 std::to_string(residual_reference_)};
  }
  return std::nullopt;
}

void ConvergenceMonitor::step_taken(int iteration, double increment, double residual_norm) {
  previous_residual_norm_ = residual_norm_;
  residual_norm_ = residual_norm;
  last_increment_ = increment;
  if (iteration == 0) {
    increment_reference_ = increment;
  }
}

}  // namespace plystrain::nonlinear::detail
