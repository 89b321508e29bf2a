// The load factor at which each layer first reaches its crack-onset strain
// and first exceeds its yield strain, found from the layers evaluated at
// every converged increment of one solve.
//
// Between two converged increments the peak is taken as linear in the load
// factor: the crossing is interpolated between the last increment below the
// limit and the first at (crack onset) or above (yield) it, the same
// comparisons as `judge`. The solve starts from the undeformed state (load
// factor 0, no strain), which is the point before the first increment.
#pragma once

#include "plystrain/solver/results.hpp"

#include <optional>
#include <string>
#include <vector>

namespace plystrain {

class LimitCrossings {
 public:
  // The layers evaluated at a converged state of the solve, in the order of
  // the case (the same layers every time). States must come in the order
  // they converged; a state seen twice adds nothing.
  void add(double load_factor, const std::vector<LayerResult>& layers);

  // Sets crack_onset_load_factor and yield_load_factor of each layer of
  // `layers` (matched by name) to the crossings found so far.
  void apply_to(std::vector<LayerResult>& layers) const;

 private:
  struct Track {
    std::string name;
    double previous_load_factor = 0.0;
    double previous_peak = 0.0;
    std::optional<double> crack_onset;
    std::optional<double> yield;
  };
  std::vector<Track> tracks_;
};

}  // namespace plystrain
