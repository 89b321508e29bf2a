// Isochoric laws written in the principal stretches of Fbar: Ogden (Proc. R.
// Soc. Lond. A 326, 565, 1972) and the isochoric Hencky energy used for
// linear-elastic.
//
// Both are sums of one function of each deviatoric logarithmic strain,
//   W_iso = sum_a f(y_a),  y_a = ln cbar_a = ln c_a - (1/3) sum_b ln c_b,
// where c_a are the eigenvalues of C = F^T F (cbar_a = lambdabar_a^2):
//   Ogden:  f(y) = sum_p mu_p/alpha_p (exp(alpha_p y/2) - 1)
//   Hencky: f(y) = mu/4 y^2 = mu (ln lambdabar)^2
// Writing W as w(c_1, c_2, c_3) gives S = 2 sum_a w_a N_a N_a and, in the
// principal frame of C (Ogden 1984, sec. 6.1; Miehe, CMAME 155, 193, 1998),
//   dS_aa = 2 sum_b w_ab dC_bb,  dS_ab = 2 theta_ab dC_ab (a != b),
//   theta_ab = (w_a - w_b) / (c_a - c_b).
// For equal eigenvalues theta_ab has the limit w_aa - w_ab (w is symmetric),
// which is exact at F = I and used when the eigenvalues differ by less than
// a relative 1e-7: there the divided difference would lose digits to
// cancellation while the limit is wrong only by O(1e-7).
#include "law_detail.hpp"

#include <Eigen/Eigenvalues>

#include <algorithm>
#include <cmath>

namespace plystrain::materials::detail {
namespace {

constexpr double equal_eigenvalue_tolerance = 1e-7;

struct ScalarTerms {
  double value = 0.0, first = 0.0, second = 0.0;
};

ScalarTerms stretch_function(const LawParameters& law, double y) {
  ScalarTerms f;
  if (law.kind == ModelKind::ogden) {
    const std::size_t terms = std::min(law.ogden_mu.size(), law.ogden_alpha.size());
    for (std::size_t p = 0; p < terms; ++p) {
      const double mu = law.ogden_mu[p];
      const double alpha = law.ogden_alpha[p];
      const double power = std::exp(0.5 * alpha * y);
      f.value += mu / alpha * (power - 1.0);
      f.first += 0.5 * mu * power;
      f.second += 0.25 * mu * alpha * power;
    }
  } else {  // linear_elastic: isochoric Hencky energy
    const double mu = resolved_moduli(law).shear_modulus;
    f.value = 0.25 * mu * y * y;
    f.first = 0.5 * mu * y;
    f.second = 0.5 * mu;
  }
  return f;
}

}  // namespace

void isochoric_principal_stretch_law(const LawParameters& law, const Eigen::Matrix3d& F, Need need,
                                     PointResponse& out) {
  const Eigen::Matrix3d C = F.transpose() * F;
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> eigen(C);
  const Eigen::Vector3d c = eigen.eigenvalues();
  const Eigen::Matrix3d& Q = eigen.eigenvectors();
  if (eigen.info() != Eigen::Success || !(c.minCoeff() > 0.0)) {
    out = PointResponse{};
    out.admissible = false;
    return;
  }

  Eigen::Vector3d y = c.array().log().matrix();
  y.array() -= y.mean();

  double energy = 0.0;
  Eigen::Vector3d f1;
  Eigen::Vector3d f2;
  for (int a = 0; a < 3; ++a) {
    const ScalarTerms f = stretch_function(law, y(a));
    energy += f.value;
    f1(a) = f.first;
    f2(a) = f.second;
  }
  // Derivatives in x_a = ln c_a: dy/dx = D = I - (1/3) 1 1^T.
  const Eigen::Vector3d phi_x = (f1.array() - f1.mean()).matrix();
  Eigen::Matrix3d phi_xx;
  for (int a = 0; a < 3; ++a) {
    for (int b = 0; b < 3; ++b) {
      phi_xx(a, b) = (a == b ? f2(a) : 0.0) - (f2(a) + f2(b)) / 3.0 + f2.sum() / 9.0;
    }
  }
  // Derivatives in c_a.
  Eigen::Vector3d w;
  Eigen::Matrix3d w2;
  for (int a = 0; a < 3; ++a) {
    w(a) = phi_x(a) / c(a);
    for (int b = 0; b < 3; ++b) {
      w2(a, b) = phi_xx(a, b) / (c(a) * c(b)) - (a == b ? phi_x(a) / (c(a) * c(a)) : 0.0);
    }
  }
  Eigen::Matrix3d theta = Eigen::Matrix3d::Zero();
  for (int a = 0; a < 3; ++a) {
    for (int b = 0; b < 3; ++b) {
      if (a == b) {
        continue;
      }
      const double gap = c(a) - c(b);
      theta(a, b) = std::abs(gap) > equal_eigenvalue_tolerance * std::max(c(a), c(b))
                        ? (w(a) - w(b)) / gap
                        : 0.5 * (w2(a, a) + w2(b, b)) - w2(a, b);
    }
  }

  Eigen::Matrix3d S;
  S.noalias() = Q * (2.0 * w).asDiagonal() * Q.transpose();
  out.energy = energy;
  out.first_piola.noalias() = F * S;
  out.admissible = true;
  if (need == Need::stress_only) {
    return;
  }

  const Eigen::Matrix3d FQ = F * Q;  // dC' = Q^T dC Q = (F Q)^T E Q + Q^T E^T (F Q)
  for (int k = 0; k < 3; ++k) {
    for (int l = 0; l < 3; ++l) {
      // Q^T E^T F Q with E = e_k e_l^T is (row l of Q)^T (row k of F Q).
      Eigen::Matrix3d dC_principal;
      dC_principal.noalias() = Q.row(l).transpose() * FQ.row(k);
      dC_principal += dC_principal.transpose().eval();
      Eigen::Matrix3d dS_principal;
      for (int a = 0; a < 3; ++a) {
        for (int b = 0; b < 3; ++b) {
          dS_principal(a, b) = a == b ? 2.0 * w2.row(a).dot(dC_principal.diagonal())
                                      : 2.0 * theta(a, b) * dC_principal(a, b);
        }
      }
      Eigen::Matrix3d dS;
      dS.noalias() = Q * dS_principal * Q.transpose();
      Eigen::Matrix3d dP;
      dP.noalias() = F * dS;
      dP.row(k) += S.row(l);  // E S
      for (int i = 0; i < 3; ++i) {
        for (int j = 0; j < 3; ++j) {
          out.tangent(tangent_index(i, j), tangent_index(k, l)) = dP(i, j);
        }
      }
    }
  }
}

}  // namespace plystrain::materials::detail
