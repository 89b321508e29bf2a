#include "plystrain/nonlinear/newton.hpp"

#include "line_search.hpp"
#include "newton_convergence.hpp"
#include "stopwatch.hpp"

#include <cmath>
#include <limits>
#include <optional>
#include <string>
#include <utility>

namespace plystrain::nonlinear {

namespace {

using Failure = std::pair<NewtonStatus, std::string>;

// The norm used by the merit function; a failed evaluation is "infinitely bad".
double residual_norm_or_infinity(const Evaluation& evaluation, const Eigen::VectorXd& residual) {
  if (!evaluation.ok()) {
    return std::numeric_limits<double>::infinity();
  }
  const double norm = residual.norm();
  return std::isfinite(norm) ? norm : std::numeric_limits<double>::infinity();
}

bool path_satisfied(const PathEquation* path, const Eigen::VectorXd& q, double load_factor) {
  return path == nullptr ||
         std::abs(path->residual(q, load_factor)) <=
             1e-10 * (std::abs(path->q_coefficients.dot(q)) + std::abs(path->load_coefficient * load_factor) +
                      std::abs(path->value)) + 1e-14;
}

// One Newton solve: the iterate, its residual and tangent, the trial point of
// the line search, and the record of the iteration under way.
class NewtonIteration {
 public:
  NewtonIteration(NonlinearSystem& system, LinearSolver& linear_solver, const NewtonOptions& options,
                  const PathEquation* path, NewtonResult& result)
      : system_(system), linear_solver_(linear_solver), options_(options), path_(path), result_(result) {
    const int n = system.size();
    residual_.resize(n);
    trial_residual_.resize(n);
    load_step_.resize(n);
    load_column_.resize(n);
    path_step_.resize(n);
    step_.resize(n);
    trial_q_.resize(n);
  }

  // Residual and tangent at the start point; its residual norm.
  std::optional<Failure> start(double& residual_norm) {
    const detail::Stopwatch start;
    const Evaluation evaluation = system_.evaluate(result_.q, result_.load_factor, residual_, &tangent_);
    record_.assemble_seconds = start.seconds();
    if (!evaluation.ok()) {
      return Failure{NewtonStatus::evaluation_failed,
                     std::string(status_name(evaluation.status)) + " at the start point: " + evaluation.detail};
    }
    residual_norm = residual_.norm();
    if (!std::isfinite(residual_norm)) {
      return Failure{NewtonStatus::non_finite, "non-finite residual at the start point"};
    }
    return std::nullopt;
  }

  NewtonIterationRecord& record() { return record_; }

  // After convergence: a system with active sets may change its set; the
  // new residual norm when it did.
  std::optional<double> update_active_set(std::optional<Failure>& failure) {
    if (!system_.update_active_set(result_.q, result_.load_factor)) {
      return std::nullopt;
    }
    ++result_.active_set_updates;
    const detail::Stopwatch start;
    const Evaluation evaluation = system_.evaluate(result_.q, result_.load_factor, residual_, &tangent_);
    record_.assemble_seconds += start.seconds();
    if (!evaluation.ok()) {
      failure = Failure{NewtonStatus::evaluation_failed, std::string(status_name(evaluation.status)) +
                                                             " after an active-set update: " + evaluation.detail};
    }
    return residual_.norm();
  }

