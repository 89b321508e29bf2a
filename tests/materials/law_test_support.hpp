// Shared helpers for the pointwise-law tests: a set of laws covering every
// model kind, random deformation gradients and rotations, and central finite
// differences of the energy and of the stress.
#pragma once

#include "plystrain/materials/law.hpp"

#include <Eigen/Core>
#include <Eigen/Geometry>
#include <Eigen/LU>

#include <random>
#include <string>
#include <vector>

namespace plystrain::materials::testing {

struct NamedLaw {
  std::string name;
  LawParameters law;
};

inline LawParameters neo_hookean(double mu, double kappa) {
  LawParameters law;
  law.kind = ModelKind::neo_hookean;
  law.shear_modulus = mu;
  law.bulk_modulus = kappa;
  return law;
}

inline LawParameters linear_elastic(double youngs_modulus, double poisson_ratio) {
  LawParameters law;
  law.kind = ModelKind::linear_elastic;
  law.youngs_modulus = youngs_modulus;
  law.poisson_ratio = poisson_ratio;
  return law;
}

inline LawParameters mooney_rivlin(double c10, double c01, double kappa) {
  LawParameters law;
  law.kind = ModelKind::mooney_rivlin;
  law.c10 = c10;
  law.c01 = c01;
  law.bulk_modulus = kappa;
  return law;
}

inline LawParameters yeoh(double c10, double c20, double c30, double kappa) {
  LawParameters law;
  law.kind = ModelKind::yeoh;
  law.c10 = c10;
  law.c20 = c20;
  law.c30 = c30;
  law.bulk_modulus = kappa;
  return law;
}

inline LawParameters gent(double mu, double jm, double kappa) {
  LawParameters law;
  law.kind = ModelKind::gent;
  law.shear_modulus = mu;
  law.jm = jm;
  law.bulk_modulus = kappa;
  return law;
}

// Ogden (1972), Proc. R. Soc. Lond. A 326, 565: three-term fit to Treloar's
// vulcanised rubber, converted from kg/cm^2 at 0.1 MPa per kg/cm^2.
inline LawParameters ogden_1972(double kappa) {
  LawParameters law;
  law.kind = ModelKind::ogden;
  law.ogden_mu = {0.63, 0.0012, -0.01};
  law.ogden_alpha = {1.3, 5.0, -2.0};
  law.bulk_modulus = kappa;
  return law;
}

// One law of every kind, compressible enough (kappa/mu about 3 to 10) for
// finite differences to resolve the isochoric part well.
inline std::vector<NamedLaw> every_kind() {
  return {
      {"linear-elastic", linear_elastic(10.0, 0.3)},
      {"neo-hookean", neo_hookean(1.0, 5.0)},
      {"mooney-rivlin", mooney_rivlin(0.3, 0.1, 4.0)},
      {"yeoh", yeoh(0.5, -0.05, 0.01, 6.0)},
      {"gent", gent(1.0, 10.0, 5.0)},
      {"ogden", ogden_1972(4.0)},
  };
}

// F = I + amplitude * (uniform entries in [-1, 1]), redrawn until det F is
// comfortably positive.
inline Eigen::Matrix3d random_deformation(std::mt19937& random, double amplitude) {
  std::uniform_real_distribution<double> uniform(-1.0, 1.0);
  for (;;) {
    Eigen::Matrix3d F = Eigen::Matrix3d::Identity();
    for (int i = 0; i < 3; ++i) {
      for (int j = 0; j < 3; ++j) {
        F(i, j) += amplitude * uniform(random);
      }
    }
    if (F.determinant() > 0.3) {
      return F;
    }
  }
}

inline Eigen::Matrix3d random_rotation(std::mt19937& random) {
  std::normal_distribution<double> normal(0.0, 1.0);
  Eigen::Quaterniond q(normal(random), normal(random), normal(random), normal(random));
  q.normalize();
  return q.toRotationMatrix();
}

// Central differences (common practice for checking consistent tangents).
template <typename Function>
Eigen::Matrix3d central_difference_of_energy(Function energy, const Eigen::Matrix3d& F, double h) {
  Eigen::Matrix3d gradient;
  for (int k = 0; k < 3; ++k) {
    for (int l = 0; l < 3; ++l) {
      Eigen::Matrix3d plus = F;
      Eigen::Matrix3d minus = F;
      plus(k, l) += h;
      minus(k, l) -= h;
      gradient(k, l) = (energy(plus) - energy(minus)) / (2.0 * h);
    }
  }
  return gradient;
}

template <typename Function>
Matrix9d central_difference_of_stress(Function stress, const Eigen::Matrix3d& F, double h) {
  Matrix9d tangent;
  for (int k = 0; k < 3; ++k) {
    for (int l = 0; l < 3; ++l) {
      Eigen::Matrix3d plus = F;
      Eigen::Matrix3d minus = F;
      plus(k, l) += h;
      minus(k, l) -= h;
      const Eigen::Matrix3d column = (stress(plus) - stress(minus)) / (2.0 * h);
      for (int i = 0; i < 3; ++i) {
        for (int j = 0; j < 3; ++j) {
          tangent(3 * i + j, 3 * k + l) = column(i, j);
        }
      }
    }
  }
  return tangent;
}

// Norm-wise relative difference; entries near zero make entry-wise ratios
// meaningless.
template <typename A, typename B>
double relative_difference(const A& value, const B& reference) {
  return (value - reference).norm() / reference.norm();
}

// Hooke's law, sigma = lambda tr(eps) I + 2 mu eps (Timoshenko & Goodier,
// Theory of Elasticity, 1970), as a 9x9 tensor in the tangent layout.
inline Matrix9d hooke_tensor(double youngs_modulus, double poisson_ratio) {
  const double lame = youngs_modulus * poisson_ratio /
                      ((1.0 + poisson_ratio) * (1.0 - 2.0 * poisson_ratio));
  const double mu = youngs_modulus / (2.0 * (1.0 + poisson_ratio));
  Matrix9d C = Matrix9d::Zero();
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) {
      for (int k = 0; k < 3; ++k) {
        for (int l = 0; l < 3; ++l) {
          C(3 * i + j, 3 * k + l) = lame * (i == j) * (k == l) +
                                    mu * ((i == k) * (j == l) + (i == l) * (j == k));
        }
      }
    }
  }
  return C;
}

}  // namespace plystrain::materials::testing
