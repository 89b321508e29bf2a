// The plan of each attempt along a load path: where Newton starts (the
// predictor) and what it holds fixed (the load factor, a displacement or an
// arc-length equation).
#pragma once

#include "plystrain/nonlinear/load_stepper.hpp"

#include <Eigen/Core>

#include <optional>

namespace plystrain::nonlinear::detail {

struct PathPoint {
  Eigen::VectorXd q;
  double load_factor = 0.0;
};

// Where the path stands: the last two converged states and how far along.
struct PathState {
  PathPoint current;
  std::optional<PathPoint> previous;
  double position = 0.0;   // fraction of the path reached
  double last_size = 0.0;  // size of the last converged increment
  double q_scale = 1.0;    // arc-length scaling of q, set after the first increment
};

// One planned Newton solve: where it starts and what it holds fixed.
struct Plan {
  Eigen::VectorXd q_predicted;
  double load_predicted = 0.0;
  std::optional<PathEquation> path;  // empty: load control at load_predicted
  double position = 0.0;             // path position reached if it converges
};

class PathPlanner {
 public:
  PathPlanner(NonlinearSystem& system, LinearSolver& linear_solver, const LoadStepperOptions& options,
              double controlled_start);

  // The next attempt of `size` from `state`.
  [[nodiscard]] Plan plan(const PathState& state, double size);

  // Whether the linear solver holds the factorization of the tangent at the
  // converged state (that of Newton's last iterate, within the Newton
  // tolerance of it): the tangent predictor then reuses it instead of
  // assembling and factorizing again.
  void set_factor_at_current(bool held) { factor_at_current_ = held; }

 private:
  bool tangent_predictor(const PathState& state, double load_step, Eigen::VectorXd& q);
  bool linearised_change(const PathState& state, double load_step, bool factorize, Eigen::VectorXd& change);
  // chosen_norm: |R| at the change kept, when the settling evaluated it.
  bool settle_touching_set(const PathState& state, double load_step, Eigen::VectorXd& change,
                           std::optional<double>& chosen_norm);
  void prefer_curved(const PathState& state, double load_step, const Eigen::VectorXd& change,
                     std::optional<double> known_norm, Eigen::VectorXd& q);
  double residual_norm_at(const Eigen::VectorXd& q, double load_factor);

  NonlinearSystem& system_;
  LinearSolver& linear_solver_;
  const LoadStepperOptions& options_;
  double controlled_start_;
  bool factor_at_current_ = false;
};

}  // namespace plystrain::nonlinear::detail
