// How large the next increment of a load path is: the geometric ramp at the
// start, growth after easy increments, shrinking after hard ones, cut-backs
// after failures and the growth ceiling a failure leaves behind
// (LoadStepperOptions documents the settings).
#pragma once

#include "plystrain/nonlinear/load_stepper.hpp"

#include <limits>

namespace plystrain::nonlinear::detail {

class StepSizeControl {
 public:
  explicit StepSizeControl(const LoadStepperOptions& options);

  // The size of the next attempt, a fraction of the path.
  [[nodiscard]] double size() const { return size_; }

  // An increment of `attempted` converged in `iterations` Newton
  // iterations; the path is now at `position`.
  void converged(int iterations, double attempted, double position);

  // An increment of `attempted` failed from `position`; the next attempt
  // is cut back.
  void failed(double attempted, double position);

 private:
  const LoadStepperOptions& options_;
  double nominal_;
  double size_;
  bool ramping_;
  double shrink_floor_;
  // Growth after a cut-back stops short of the size that failed, and the
  // ceiling lifts only slowly: otherwise growth leads straight back into the
  // same failure, each one costing several indefinite factorizations. The
  // ceiling belongs to the stretch of the path where the failure happened:
  // once the path has gone well past it (the stiffness, the touching set,
  // the buckled shape have all changed since) growth is free again, or a
  // failure in the first per mille of a path would hold every later
  // increment down.
  double growth_ceiling_ = std::numeric_limits<double>::infinity();
  double ceiling_ends_at_ = 0.0;
};

}  // namespace plystrain::nonlinear::detail
