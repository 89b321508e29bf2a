// A certificate for a user's own case: rerun it with the choices the user
// did not make on purpose changed (the mesh halved; the
// cell twice as wide) and say how far each layer's peak moved.
#pragma once

#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/results.hpp"

#include <optional>
#include <string>
#include <vector>

namespace plystrain {

// How far a peak may move for the run to be called converged.
inline constexpr double convergence_tolerance = 0.02;

struct ConvergenceRerunPlan {
  std::string what;
  std::string folder;
  CaseSpec spec;
};

// The reruns of `spec`: always the mesh halved (size_near and size_far);
// for stretch and bend also the width doubled with the same mesh sizes,
// unless the user stated a defect spacing (then the width is the physics,
// not a modelling choice).
[[nodiscard]] std::vector<ConvergenceRerunPlan> convergence_reruns(const CaseSpec& spec);

// Compares the governing peaks (largest over the global result and every
// local check) of a run and its reruns.
[[nodiscard]] ConvergenceReport compare_reruns(const RunResults& run,
                                               const std::vector<ConvergenceRerunPlan>& plans,
                                               const std::vector<RunResults>& reruns);

}  // namespace plystrain