  // The linearised step dq (and d lambda on a path) from the factorized
  // tangent; the bordered system by block elimination:
  //   [K  R_l] [dq]    [R]
  //   [c' l  ] [dl] = -[g],   dq = a + dl b,  a = -K^-1 R,  b = -K^-1 R_l.
  std::optional<Failure> linearised_step() {
    result_.last_factorization = linear_solver_.factorize(tangent_, options_.symmetry);
    const FactorizationReport& factorization = result_.last_factorization;
    record_.analyse_seconds = factorization.analyse_seconds;
    record_.factorize_seconds = factorization.factorize_seconds;
    record_.method = factorization.method;
    record_.not_positive_definite = factorization.not_positive_definite;
    record_.negative_pivots = factorization.negative_pivots;
    if (!factorization.ok()) {
      return Failure{NewtonStatus::factorization_failed,
                     std::string(status_name(factorization.status)) + ": " + factorization.detail};
    }
    SolveReport solved = linear_solver_.solve(-residual_, load_step_);
    record_.solve_seconds = solved.seconds;
    if (!solved.ok) {
      return Failure{NewtonStatus::solve_failed, solved.detail};
    }
    load_change_ = 0.0;
    if (path_ == nullptr) {
      step_ = load_step_;
      return finite_step();
    }
    const detail::Stopwatch start;
    const Evaluation evaluation = system_.load_derivative(result_.q, result_.load_factor, load_column_);
    record_.assemble_seconds += start.seconds();
    if (!evaluation.ok()) {
      return Failure{NewtonStatus::evaluation_failed,
                     std::string("load derivative: ") + status_name(evaluation.status) + ": " + evaluation.detail};
    }
    solved = linear_solver_.solve(-load_column_, path_step_);
    record_.solve_seconds += solved.seconds;
    if (!solved.ok) {
      return Failure{NewtonStatus::solve_failed, solved.detail};
    }
    const double denominator = path_->q_coefficients.dot(path_step_) + path_->load_coefficient;
    const double numerator =
        -(path_->residual(result_.q, result_.load_factor) + path_->q_coefficients.dot(load_step_));
    load_change_ = numerator / denominator;
    if (!std::isfinite(load_change_) || denominator == 0.0) {
      return Failure{NewtonStatus::singular_path_equation,
                     "the path equation is tangent to the solution path (denominator " +
                         std::to_string(denominator) + ")"};
    }
    step_.noalias() = load_step_ + load_change_ * path_step_;
    return finite_step();
  }

  // The full step first, with the tangent: when it is accepted (the usual
  // case) no evaluation is wasted; otherwise the line search's factor, and
  // the tangent there. Moves the iterate; residual_norm is |R| at the start.
  std::optional<Failure> search_and_move(double residual_norm) {
    factor_ = 1.0;
    trial_q_.noalias() = result_.q + step_;
    trial_load_ = result_.load_factor + load_change_;
    detail::Stopwatch start;
    trial_evaluation_ = system_.evaluate(trial_q_, trial_load_, trial_residual_, &tangent_);
    record_.assemble_seconds += start.seconds();
    bool tangent_current = trial_evaluation_.ok();
    if (options_.line_search) {
      if (std::optional<Failure> failure = line_search(residual_norm, tangent_current)) {
        return failure;
      }
    } else if (!trial_evaluation_.ok()) {
      return Failure{NewtonStatus::evaluation_failed,
                     std::string(status_name(trial_evaluation_.status)) + ": " + trial_evaluation_.detail};
    }
    if (!tangent_current) {
      start = detail::Stopwatch{};
      const Evaluation evaluation = system_.evaluate(trial_q_, trial_load_, trial_residual_, &tangent_);
      record_.assemble_seconds += start.seconds();
      if (!evaluation.ok()) {
        return Failure{NewtonStatus::evaluation_failed,
                       std::string(status_name(evaluation.status)) + ": " + evaluation.detail};
      }
    }
    record_.line_search_factor = factor_;
    record_.increment_norm = factor_ * step_norm_;
    record_.load_factor_change = factor_ * load_change_;
    result_.q.swap(trial_q_);
    result_.load_factor = trial_load_;
    residual_.swap(trial_residual_);
    return std::nullopt;
  }

  [[nodiscard]] double residual_norm() const { return residual_.norm(); }
  [[nodiscard]] double increment() const { return factor_ * step_norm_; }

 private:
  std::optional<Failure> finite_step() {
    step_norm_ = step_.norm();
    if (!std::isfinite(step_norm_)) {
      return Failure{NewtonStatus::non_finite, "non-finite Newton step"};
    }
    return std::nullopt;
  }

  // Residual only, at the trial point of factor a.
  bool evaluate_trial(double trial_factor) {
    trial_q_.noalias() = result_.q + trial_factor * step_;
    trial_load_ = result_.load_factor + trial_factor * load_change_;
    const detail::Stopwatch start;
    trial_evaluation_ = system_.evaluate(trial_q_, trial_load_, trial_residual_, nullptr);
    record_.assemble_seconds += start.seconds();
    return trial_evaluation_.ok();
  }

