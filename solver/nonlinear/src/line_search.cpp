#include "line_search.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace plystrain::nonlinear::detail {

// Backtracking (Armijo) on |R|; see NewtonOptions. residual_at(a) evaluates
// the trial point and returns its residual norm (infinity on failure).
LineSearch search_residual_norm(double start_norm, double full_step_norm,
                                const std::function<double(double)>& residual_at, const NewtonOptions& options) {
  LineSearch search;
  double factor = 1.0;
  double trial_norm = full_step_norm;
  double accepted_factor = std::isfinite(full_step_norm) ? 1.0 : -1.0;  // smallest factor that could be evaluated
  while (trial_norm > (1.0 - options.sufficient_decrease * factor) * start_norm) {
    if (search.trials >= options.max_line_search_steps) {
      search.failed = true;
      break;
    }
    // Minimiser of the quadratic through f(0) = r^2/2, f'(0) = -r^2 and
    // f(a) = r_a^2/2, where f = |R|^2/2 and dq is the Newton direction.
    double next = 0.5 * factor;
    if (std::isfinite(trial_norm)) {
      const double r0 = start_norm * start_norm;
      const double ra = trial_norm * trial_norm;
      const double curvature = ra - r0 + 2.0 * r0 * factor;
      if (curvature > 0.0) {
        next = r0 * factor * factor / curvature;
      }
    }
    factor = std::clamp(next, 0.1 * factor, 0.5 * factor);
    trial_norm = residual_at(factor);
    ++search.trials;
    if (std::isfinite(trial_norm)) {
      accepted_factor = factor;
    }
  }
  search.smallest_tried = factor;
  // When nothing passed, keep the smallest factor that could be evaluated.
  search.factor = search.failed ? std::max(accepted_factor, 0.0) : factor;
  return search;
}

// Root of the energy's slope s(a) = dq . R(q + a dq) on [0, 1]; see
// NewtonOptions::line_search_merit. slope_at(a) evaluates the trial point
// and returns s(a), or nothing when it cannot be evaluated (an inverted
// element: the step went too far).
LineSearch search_energy_slope(double slope_at_start, std::optional<double> full_step_slope,
                               const std::function<std::optional<double>(double)>& slope_at,
                               const NewtonOptions& options) {
  LineSearch search;
  const double target = options.slope_tolerance * std::abs(slope_at_start);
  if (full_step_slope && *full_step_slope <= target) {
    // Still falling at the full step, or close enough to the minimum: no
    // extrapolation beyond the step Newton proposed.
    return search;
  }
  // The bracket: the energy falls at low (s < 0) and rises beyond high.
  double low = 0.0;
  double slope_low = slope_at_start;
  double high = 1.0;
  std::optional<double> slope_high = full_step_slope;
  double smallest_evaluated = full_step_slope ? 1.0 : 0.0;
  int side = 0;  // which end moved last (the Illinois modification of regula falsi)
  while (search.trials < options.max_line_search_steps) {
    double factor = slope_high ? (low * *slope_high - high * slope_low) / (*slope_high - slope_low)
                               : 0.5 * (low + high);
    // Keep every trial well inside the bracket, so that it shrinks.
    const double margin = 0.1 * (high - low);
    factor = std::clamp(factor, low + margin, high - margin);
    const std::optional<double> slope = slope_at(factor);
    ++search.trials;
    search.smallest_tried = std::min(search.smallest_tried, factor);
    if (slope) {
      smallest_evaluated = smallest_evaluated > 0.0 ? std::min(smallest_evaluated, factor) : factor;
    }
    if (slope && std::abs(*slope) <= target) {
      search.factor = factor;
      return search;
    }
    if (slope && *slope < 0.0) {
      low = factor;
      slope_low = *slope;
      if (side == -1 && slope_high) {
        *slope_high *= 0.5;
      }
      side = -1;
    } else {
      high = factor;
      slope_high = slope;  // nothing when it could not be evaluated: bisect
      if (side == 1) {
        slope_low *= 0.5;
      }
      side = 1;
    }
  }
  // No factor met the tolerance: the last point known to lie where the
  // energy still falls, else the smallest that could be evaluated.
  search.failed = true;
  search.factor = low > 0.0 ? low : smallest_evaluated;
  return search;
}

}  // namespace plystrain::nonlinear::detail
