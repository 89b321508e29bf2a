#include "step_size_control.hpp"

#include <algorithm>
#include <cmath>

namespace plystrain::nonlinear::detail {

namespace {

constexpr double ceiling_below_failure = 0.7;
constexpr double ceiling_lift = 1.1;
constexpr double ceiling_reach = 4.0;  // in sizes of the failed increment, past where it started

}  // namespace

StepSizeControl::StepSizeControl(const LoadStepperOptions& options)
    : options_(options),
      nominal_(std::min(1.0 / options.steps, options.max_increment)),
      size_(options.geometric_ramp ? std::min(options.ramp_first_fraction, nominal_) : nominal_),
      ramping_(options.geometric_ramp && size_ < nominal_),
      shrink_floor_(0.25 * nominal_) {}

void StepSizeControl::converged(int iterations, double attempted, double position) {
  if (iterations <= options_.easy_iterations) {
    size_ = ramping_ ? std::min(size_ * options_.ramp_growth_factor, nominal_) : size_ * options_.growth_factor;
    size_ = std::min({size_, options_.max_increment, std::max(growth_ceiling_, attempted)});
    growth_ceiling_ *= ceiling_lift;
    if (position > ceiling_ends_at_) {
      growth_ceiling_ = std::numeric_limits<double>::infinity();
    }
  } else {
    // A hard increment warns that the next one of the same size may fail
    // outright; Newton's work grows roughly with the square of the step
    // beyond its basin, hence the square root. Where the count does not
    // fall with the size (a strict tolerance, contact chatter) shrinking
    // would stall the path, so it stops at a quarter of the nominal size.
    const double shrink =
        std::max(options_.cutback_factor, std::sqrt(static_cast<double>(options_.easy_iterations) / iterations));
    size_ = std::max(size_ * shrink, std::min(size_, shrink_floor_));
  }
  ramping_ = ramping_ && size_ < nominal_;
}

void StepSizeControl::failed(double attempted, double position) {
  size_ *= options_.cutback_factor;
  growth_ceiling_ = ceiling_below_failure * attempted;
  ceiling_ends_at_ = position + ceiling_reach * attempted;
  ramping_ = false;
}

}  // namespace plystrain::nonlinear::detail
