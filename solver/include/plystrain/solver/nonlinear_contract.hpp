// The finite-element model is solved through the nonlinear module's
// contract (a residual, a tangent and their failures as data): the names the
// model takes from there.
#pragma once

#include "plystrain/nonlinear/nonlinear_system.hpp"

namespace plystrain::solver {

using nonlinear::Evaluation;
using nonlinear::EvaluationStatus;
using nonlinear::NonlinearSystem;
using nonlinear::SparseMatrix;

}  // namespace plystrain::solver
