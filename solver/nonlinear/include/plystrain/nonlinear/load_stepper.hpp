// Incremental solution along a load path: the load factor (or a chosen
// displacement, or the arc length) goes from the start state to the end in
// increments; each increment is solved by Newton. A failed increment is cut
// back from the last converged state; easy increments let it grow again.
//
// Every converged increment is kept (and handed to a callback as it
// arrives); numerical trouble ends the path with a status and a reason, never
// an exception past a converged increment.
#pragma once

#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/nonlinear/newton.hpp"
#include "plystrain/nonlinear/nonlinear_system.hpp"

#include <Eigen/Core>

#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace plystrain::nonlinear {

enum class ControlMode {
  // lambda goes from 0 to 1.
  load_factor,
  // One unknown q_i goes linearly from q_start(i) to controlled_target while
  // lambda is solved for: passes load maxima where q_i keeps increasing.
  displacement,
  // Arc length in the scaled space (q / q_scale, lambda) with a normal-plane
  // constraint (Riks 1979, Int. J. Solids Struct. 15, 529; Crisfield,
  // Non-linear Finite Element Analysis of Solids and Structures, 1991):
  // passes load maxima and snap-backs. The first increment is load-controlled;
  // it fixes q_scale = |dq|/dlambda, so the path starts at 45 degrees. The
  // path ends when lambda crosses load_factor_end, with a final
  // load-controlled solve exactly there.
  arc_length,
};

enum class Predictor {
  none,    // start each increment from the last converged state
  secant,  // extrapolate the last two converged states (falls back to none if that start cannot be evaluated)
  // Load control only: q_n - K^-1 (R + dR/dlambda dlambda) at the last
  // converged state (one extra factorization per increment). Spreads a
  // prescribed boundary motion over the body, where starting from q_n would
  // fold the elements along the moved boundary. Other modes use secant.
  tangent,
};

// Increment sizes are fractions of the path: of lambda in [0, 1] (load
// control), of the controlled displacement's travel (displacement control),
// or arc length / sqrt(2) in the scaled space (arc-length control, so that
// the first increment has the same size in every mode).
struct LoadStepperOptions {
  ControlMode control = ControlMode::load_factor;
  int steps = 10;          // first increment = 1 / steps
  int max_steps = 1000;    // limit on converged increments
  double min_increment = 1e-6;
  double max_increment = 1.0;
  double cutback_factor = 0.5;
  double growth_factor = 1.5;
  int easy_iterations = 4;  // grow after increments that converged within this many Newton steps
  // For delicate starts: the first increment is ramp_first_fraction, growing
  // by ramp_growth_factor after easy increments until it reaches 1 / steps.
  bool geometric_ramp = false;
  double ramp_first_fraction = 1e-5;
  double ramp_growth_factor = 3.0;
  Predictor predictor = Predictor::secant;

  int controlled_unknown = -1;     // displacement control: index into q
  double controlled_target = 0.0;  // displacement control: q_i at the end

  double load_factor_end = 1.0;    // arc-length control: where the path ends

  bool keep_states = true;  // store q for every converged increment
  NewtonOptions newton;
};

struct ConvergedIncrement {
  int index = 0;                // 1-based
  double load_factor = 0.0;
  double path_position = 0.0;   // fraction of the path reached (arc length / sqrt(2) for arc-length control)
  double increment = 0.0;       // size of this increment, same measure
  Eigen::VectorXd q;            // empty unless keep_states
  int newton_iterations = 0;    // linear solves in this increment
  double residual_norm = 0.0;
  // From the last factorization of the increment (close to the converged
  // state): inertia when known, sign of det K.
  std::optional<int> negative_pivots;
  int determinant_sign = 0;
};

struct FailedAttempt {
  int attempt = 0;              // 1-based count of all attempts
  double increment = 0.0;       // the size that failed
  double next_increment = 0.0;  // the size tried next (below min_increment: the path stops)
  NewtonStatus status = NewtonStatus::iteration_limit;
  std::string detail;
};

enum class PathStatus {
  completed,
  increment_too_small,  // cut back below min_increment
  step_limit,           // max_steps converged increments without reaching the end
  stopped_by_caller,
  exception,            // the system threw; the converged increments are kept
};

[[nodiscard]] const char* status_name(PathStatus status);

struct LoadPathResult {
  PathStatus status = PathStatus::completed;
  std::string reason;
  std::vector<ConvergedIncrement> increments;  // the start state is not included
  Eigen::VectorXd q;                           // last converged state (the start if none)
  double load_factor = 0.0;
  double path_position = 0.0;
  int attempts = 0;
  int failed_attempts = 0;
  int newton_iterations = 0;
  std::optional<NewtonResult> last_failure;  // the last failed Newton solve (q dropped)

  [[nodiscard]] bool completed() const { return status == PathStatus::completed; }
};

struct LoadStepperCallbacks {
  // After each converged increment (and NonlinearSystem::accept_increment);
  // return false to stop the path there.
  std::function<bool(const ConvergedIncrement&)> on_increment;
  // Each Newton iteration: the attempt count and the record.
  std::function<void(int attempt, const NewtonIterationRecord&)> on_iteration;
  std::function<void(const FailedAttempt&)> on_failure;
};

// Starts from q_start at load factor 0.
[[nodiscard]] LoadPathResult solve_load_path(NonlinearSystem& system, LinearSolver& linear_solver,
                                             const Eigen::VectorXd& q_start, const LoadStepperOptions& options,
                                             const LoadStepperCallbacks& callbacks = {});

}  // namespace plystrain::nonlinear
