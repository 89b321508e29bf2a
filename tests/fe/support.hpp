// Test helpers for the finite-element core: a plain Newton loop on a model
// (sparse LDL' or LU from Eigen, with a backtracking step), small law
// constructors and the finite-difference check of a model's tangent.
#pragma once

#include "plystrain/materials/law.hpp"
#include "plystrain/solver/model.hpp"

#include <Eigen/SparseCholesky>
#include <Eigen/SparseLU>

#include <algorithm>
#include <limits>
#include <stdexcept>
#include <string>

namespace plystrain::test {

// The model's tangent at (q, lambda) against central differences of its
// residual with step h (common practice for consistent tangents): the
// largest entry of the difference, and the largest entry of the tangent to
// compare it with. Throws when an evaluation fails.
struct TangentComparison {
  double worst_difference = 0.0;
  double largest_entry = 0.0;
};

inline TangentComparison compare_tangent_with_differences(solver::Model& model, const Eigen::VectorXd& q,
                                                          double load_factor, double h) {
  Eigen::VectorXd r;
  nonlinear::SparseMatrix K;
  if (!model.evaluate(q, load_factor, r, &K).ok()) {
    throw std::runtime_error("tangent check: the evaluation at q failed");
  }
  const Eigen::MatrixXd dense(K);
  TangentComparison comparison;
  comparison.largest_entry = dense.cwiseAbs().maxCoeff();
  for (int j = 0; j < model.size(); ++j) {
    Eigen::VectorXd qp = q, qm = q, rp, rm;
    qp(j) += h;
    qm(j) -= h;
    if (!model.evaluate(qp, load_factor, rp, nullptr).ok() || !model.evaluate(qm, load_factor, rm, nullptr).ok()) {
      throw std::runtime_error("tangent check: an evaluation beside q failed");
    }
    comparison.worst_difference =
        std::max(comparison.worst_difference, ((rp - rm) / (2 * h) - dense.col(j)).cwiseAbs().maxCoeff());
  }
  return comparison;
}

inline materials::LawParameters neo_hookean(double shear_modulus, double bulk_modulus) {
  materials::LawParameters law;
  law.kind = materials::ModelKind::neo_hookean;
  law.shear_modulus = shear_modulus;
  law.bulk_modulus = bulk_modulus;
  return law;
}

inline materials::LawParameters neo_hookean_from_young(double youngs_modulus, double poisson_ratio) {
  const materials::ShearBulk m = materials::to_shear_bulk(youngs_modulus, poisson_ratio);
  return neo_hookean(m.shear_modulus, m.bulk_modulus);
}

struct NewtonOutcome {
  Eigen::VectorXd q;
  int iterations = 0;
  double residual_norm = 0.0;
};

// Newton from q in `steps` equal load increments up to load_factor_end.
// Throws on failure (a test then fails with the reason).
inline NewtonOutcome solve(solver::Model& model, int steps = 1, double load_factor_end = 1.0,
                           double tolerance = 1e-10, int max_iterations = 30) {
  NewtonOutcome out;
  out.q = Eigen::VectorXd::Zero(model.size());
  nonlinear::SparseMatrix K;
  Eigen::VectorXd r;
  for (int step = 1; step <= steps; ++step) {
    const double lambda = load_factor_end * step / steps;
    double reference = -1.0;
    double last_step = std::numeric_limits<double>::infinity();
    bool converged = false;
    for (int it = 0; it < max_iterations; ++it) {
      const nonlinear::Evaluation e = model.evaluate(out.q, lambda, r, &K);
      if (!e.ok()) {
        throw std::runtime_error(std::string("evaluation failed: ") + e.detail);
      }
      const double norm = r.norm();
      if (reference < 0.0) {
        reference = std::max(norm, 1e-300);
      }
      out.residual_norm = norm;
      ++out.iterations;
      // Converged when the residual fell by `tolerance`, or when the last
      // correction was at the level of round-off in q (tiny-load linear
      // problems cannot reduce the residual below round-off).
      if ((it > 0 && norm <= tolerance * reference) || norm < 1e-300 ||
          (it > 0 && last_step <= 1e-8 * std::max(out.q.norm(), 1e-300))) {
        converged = true;
        break;
      }
      Eigen::VectorXd dq;
      if (model.tangent_is_symmetric()) {
        Eigen::SimplicialLDLT<nonlinear::SparseMatrix> ldlt(K);
        if (ldlt.info() != Eigen::Success) {
          throw std::runtime_error("factorization failed");
        }
        dq = ldlt.solve(r);
      } else {
        Eigen::SparseLU<nonlinear::SparseMatrix> lu;
        lu.compute(K);
        if (lu.info() != Eigen::Success) {
          throw std::runtime_error("LU factorization failed");
        }
        dq = lu.solve(r);
      }
      // Backtracking: halve the step while the trial state cannot be
      // evaluated (an inverted cell).
      double factor = 1.0;
      Eigen::VectorXd trial_residual;
      for (int cut = 0; cut < 12; ++cut) {
        const Eigen::VectorXd trial = out.q - factor * dq;
        const nonlinear::Evaluation t = model.evaluate(trial, lambda, trial_residual, nullptr);
        if (t.ok()) {
          break;
        }
        factor *= 0.5;
      }
      out.q -= factor * dq;
      last_step = factor == 1.0 ? dq.norm() : std::numeric_limits<double>::infinity();
    }
    if (!converged) {
      throw std::runtime_error("Newton did not converge at load factor " + std::to_string(lambda) +
                               ", residual " + std::to_string(out.residual_norm));
    }
  }
  return out;
}

}  // namespace plystrain::test
