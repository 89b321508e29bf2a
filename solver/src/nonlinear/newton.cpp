#include "plystrain/solver/newton.hpp"

#include <algorithm>
#include <chrono>
#include <functional>
#include <optional>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

namespace plystrain::solver {

namespace {

using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point start) {
  return std::chrono::duration<double>(Clock::now() - start).count();
}

constexpr double infinity = std::numeric_limits<double>::infinity();

// The norm used by the merit function; a failed evaluation is "infinitely bad".
double residual_norm_or_infinity(const Evaluation& evaluation, const Eigen::VectorXd& residual) {
  if (!evaluation.ok()) {
    return infinity;
  }
  const double norm = residual.norm();
  return std::isfinite(norm) ? norm : infinity;
}


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


}  // namespace

const char* status_name(NewtonStatus status) {
  switch (status) {
    case NewtonStatus::converged: return "converged";
    case NewtonStatus::evaluation_failed: return "evaluation failed";
    case NewtonStatus::factorization_failed: return "factorization failed";
    case NewtonStatus::solve_failed: return "linear solve failed";
    case NewtonStatus::non_finite: return "non-finite residual or step";
    case NewtonStatus::iteration_limit: return "iteration limit reached";
    case NewtonStatus::stagnated: return "no progress";
    case NewtonStatus::diverged: return "diverged";
    case NewtonStatus::singular_path_equation: return "singular path equation";
  }
  return "unknown";
}

