// Line searches along a Newton step dq, behind solve_newton: on the
// residual norm (any system) or on the energy's slope (systems whose
// residual is an energy's gradient); NewtonOptions documents both.
#pragma once

#include "plystrain/nonlinear/newton.hpp"

#include <functional>
#include <optional>

namespace plystrain::nonlinear::detail {

// The outcome of a line search along a Newton step dq: the factor a taken
// (0 when no trial point could be evaluated), the evaluations beyond the
// full step, and whether no factor met the search's condition.
struct LineSearch {
  double factor = 1.0;
  int trials = 0;
  bool failed = false;
  double smallest_tried = 1.0;
};

// Backtracking (Armijo) on |R|; see NewtonOptions. residual_at(a) evaluates
// the trial point and returns its residual norm (infinity on failure).
LineSearch search_residual_norm(double start_norm, double full_step_norm,
                                const std::function<double(double)>& residual_at, const NewtonOptions& options);

// Root of the energy's slope s(a) = dq . R(q + a dq) on [0, 1]. slope_at(a)
// evaluates the trial point and returns s(a), or nothing when it cannot be
// evaluated (an inverted element: the step went too far).
LineSearch search_energy_slope(double slope_at_start, std::optional<double> full_step_slope,
                               const std::function<std::optional<double>(double)>& slope_at,
                               const NewtonOptions& options);

}  // namespace plystrain::nonlinear::detail
