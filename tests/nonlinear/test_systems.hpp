// Small nonlinear systems with solutions known in closed form, for testing
// the linear solver wrapper, Newton and the load stepper without the FE model.
#pragma once

#include "plystrain/nonlinear/nonlinear_system.hpp"

#include <Eigen/Core>
#include <Eigen/SparseCore>

#include <cmath>
#include <stdexcept>
#include <vector>

namespace plystrain::test {

using nonlinear::Evaluation;
using nonlinear::EvaluationStatus;
using nonlinear::SparseMatrix;

// A chain of n springs in series, node 0 fixed, a force P * lambda at the
// free end; unknowns are the displacements of nodes 1..n. Each spring has
// the hardening law f(e) = k (e + c e^3) for its extension e. Every spring
// carries the end force, so each extension solves the cubic
// c e^3 + e - P lambda / k = 0, whose one real root (c > 0) is given by
// Cardano's formula, and u_i = i e.
class HardeningSpringChain : public nonlinear::NonlinearSystem {
 public:
  HardeningSpringChain(int springs, double stiffness, double cubic, double end_force)
      : springs_(springs), stiffness_(stiffness), cubic_(cubic), end_force_(end_force) {}

  [[nodiscard]] int size() const override { return springs_; }

  Evaluation evaluate(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& residual,
                      SparseMatrix* tangent) override {
    ++evaluations;
    residual = Eigen::VectorXd::Zero(springs_);
    std::vector<Eigen::Triplet<double>> entries;
    for (int s = 0; s < springs_; ++s) {
      // Spring s joins unknown s - 1 (or the fixed node) and unknown s.
      const double left = s == 0 ? 0.0 : q(s - 1);
      const double extension = q(s) - left;
      const double force = stiffness_ * (extension + cubic_ * extension * extension * extension);
      const double slope = stiffness_ * (1.0 + 3.0 * cubic_ * extension * extension);
      residual(s) += force;
      entries.emplace_back(s, s, slope);
      if (s > 0) {
        residual(s - 1) -= force;
        entries.emplace_back(s - 1, s - 1, slope);
        entries.emplace_back(s - 1, s, -slope);
        entries.emplace_back(s, s - 1, -slope);
      }
    }
    residual(springs_ - 1) -= end_force_ * load_factor;
    if (tangent != nullptr) {
      tangent->resize(springs_, springs_);
      tangent->setFromTriplets(entries.begin(), entries.end());
    }
    return {};
  }

  // Cardano (one real root of the depressed cubic e^3 + p e + q = 0 with
  // p = 1/c > 0): e = cbrt(-q/2 + sqrt(D)) + cbrt(-q/2 - sqrt(D)),
  // D = q^2/4 + p^3/27 (any algebra text; e.g. Abramowitz & Stegun,
  // Handbook of Mathematical Functions, 1964, 3.8.2).
  [[nodiscard]] double extension(double load_factor) const {
    const double p = 1.0 / cubic_;
    const double qq = -end_force_ * load_factor / (stiffness_ * cubic_);
    const double root = std::sqrt(qq * qq / 4.0 + p * p * p / 27.0);
    return std::cbrt(-qq / 2.0 + root) + std::cbrt(-qq / 2.0 - root);
  }

  [[nodiscard]] Eigen::VectorXd exact(double load_factor) const {
    return Eigen::VectorXd::LinSpaced(springs_, 1.0, springs_) * extension(load_factor);
  }

  int evaluations = 0;

 private:
  int springs_;
  double stiffness_;
  double cubic_;
  double end_force_;
};

// The shallow two-bar (von Mises) truss: bars from (-L, 0) and (L, 0) to the
// apex at (0, H), Green-Lagrange strain e = (l^2 - l0^2) / (2 l0^2) with
// energy EA l0 e^2 / 2 per bar, a downward force P lambda at the apex.
// Unknowns: apex displacement u (to the right) and v (downward).
// On the symmetric path u = 0, dPi/dv = 0 gives
//     P lambda = EA v (v - H)(v - 2H) / l0^3,
// a limit point at v = H (1 - 1/sqrt 3), lambda = 0 again at v = H and 2H,
// and the snapped-through branch beyond 2H (the classic example of
// Crisfield, Non-linear Finite Element Analysis of Solids and Structures,
// vol. 1, 1991, ch. 1, with Green strain; derived here in these lines).
// The sway stiffness d2Pi/du2 = 2 EA (L^2 + e l0^2) / l0^3 stays positive for
// L^2 > H^2 / 2, so the symmetric path has no bifurcation.
class VonMisesTruss : public nonlinear::NonlinearSystem {
 public:
  VonMisesTruss(double half_span, double height, double axial_stiffness, double force)
      : span_(half_span), height_(height), stiffness_(axial_stiffness), force_(force),
        length_(std::sqrt(half_span * half_span + height * height)) {}

  [[nodiscard]] int size() const override { return 2; }

