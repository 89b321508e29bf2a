#include "plystrain/nonlinear/nonlinear_system.hpp"

#include <algorithm>
#include <cmath>

namespace plystrain::nonlinear {

const char* status_name(EvaluationStatus status) {
  switch (status) {
    case EvaluationStatus::ok: return "ok";
    case EvaluationStatus::inverted_element: return "inverted element (J <= 0)";
    case EvaluationStatus::non_finite: return "non-finite residual or tangent";
    case EvaluationStatus::material_failure: return "material law could not be evaluated";
  }
  return "unknown";
}

Evaluation NonlinearSystem::load_derivative(const Eigen::VectorXd& q, double load_factor,
                                            Eigen::VectorXd& derivative) {
  // Step relative to the load factor with a floor, so that it works at 0.
  const double step = 1e-6 * std::max(1.0, std::abs(load_factor));
  Eigen::VectorXd plus;
  Eigen::VectorXd minus;
  Evaluation result = evaluate(q, load_factor + step, plus, nullptr);
  if (!result.ok()) {
    return result;
  }
  result = evaluate(q, load_factor - step, minus, nullptr);
  if (!result.ok()) {
    return result;
  }
  derivative = (plus - minus) / (2.0 * step);
  return {};
}

}  // namespace plystrain::nonlinear
