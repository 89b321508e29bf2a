// The contract between the discretised model and the nonlinear solver. The
// Newton solver sees a residual and a tangent in the reduced unknowns (the
// constraints already eliminated) and knows nothing of elements.
#pragma once

#include <Eigen/Core>
#include <Eigen/SparseCore>

#include <string>

namespace plystrain::nonlinear {

// Column-major, both triangles stored (symmetric tangents are stored in full).
using SparseMatrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

enum class EvaluationStatus {
  ok,
  inverted_element,  // J <= 0 at some integration point
  non_finite,        // NaN or infinity in the residual or tangent
  material_failure,  // a law could not be evaluated (e.g. Gent beyond its locking stretch)
};

[[nodiscard]] const char* status_name(EvaluationStatus status);

struct Evaluation {
  EvaluationStatus status = EvaluationStatus::ok;
  std::string detail;  // where and what, for the log (e.g. "cell 812, point 3: J = -0.02")

  [[nodiscard]] bool ok() const { return status == EvaluationStatus::ok; }
};

// R(q, lambda) = internal forces - external forces, in the reduced unknowns q,
// at load factor lambda (prescribed displacements, pressures and the like
// scale with lambda). The tangent is dR/dq; its sparsity pattern does not
// change between calls, so a linear solver may reuse its symbolic analysis.
class NonlinearSystem {
 public:
  virtual ~NonlinearSystem() = default;

  [[nodiscard]] virtual int size() const = 0;

  // tangent may be null when only the residual is wanted (line search).
  virtual Evaluation evaluate(const Eigen::VectorXd& q, double load_factor,
                              Eigen::VectorXd& residual, SparseMatrix* tangent) = 0;

  // dR/dlambda at (q, lambda), for predictors and arc-length control. The
  // default is a central difference of the residual.
  virtual Evaluation load_derivative(const Eigen::VectorXd& q, double load_factor,
                                     Eigen::VectorXd& derivative);

  // Contact: evaluations until release_touch() use the touching set of the
  // state (q, lambda) instead of deciding it afresh at each point. A
  // predictor uses it to linearise the equations about the set it predicts.
  // Returns whether the held set changed; false for a system without one.
  virtual bool hold_touch_at(const Eigen::VectorXd& /*q*/, double /*load_factor*/) { return false; }
  virtual void release_touch() {}

  // Called once an increment has converged, e.g. to update contact states.
  virtual void accept_increment(const Eigen::VectorXd& /*q*/, double /*load_factor*/) {}

  // Called before each Newton attempt at an increment: a system with an
  // active set goes back to the set accepted with the last increment, so
  // that a failed attempt leaves nothing behind.
  virtual void begin_attempt() {}

  // Called after a Newton iteration has converged; a system with active sets
  // (contact) returns true when it changed its set, and Newton then iterates
  // again at the same load.
  virtual bool update_active_set(const Eigen::VectorXd& /*q*/, double /*load_factor*/) {
    return false;
  }
};

}  // namespace plystrain::nonlinear
