// The convergence and stopping rules of NewtonOptions (see newton.hpp),
// kept apart from the iteration that they judge.
#pragma once

#include "plystrain/nonlinear/newton.hpp"

#include <cstddef>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace plystrain::nonlinear::detail {

class ConvergenceMonitor {
 public:
  ConvergenceMonitor(const NewtonOptions& options, double start_norm, double reference_residual,
                     double q_start_norm);

  // Opens an iteration at the current residual norm.
  void start_iteration();

  struct Test {
    bool converged = false;
    bool stalled_at_rounding = false;  // converged by the rounding rule
  };
  [[nodiscard]] Test test(int iteration, bool path_satisfied) const;

  // The active set changed after convergence: new equations at the same load,
  // with their own start residual.
  void restart_equations(double residual_norm);

  // Why the iteration must stop before another step (iteration limit, no
  // progress, divergence); nothing to go on.
  [[nodiscard]] std::optional<std::pair<NewtonStatus, std::string>> stop_reason(int iteration) const;

  // Iteration `iteration` moved q by `increment`, to a residual `residual_norm`.
  void step_taken(int iteration, double increment, double residual_norm);

  [[nodiscard]] double residual_norm() const { return residual_norm_; }

 private:
  const NewtonOptions& options_;
  double residual_norm_;
  double previous_residual_norm_;
  double residual_reference_;
  double residual_limit_;
  double increment_reference_ = 0.0;
  // From a good predictor the first correction is already tiny, and a test
  // relative to it alone would ask for corrections below the rounding of q.
  double increment_rounding_;
  double last_increment_;
  std::vector<double> history_;      // residual norm at the start of each iteration
  std::size_t equations_since_ = 0;  // index in history_ of the first iteration on the current equations
};

}  // namespace plystrain::nonlinear::detail
