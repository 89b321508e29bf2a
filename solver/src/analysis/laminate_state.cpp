#include "plystrain/solver/laminate_state.hpp"

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>

namespace plystrain {

namespace {

Eigen::Matrix3d stretches(double along, double through, double third) {
  Eigen::Matrix3d F = Eigen::Matrix3d::Zero();
  F(0, 0) = along;
  F(1, 1) = through;
  F(2, 2) = third;
  return F;
}

// d P(i, i) / d F(j, j) from the law's 9 x 9 tangent (row 3 i + i, column 3 j + j).
double diagonal_tangent(const materials::PointResponse& response, int i, int j) {
  return response.tangent(4 * i, 4 * j);
}

// The thickness equations of a stretched laminate. Unknowns: each layer's
// thickness stretch, then the common third stretch when it is free.
// Equations: P_zz = 0 in each layer, and the thickness-weighted P_33
// summing to zero when the third stretch is free.
class LaminateEquations {
 public:
  LaminateEquations(const std::vector<LaminateLayer>& layers, double stretch, const ThirdStretch& third)
      : layers_(layers),
        stretch_(stretch),
        third_(third),
        n_(static_cast<int>(layers.size())),
        common_unknown_(third.kind == ThirdStretch::Kind::free),
        size_(n_ + (common_unknown_ ? 1 : 0)) {}

  [[nodiscard]] double third_of(const Eigen::VectorXd& unknowns) const {
    switch (third_.kind) {
      case ThirdStretch::Kind::free:
        return unknowns(n_);
      case ThirdStretch::Kind::fixed:
        return third_.value;
      case ThirdStretch::Kind::equibiaxial:
        return stretch_;
    }
    return 1.0;
  }

  // From a known state, or else from layers that keep their volume (nearly
  // incompressible ones do: the guess that starts Newton inside its basin).
  [[nodiscard]] Eigen::VectorXd start(const LaminateState* known) const {
    Eigen::VectorXd x = Eigen::VectorXd::Ones(size_);
    if (known != nullptr && static_cast<int>(known->thickness_stretch.size()) == n_) {
      for (int i = 0; i < n_; ++i) {
        x(i) = known->thickness_stretch[static_cast<std::size_t>(i)];
      }
      if (common_unknown_) {
        x(n_) = known->third_stretch;
      }
      return x;
    }
    if (common_unknown_) {
      x(n_) = 1.0 / std::sqrt(stretch_);
    }
    for (int i = 0; i < n_; ++i) {
      x(i) = 1.0 / (stretch_ * third_of(x));
    }
    return x;
  }

  // Rows are forces per depth, up to the stiffest layer's thickness times
  // its P-wave modulus; 1e-12 of that is rounding.
  [[nodiscard]] double tolerance() const {
    double scale = 0.0;
    for (const LaminateLayer& layer : layers_) {
      scale = std::max(scale, layer.thickness * (materials::initial_bulk_modulus(layer.law) +
                                                 4.0 / 3.0 * materials::initial_shear_modulus(layer.law)));
    }
    return 1e-12 * scale * std::max(1.0, std::abs(stretch_));
  }

  struct Linearised {
    bool admissible = true;
    Eigen::VectorXd residual;
    Eigen::MatrixXd jacobian;
  };

  [[nodiscard]] Linearised linearise(const Eigen::VectorXd& unknowns, bool with_jacobian) const {
    Linearised out;
    out.residual = Eigen::VectorXd::Zero(size_);
    if (with_jacobian) {
      out.jacobian = Eigen::MatrixXd::Zero(size_, size_);
    }
    const double t = third_of(unknowns);
    for (int i = 0; i < n_; ++i) {
      const LaminateLayer& layer = layers_[static_cast<std::size_t>(i)];
      const materials::PointResponse r = materials::evaluate(
          layer.law, stretches(stretch_, unknowns(i), t),
          with_jacobian ? materials::Need::stress_and_tangent : materials::Need::stress_only);
      if (!r.admissible) {
        out.admissible = false;
        return out;
      }
      // P_zz scaled by the thickness, so that every row weighs like a force.
      out.residual(i) = layer.thickness * r.first_piola(1, 1);
      if (common_unknown_) {
        out.residual(n_) += layer.thickness * r.first_piola(2, 2);
      }
      if (with_jacobian) {
        out.jacobian(i, i) = layer.thickness * diagonal_tangent(r, 1, 1);
        if (common_unknown_) {
          out.jacobian(i, n_) = layer.thickness * diagonal_tangent(r, 1, 2);
          out.jacobian(n_, i) += layer.thickness * diagonal_tangent(r, 2, 1);
          out.jacobian(n_, n_) += layer.thickness * diagonal_tangent(r, 2, 2);
        }
      }
    }
    return out;
  }

  [[nodiscard]] LaminateState state_at(const Eigen::VectorXd& x) const {
    LaminateState state;
    state.third_stretch = third_of(x);
    for (int i = 0; i < n_; ++i) {
      const LaminateLayer& layer = layers_[static_cast<std::size_t>(i)];
      const materials::PointResponse r = materials::evaluate(
          layer.law, stretches(stretch_, x(i), state.third_stretch), materials::Need::stress_only);
      state.nominal_stress_xx.push_back(r.first_piola(0, 0));
      state.thickness_stretch.push_back(x(i));
    }
    return state;
  }

  // Backtracking: the full Newton step of a nearly incompressible layer can
  // overshoot far past its root; halve it until the residual falls below
  // `norm` (and every stretch stays positive).
  [[nodiscard]] double step_factor(const Eigen::VectorXd& x, const Eigen::VectorXd& step, double norm) const {
    double factor = 1.0;
    for (int halving = 0; halving < 30; ++halving, factor *= 0.5) {
      const Eigen::VectorXd trial = x - factor * step;
      if (trial.minCoeff() <= 0.0) {
        continue;
      }
      const Linearised there = linearise(trial, false);
      if (there.admissible && there.residual.norm() < norm) {
        break;
      }
    }
    return factor;
  }

 private:
  const std::vector<LaminateLayer>& layers_;
  double stretch_;
  ThirdStretch third_;
  int n_;
  bool common_unknown_;
  int size_;
};

}  // namespace

std::optional<LaminateState> stretched_laminate(const std::vector<LaminateLayer>& layers,
                                                double stretch, const ThirdStretch& third,
                                                const LaminateState* start) {
  const LaminateEquations equations(layers, stretch, third);
  Eigen::VectorXd x = equations.start(start);
  const double tolerance = equations.tolerance();
  for (int iteration = 0; iteration < 100; ++iteration) {
    const LaminateEquations::Linearised here = equations.linearise(x, true);
    if (!here.admissible) {
      return std::nullopt;
    }
    const double norm = here.residual.norm();
    if (norm <= tolerance) {
      return equations.state_at(x);
    }
    const Eigen::VectorXd step = here.jacobian.fullPivLu().solve(here.residual);
    if (!step.allFinite()) {
      return std::nullopt;
    }
    const Eigen::VectorXd next = x - equations.step_factor(x, step, norm) * step;
    if ((next - x).lpNorm<Eigen::Infinity>() <= 1e-15) {
      return std::nullopt;  // no progress at the rounding level above the tolerance
    }
    x = next;
  }
  return std::nullopt;
}

}  // namespace plystrain
