// The volumetric energy shared by every law.
//
// U(J) = kappa/4 (J^2 - 1 - 2 ln J)   (Simo & Taylor, CMAME 35, 107, 1982;
// also in Ogden, Non-linear Elastic Deformations, 1984, as a volumetric
// penalty). U'(J) = kappa/2 (J - 1/J), U''(J) = kappa/2 (1 + 1/J^2).
//
// Why this form: U'' > 0 for every J > 0, so the volumetric part never loses
// convexity, however large kappa/mu is (the acoustic tensor stays positive
// definite at kappa/mu = 1e5, checked in the tests). The popular
// kappa/2 (ln J)^2 has U'' = kappa (1 - ln J)/J^2, which turns negative for
// J > e and softens long before; kappa/2 (J - 1)^2 stays finite as J -> 0 and
// so does not resist total compression. U(1) = U'(1) = 0 and U''(1) = kappa:
// the small-strain bulk modulus is exactly kappa.
#include "law_detail.hpp"

#include <Eigen/LU>

#include <cmath>

namespace plystrain::materials {

VolumetricResponse evaluate_volumetric(const LawParameters& law, double J) {
  VolumetricResponse out;
  if (!(J > 0.0)) {
    out.admissible = false;
    return out;
  }
  const double kappa = initial_bulk_modulus(law);
  out.energy = 0.25 * kappa * (J * J - 1.0 - 2.0 * std::log(J));
  out.pressure = 0.5 * kappa * (J - 1.0 / J);
  out.stiffness = 0.5 * kappa * (1.0 + 1.0 / (J * J));
  return out;
}

namespace detail {

// P_vol = p J F^-T with p = U'(J). Its derivative, G = F^-T:
//   dP_ij/dF_kl = J (U'' J + p) G_ij G_kl - p J G_il G_kj
// (d J = J G : dF and d G = -G dF^T G).
void add_volumetric(double bulk_modulus, const Eigen::Matrix3d& F, Need need, PointResponse& out) {
  const double J = F.determinant();
  const double pressure = 0.5 * bulk_modulus * (J - 1.0 / J);
  const double stiffness = 0.5 * bulk_modulus * (1.0 + 1.0 / (J * J));
  const Eigen::Matrix3d G = F.inverse().transpose();
  out.energy += 0.25 * bulk_modulus * (J * J - 1.0 - 2.0 * std::log(J));
  out.first_piola.noalias() += (pressure * J) * G;
  if (need == Need::stress_only) {
    return;
  }
  const double outer = J * (stiffness * J + pressure);
  const double swap = pressure * J;
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) {
      for (int k = 0; k < 3; ++k) {
        for (int l = 0; l < 3; ++l) {
          out.tangent(tangent_index(i, j), tangent_index(k, l)) +=
              outer * G(i, j) * G(k, l) - swap * G(i, l) * G(k, j);
        }
      }
    }
  }
}

}  // namespace detail
}  // namespace plystrain::materials