NewtonResult solve_newton(NonlinearSystem& system, LinearSolver& linear_solver, const Eigen::VectorXd& q_start,
                          double load_factor, const NewtonOptions& options, const PathEquation* path,
                          double reference_residual, const NewtonIterationCallback& on_iteration) {
  NewtonResult result;
  result.q = q_start;
  result.load_factor = load_factor;
  const int n = system.size();

  Eigen::VectorXd residual(n);
  Eigen::VectorXd trial_residual(n);
  SparseMatrix tangent;
  Eigen::VectorXd load_step(n);    // K^-1 (-R)
  Eigen::VectorXd load_column(n);  // dR/dlambda
  Eigen::VectorXd path_step(n);    // K^-1 (-dR/dlambda)
  Eigen::VectorXd step(n);
  Eigen::VectorXd trial_q(n);

  auto fail = [&](NewtonStatus status, std::string detail) {
    result.status = status;
    result.detail = std::move(detail);
    return result;
  };

  NewtonIterationRecord record;
  auto start = Clock::now();
  Evaluation evaluation = system.evaluate(result.q, result.load_factor, residual, &tangent);
  record.assemble_seconds = seconds_since(start);
  if (!evaluation.ok()) {
    return fail(NewtonStatus::evaluation_failed,
                std::string(status_name(evaluation.status)) + " at the start point: " + evaluation.detail);
  }
  double residual_norm = residual.norm();
  if (!std::isfinite(residual_norm)) {
    return fail(NewtonStatus::non_finite, "non-finite residual at the start point");
  }
  double residual_reference = std::max(residual_norm, reference_residual);
  double residual_limit = std::max(options.residual_tolerance * residual_reference, options.residual_floor);
  double increment_reference = 0.0;
  // From a good predictor the first correction is already tiny, and a test
  // relative to it alone would ask for corrections below the rounding of q.
  const double increment_rounding = options.increment_rounding * q_start.norm();
  double last_increment = infinity;
  double previous_residual_norm = residual_norm;

  std::vector<double> history;  // residual norm at the start of each iteration
  std::size_t equations_since = 0;  // index in history of the first iteration on the current equations
  for (int iteration = 0;; ++iteration) {
    history.push_back(residual_norm);
    record.iteration = iteration;
    record.residual_norm = residual_norm;
    record.load_factor = result.load_factor;
    result.residual_norm = residual_norm;

    const bool path_satisfied =
        path == nullptr ||
        std::abs(path->residual(result.q, result.load_factor)) <=
            1e-10 * (std::abs(path->q_coefficients.dot(result.q)) + std::abs(path->load_coefficient * result.load_factor) +
                     std::abs(path->value)) + 1e-14;
    // The next correction is estimated from the last one and the residual
    // contraction, so that a step that already solved the equations (a
    // linear problem) is recognised without one more solve.
    const double predicted_increment =
        last_increment * std::min(1.0, residual_norm / std::max(previous_residual_norm, 1e-300));
    const bool increment_small =
        iteration > 0 &&
        predicted_increment <= std::max({options.increment_tolerance * increment_reference, options.increment_floor,
                                         increment_rounding});
    // Stalled: no longer contracting (rounding), tiny predicted correction.
    const bool stalled = increment_small && residual_norm > residual_limit &&
                         residual_norm >= 0.5 * previous_residual_norm &&
                         residual_norm <= options.stalled_residual_tolerance * residual_reference;
    const bool converged = path_satisfied && ((residual_norm <= residual_limit && increment_small) || stalled ||
                                              residual_norm <= options.residual_floor);
    result.stalled_at_rounding = converged && stalled;
    if (converged) {
      if (system.update_active_set(result.q, result.load_factor)) {
        // The active set changed: the same load, new equations.
        ++result.active_set_updates;
        start = Clock::now();
        evaluation = system.evaluate(result.q, result.load_factor, residual, &tangent);
        record.assemble_seconds += seconds_since(start);
        if (!evaluation.ok()) {
          result.iterations.push_back(record);
          return fail(NewtonStatus::evaluation_failed,
                      std::string(status_name(evaluation.status)) + " after an active-set update: " + evaluation.detail);
        }
        residual_norm = residual.norm();
        last_increment = infinity;
        record.residual_norm = residual_norm;
        result.residual_norm = residual_norm;
        // New equations: their own start residual is the scale (a contact
        // that closes from a force-free state starts from nothing), and the
        // progress rule starts over.
        residual_reference = std::max(residual_reference, residual_norm);
        residual_limit = std::max(options.residual_tolerance * residual_reference, options.residual_floor);
        history.back() = residual_norm;
        equations_since = history.size() - 1;
      } else {
        result.iterations.push_back(record);
        if (on_iteration) {
          on_iteration(record);
        }
        result.status = NewtonStatus::converged;
        return result;
      }
    }
    if (iteration >= options.max_iterations) {
      result.iterations.push_back(record);
      return fail(NewtonStatus::iteration_limit, "no convergence in " + std::to_string(options.max_iterations) +
                                                     " iterations (residual " + std::to_string(residual_norm) + ")");
    }
    // Not near rounding level, where halving is not to be expected.
    // The window counts only iterations on the current equations.
    const std::size_t window = static_cast<std::size_t>(std::max(options.progress_window, 0));
    const std::size_t current = history.size() - 1;
    if (window > 0 && current >= equations_since + window &&
        residual_norm > options.stalled_residual_tolerance * residual_reference &&
        residual_norm > options.progress_factor * history[current - window]) {
      result.iterations.push_back(record);
      return fail(NewtonStatus::stagnated,
                  "the residual fell only from " + std::to_string(history[current - window]) +
                      " to " + std::to_string(residual_norm) + " in " + std::to_string(options.progress_window) +
                      " iterations");
    }
    if (residual_norm > options.divergence_factor * residual_reference) {
      result.iterations.push_back(record);
      return fail(NewtonStatus::diverged, "residual grew to " + std::to_string(residual_norm) + " from " +
                                              std::to_string(residual_reference));
    }

    // Linearised step.
    result.last_factorization = linear_solver.factorize(tangent, options.symmetry);
    const FactorizationReport& factorization = result.last_factorization;
    record.analyse_seconds = factorization.analyse_seconds;
    record.factorize_seconds = factorization.factorize_seconds;
    record.method = factorization.method;
    record.not_positive_definite = factorization.not_positive_definite;
    record.negative_pivots = factorization.negative_pivots;
    if (!factorization.ok()) {
      result.iterations.push_back(record);
      return fail(NewtonStatus::factorization_failed,
                  std::string(status_name(factorization.status)) + ": " + factorization.detail);
    }
    SolveReport solved = linear_solver.solve(-residual, load_step);
    record.solve_seconds = solved.seconds;
    if (!solved.ok) {
      result.iterations.push_back(record);
      return fail(NewtonStatus::solve_failed, solved.detail);
    }
    double load_change = 0.0;
    if (path != nullptr) {
      start = Clock::now();
      evaluation = system.load_derivative(result.q, result.load_factor, load_column);
      record.assemble_seconds += seconds_since(start);
      if (!evaluation.ok()) {
        result.iterations.push_back(record);
        return fail(NewtonStatus::evaluation_failed,
                    std::string("load derivative: ") + status_name(evaluation.status) + ": " + evaluation.detail);
      }
      solved = linear_solver.solve(-load_column, path_step);
      record.solve_seconds += solved.seconds;
      if (!solved.ok) {
        result.iterations.push_back(record);
        return fail(NewtonStatus::solve_failed, solved.detail);
      }
      // Block elimination of the bordered system
      //   [K  R_l] [dq]    [R]
      //   [c' l  ] [dl] = -[g],   dq = a + dl b,  a = -K^-1 R,  b = -K^-1 R_l.
      const double denominator = path->q_coefficients.dot(path_step) + path->load_coefficient;
      const double numerator = -(path->residual(result.q, result.load_factor) + path->q_coefficients.dot(load_step));
      load_change = numerator / denominator;
      if (!std::isfinite(load_change) || denominator == 0.0) {
        result.iterations.push_back(record);
        return fail(NewtonStatus::singular_path_equation,
                    "the path equation is tangent to the solution path (denominator " + std::to_string(denominator) + ")");
      }
      step.noalias() = load_step + load_change * path_step;
    } else {
      step = load_step;
    }
    const double step_norm = step.norm();
    if (!std::isfinite(step_norm)) {
      result.iterations.push_back(record);
      return fail(NewtonStatus::non_finite, "non-finite Newton step");
    }

    // Full step first, with the tangent: when it is accepted (the usual case)
    // no evaluation is wasted.
    double factor = 1.0;
    trial_q.noalias() = result.q + step;
    double trial_load = result.load_factor + load_change;
    start = Clock::now();
    Evaluation trial_evaluation = system.evaluate(trial_q, trial_load, trial_residual, &tangent);
    record.assemble_seconds += seconds_since(start);
    double trial_norm = residual_norm_or_infinity(trial_evaluation, trial_residual);
    bool tangent_current = trial_evaluation.ok();

    if (options.line_search) {
      // A trial point: residual only, into trial_q / trial_load / trial_residual.
      const auto evaluate_trial = [&](double trial_factor) {
        trial_q.noalias() = result.q + trial_factor * step;
        trial_load = result.load_factor + trial_factor * load_change;
        start = Clock::now();
        trial_evaluation = system.evaluate(trial_q, trial_load, trial_residual, nullptr);
        record.assemble_seconds += seconds_since(start);
        return trial_evaluation.ok();
      };
      // The energy's slope along the step; for load-controlled steps only
      // (a load-factor change does no work that this slope would see).
      const double slope_at_start = step.dot(residual);
      const bool by_energy_slope = options.line_search_merit == LineSearchMerit::energy_slope &&
                                   path == nullptr && slope_at_start < 0.0;
      const LineSearch search =
          by_energy_slope
              ? search_energy_slope(
                    slope_at_start, trial_evaluation.ok() ? std::optional(step.dot(trial_residual)) : std::nullopt,
                    [&](double trial_factor) {
                      return evaluate_trial(trial_factor) ? std::optional(step.dot(trial_residual)) : std::nullopt;
                    },
                    options)
              : search_residual_norm(residual_norm, trial_norm,
                                     [&](double trial_factor) {
                                       evaluate_trial(trial_factor);
                                       return residual_norm_or_infinity(trial_evaluation, trial_residual);
                                     },
                                     options);
      record.line_search_evaluations = search.trials;
      record.line_search_failed = search.failed;
      if (search.factor <= 0.0) {
        record.line_search_factor = search.smallest_tried;
        result.iterations.push_back(record);
        return fail(NewtonStatus::evaluation_failed, std::string(status_name(trial_evaluation.status)) +
                                                         " at every line-search point: " + trial_evaluation.detail);
      }
      if (search.trials > 0) {
        factor = search.factor;
        trial_q.noalias() = result.q + factor * step;
        trial_load = result.load_factor + factor * load_change;
        tangent_current = false;
      }
    } else if (!trial_evaluation.ok()) {
      result.iterations.push_back(record);
      return fail(NewtonStatus::evaluation_failed,
                  std::string(status_name(trial_evaluation.status)) + ": " + trial_evaluation.detail);
    }

    if (!tangent_current) {
      start = Clock::now();
      evaluation = system.evaluate(trial_q, trial_load, trial_residual, &tangent);
      record.assemble_seconds += seconds_since(start);
      if (!evaluation.ok()) {
        result.iterations.push_back(record);
        return fail(NewtonStatus::evaluation_failed,
                    std::string(status_name(evaluation.status)) + ": " + evaluation.detail);
      }
    }

    record.line_search_factor = factor;
    record.increment_norm = factor * step_norm;
    record.load_factor_change = factor * load_change;
    result.iterations.push_back(record);
    if (on_iteration) {
      on_iteration(record);
    }

    result.q.swap(trial_q);
    result.load_factor = trial_load;
    residual.swap(trial_residual);
    previous_residual_norm = residual_norm;
    residual_norm = residual.norm();
    if (!std::isfinite(residual_norm)) {
      return fail(NewtonStatus::non_finite, "non-finite residual after iteration " + std::to_string(iteration));
    }
    last_increment = factor * step_norm;
    if (iteration == 0) {
      increment_reference = last_increment;
    }
    record = NewtonIterationRecord{};
  }
}

}  // namespace plystrain::solver