  std::optional<Failure> line_search(double residual_norm, bool& tangent_current) {
    // The energy's slope along the step; for load-controlled steps only (a
    // load-factor change does no work that this slope would see).
    const double slope_at_start = step_.dot(residual_);
    const bool by_energy_slope = options_.line_search_merit == LineSearchMerit::energy_slope &&
                                 path_ == nullptr && slope_at_start < 0.0;
    const detail::LineSearch search =
        by_energy_slope
            ? detail::search_energy_slope(
                  slope_at_start, trial_evaluation_.ok() ? std::optional(step_.dot(trial_residual_)) : std::nullopt,
                  [&](double trial_factor) {
                    return evaluate_trial(trial_factor) ? std::optional(step_.dot(trial_residual_)) : std::nullopt;
                  },
                  options_)
            : detail::search_residual_norm(residual_norm,
                                           residual_norm_or_infinity(trial_evaluation_, trial_residual_),
                                           [&](double trial_factor) {
                                             evaluate_trial(trial_factor);
                                             return residual_norm_or_infinity(trial_evaluation_, trial_residual_);
                                           },
                                           options_);
    record_.line_search_evaluations = search.trials;
    record_.line_search_failed = search.failed;
    if (search.factor <= 0.0) {
      record_.line_search_factor = search.smallest_tried;
      return Failure{NewtonStatus::evaluation_failed, std::string(status_name(trial_evaluation_.status)) +
                                                          " at every line-search point: " + trial_evaluation_.detail};
    }
    if (search.trials > 0) {
      factor_ = search.factor;
      trial_q_.noalias() = result_.q + factor_ * step_;
      trial_load_ = result_.load_factor + factor_ * load_change_;
      tangent_current = false;
    }
    return std::nullopt;
  }

  NonlinearSystem& system_;
  LinearSolver& linear_solver_;
  const NewtonOptions& options_;
  const PathEquation* path_;
  NewtonResult& result_;
  NewtonIterationRecord record_;

  Eigen::VectorXd residual_;
  SparseMatrix tangent_;
  Eigen::VectorXd load_step_;    // K^-1 (-R)
  Eigen::VectorXd load_column_;  // dR/dlambda
  Eigen::VectorXd path_step_;    // K^-1 (-dR/dlambda)
  Eigen::VectorXd step_;
  double step_norm_ = 0.0;
  double load_change_ = 0.0;
  double factor_ = 1.0;
  Eigen::VectorXd trial_q_;
  Eigen::VectorXd trial_residual_;
  double trial_load_ = 0.0;
  Evaluation trial_evaluation_;
};

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
  NewtonIteration newton(system, linear_solver, options, path, result);
  const auto stop = [&](const Failure& failure, bool with_record) {
    if (with_record) {
      result.iterations.push_back(newton.record());
    }
    result.status = failure.first;
    result.detail = failure.second;
    return result;
  };

  double start_norm = 0.0;
  if (std::optional<Failure> failure = newton.start(start_norm)) {
    return stop(*failure, false);
  }
  detail::ConvergenceMonitor monitor(options, start_norm, reference_residual, q_start.norm());
  for (int iteration = 0;; ++iteration) {
    monitor.start_iteration();
    NewtonIterationRecord& record = newton.record();
    record.iteration = iteration;
    record.residual_norm = monitor.residual_norm();
    record.load_factor = result.load_factor;
    result.residual_norm = monitor.residual_norm();

    const detail::ConvergenceMonitor::Test test =
        monitor.test(iteration, path_satisfied(path, result.q, result.load_factor));
    result.stalled_at_rounding = test.stalled_at_rounding;
    if (test.converged) {
      std::optional<Failure> failure;
      const std::optional<double> new_norm = newton.update_active_set(failure);
      if (failure) {
        return stop(*failure, true);
      }
      if (!new_norm) {
        result.iterations.push_back(record);
        if (on_iteration) {
          on_iteration(record);
        }
        result.status = NewtonStatus::converged;
        return result;
      }
      // The active set changed: the same load, new equations.
      monitor.restart_equations(*new_norm);
      record.residual_norm = *new_norm;
      result.residual_norm = *new_norm;
    }
    if (std::optional<Failure> failure = monitor.stop_reason(iteration)) {
      return stop(*failure, true);
    }
    if (std::optional<Failure> failure = newton.linearised_step()) {
      return stop(*failure, true);
    }
    if (std::optional<Failure> failure = newton.search_and_move(monitor.residual_norm())) {
      return stop(*failure, true);
    }
    result.iterations.push_back(record);
    if (on_iteration) {
      on_iteration(record);
    }
    const double residual_norm = newton.residual_norm();
    if (!std::isfinite(residual_norm)) {
      return stop({NewtonStatus::non_finite, "non-finite residual after iteration " + std::to_string(iteration)},
                  false);
    }
    monitor.step_taken(iteration, newton.increment(), residual_norm);
    record = NewtonIterationRecord{};
  }
}

}  // namespace plystrain::nonlinear
