#include "plystrain/solver/laminate_state.hpp"

#include <Eigen/Dense>

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

}  // namespace

std::optional<LaminateState> stretched_laminate(const std::vector<LaminateLayer>& layers,
                                                double stretch, const ThirdStretch& third,
                                                const LaminateState* start) {
  const int n = static_cast<int>(layers.size());
  const bool common_unknown = third.kind == ThirdStretch::Kind::free;
  const int size = n + (common_unknown ? 1 : 0);
  const auto third_of = [&](const Eigen::VectorXd& unknowns) {
    switch (third.kind) {
      case ThirdStretch::Kind::free:
        return unknowns(n);
      case ThirdStretch::Kind::fixed:
        return third.value;
      case ThirdStretch::Kind::equibiaxial:
        return stretch;
    }
    return 1.0;
  };
  // Unknowns: each layer's thickness stretch, then the common third stretch
  // when it is free. Equations: P_zz = 0 in each layer, and the thickness-
  // weighted P_33 summing to zero when the third stretch is free.
  Eigen::VectorXd x = Eigen::VectorXd::Ones(size);
  if (start != nullptr && static_cast<int>(start->thickness_stretch.size()) == n) {
    for (int i = 0; i < n; ++i) {
      x(i) = start->thickness_stretch[static_cast<std::size_t>(i)];
    }
    if (common_unknown) {
      x(n) = start->third_stretch;
    }
  } else {
    // Nearly incompressible layers keep their volume: the guess that starts
    // Newton inside its basin.
    if (common_unknown) {
      x(n) = 1.0 / std::sqrt(stretch);
    }
    for (int i = 0; i < n; ++i) {
      x(i) = 1.0 / (stretch * third_of(x));
    }
  }
  // Rows are forces per depth, up to the stiffest layer's thickness times its
  // P-wave modulus; 1e-12 of that is rounding.
  double scale = 0.0;
  for (const LaminateLayer& layer : layers) {
    scale = std::max(scale,
                     layer.thickness * (materials::initial_bulk_modulus(layer.law) +
                                        4.0 / 3.0 * materials::initial_shear_modulus(layer.law)));
  }
  const double tolerance = 1e-12 * scale * std::max(1.0, std::abs(stretch));

  struct Linearised {
    bool admissible = true;
    Eigen::VectorXd residual;
    Eigen::MatrixXd jacobian;
  };
  const auto linearise = [&](const Eigen::VectorXd& unknowns, bool with_jacobian) {
    Linearised out;
    out.residual = Eigen::VectorXd::Zero(size);
    if (with_jacobian) {
      out.jacobian = Eigen::MatrixXd::Zero(size, size);
    }
    const double t = third_of(unknowns);
    for (int i = 0; i < n; ++i) {
      const LaminateLayer& layer = layers[static_cast<std::size_t>(i)];
      const materials::PointResponse r = materials::evaluate(
          layer.law, stretches(stretch, unknowns(i), t),
          with_jacobian ? materials::Need::stress_and_tangent : materials::Need::stress_only);
      if (!r.admissible) {
        out.admissible = false;
        return out;
      }
      // P_zz scaled by the thickness, so that every row weighs like a force.
      out.residual(i) = layer.thickness * r.first_piola(1, 1);
      if (common_unknown) {
        out.residual(n) += layer.thickness * r.first_piola(2, 2);
      }
      if (with_jacobian) {
        out.jacobian(i, i) = layer.thickness * diagonal_tangent(r, 1, 1);
        if (common_unknown) {
          out.jacobian(i, n) = layer.thickness * diagonal_tangent(r, 1, 2);
          out.jacobian(n, i) += layer.thickness * diagonal_tangent(r, 2, 1);
          out.jacobian(n, n) += layer.thickness * diagonal_tangent(r, 2, 2);
        }
      }
    }
    return out;
  };

  for (int iteration = 0; iteration < 100; ++iteration) {
    const Linearised here = linearise(x, true);
    if (!here.admissible) {
      return std::nullopt;
    }
    const double norm = here.residual.norm();
    if (norm <= tolerance) {
      LaminateState state;
      state.third_stretch = third_of(x);
      for (int i = 0; i < n; ++i) {
        const LaminateLayer& layer = layers[static_cast<std::size_t>(i)];
        const materials::PointResponse r = materials::evaluate(
            layer.law, stretches(stretch, x(i), state.third_stretch), materials::Need::stress_only);
        state.nominal_stress_xx.push_back(r.first_piola(0, 0));
        state.thickness_stretch.push_back(x(i));
      }
      return state;
    }
    const Eigen::VectorXd step = here.jacobian.fullPivLu().solve(here.residual);
    if (!step.allFinite()) {
      return std::nullopt;
    }
    // Backtracking: the full Newton step of a nearly incompressible layer
    // can overshoot far past its root; halve it until the residual falls
    // (and every stretch stays positive).
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
    const Eigen::VectorXd next = x - factor * step;
    if ((next - x).lpNorm<Eigen::Infinity>() <= 1e-15) {
      return std::nullopt;  // no progress at the rounding level above the tolerance
    }
    x = next;
  }
  return std::nullopt;
}

}  // namespace plystrain