  Evaluation evaluate(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& residual,
                      SparseMatrix* tangent) override {
    ++evaluations;
    const double u = q(0);
    const double v = q(1);
    const double l02 = length_ * length_;
    const double dy = v - height_;  // d(l^2)/dv / 2 for both bars
    const double e1 = ((span_ + u) * (span_ + u) + dy * dy - l02) / (2.0 * l02);
    const double e2 = ((span_ - u) * (span_ - u) + dy * dy - l02) / (2.0 * l02);
    const double c = stiffness_ * length_;  // EA l0
    residual.resize(2);
    residual(0) = c * (e1 * (span_ + u) - e2 * (span_ - u)) / l02;
    residual(1) = c * (e1 + e2) * dy / l02 - force_ * load_factor;
    if (tangent != nullptr) {
      const double l04 = l02 * l02;
      const double kuu = c * ((span_ + u) * (span_ + u) / l04 + e1 / l02 + (span_ - u) * (span_ - u) / l04 + e2 / l02);
      const double kuv = c * ((span_ + u) * dy - (span_ - u) * dy) / l04;
      const double kvv = c * (2.0 * dy * dy / l04 + (e1 + e2) / l02);
      std::vector<Eigen::Triplet<double>> entries = {{0, 0, kuu}, {0, 1, kuv}, {1, 0, kuv}, {1, 1, kvv}};
      tangent->resize(2, 2);
      tangent->setFromTriplets(entries.begin(), entries.end());
    }
    return {};
  }

  // The load factor in equilibrium with apex deflection v on the symmetric path.
  [[nodiscard]] double load_factor_at(double v) const {
    return stiffness_ * v * (v - height_) * (v - 2.0 * height_) / (force_ * length_ * length_ * length_);
  }
  [[nodiscard]] double limit_deflection() const { return height_ * (1.0 - 1.0 / std::sqrt(3.0)); }
  [[nodiscard]] double height() const { return height_; }

  int evaluations = 0;

 private:
  double span_;
  double height_;
  double stiffness_;
  double force_;
  double length_;
};

// R_i = atan(q_i - lambda c_i): Newton's full step diverges from
// |q_i - lambda c_i| > 1.3917 (the root of 2x = (1 + x^2) atan x; the
// value from memory, the condition follows from the Newton map), the
// classic example for damping (Dennis & Schnabel, Numerical Methods for
// Unconstrained Optimization and Nonlinear Equations, 1983, ch. 6).
class ArctangentSystem : public nonlinear::NonlinearSystem {
 public:
  explicit ArctangentSystem(Eigen::VectorXd centres) : centres_(std::move(centres)) {}
  [[nodiscard]] int size() const override { return static_cast<int>(centres_.size()); }
  Evaluation evaluate(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& residual,
                      SparseMatrix* tangent) override {
    const Eigen::VectorXd shifted = q - load_factor * centres_;
    residual = shifted.array().atan().matrix();
    if (tangent != nullptr) {
      tangent->resize(size(), size());
      std::vector<Eigen::Triplet<double>> entries;
      for (int i = 0; i < size(); ++i) {
        entries.emplace_back(i, i, 1.0 / (1.0 + shifted(i) * shifted(i)));
      }
      tangent->setFromTriplets(entries.begin(), entries.end());
    }
    return {};
  }

 private:
  Eigen::VectorXd centres_;
};

// Wraps a system and makes it fail on purpose: evaluation fails whenever the
// load factor is more than `max_jump` beyond the last accepted one, or beyond
// `ceiling`; it throws beyond `throw_above`. For testing cut-back and the
// handling of failures.
class FailureInjector : public nonlinear::NonlinearSystem {
 public:
  explicit FailureInjector(nonlinear::NonlinearSystem& inner) : inner_(inner) {}
  double max_jump = 1e300;
  double ceiling = 1e300;
  double throw_above = 1e300;
  int accepted = 0;

  [[nodiscard]] int size() const override { return inner_.size(); }
  Evaluation evaluate(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& residual,
                      SparseMatrix* tangent) override {
    if (load_factor > throw_above) {
      throw std::runtime_error("injected exception");
    }
    if (load_factor - accepted_load_ > max_jump || load_factor > ceiling) {
      return {EvaluationStatus::material_failure, "injected failure"};
    }
    return inner_.evaluate(q, load_factor, residual, tangent);
  }
  void accept_increment(const Eigen::VectorXd& q, double load_factor) override {
    accepted_load_ = load_factor;
    ++accepted;
    inner_.accept_increment(q, load_factor);
  }

 private:
  nonlinear::NonlinearSystem& inner_;
  double accepted_load_ = 0.0;
};

// Central-difference tangent of a system's residual, dense.
inline Eigen::MatrixXd finite_difference_tangent(nonlinear::NonlinearSystem& system, const Eigen::VectorXd& q,
                                                 double load_factor, double step = 1e-6) {
  const int n = system.size();
  Eigen::MatrixXd result(n, n);
  Eigen::VectorXd plus;
  Eigen::VectorXd minus;
  for (int j = 0; j < n; ++j) {
    Eigen::VectorXd shifted = q;
    shifted(j) += step;
    (void)system.evaluate(shifted, load_factor, plus, nullptr);
    shifted(j) -= 2.0 * step;
    (void)system.evaluate(shifted, load_factor, minus, nullptr);
    result.col(j) = (plus - minus) / (2.0 * step);
  }
  return result;
}

}  // namespace plystrain::test
