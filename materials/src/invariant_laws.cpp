// Isochoric laws written in the invariants of Cbar = J^(-2/3) C:
// neo-Hookean, Mooney-Rivlin, Yeoh, Gent (forms as in Holzapfel, Nonlinear
// Solid Mechanics, 2000, ch. 6; Gent, Rubber Chem. Technol. 69, 59, 1996).
#include "law_detail.hpp"

#include <Eigen/LU>

#include <cmath>

namespace plystrain::materials::detail {
namespace {

// W_iso = psi(I1bar, I2bar) and its derivatives.
struct InvariantEnergy {
  double psi = 0.0;
  double d1 = 0.0, d2 = 0.0;              // dpsi/dI1bar, dpsi/dI2bar
  double d11 = 0.0, d12 = 0.0, d22 = 0.0;  // second derivatives
  bool admissible = true;
};

InvariantEnergy invariant_energy(const LawParameters& law, double i1bar, double i2bar) {
  InvariantEnergy e;
  const double t1 = i1bar - 3.0;
  switch (law.kind) {
    case ModelKind::neo_hookean: {
      const double mu = resolved_moduli(law).shear_modulus;
      e.psi = 0.5 * mu * t1;
      e.d1 = 0.5 * mu;
      break;
    }
    case ModelKind::mooney_rivlin:
      e.psi = law.c10 * t1 + law.c01 * (i2bar - 3.0);
      e.d1 = law.c10;
      e.d2 = law.c01;
      break;
    case ModelKind::yeoh:
      e.psi = t1 * (law.c10 + t1 * (law.c20 + t1 * law.c30));
      e.d1 = law.c10 + t1 * (2.0 * law.c20 + 3.0 * t1 * law.c30);
      e.d11 = 2.0 * law.c20 + 6.0 * law.c30 * t1;
      break;
    case ModelKind::gent: {
      // psi = -mu Jm/2 ln(1 - t1/Jm), defined only for t1 < Jm (the chains
      // lock as t1 -> Jm and the energy grows without bound).
      const double room = law.jm - t1;
      if (!(room > 0.0)) {
        e.admissible = false;
        return e;
      }
      e.psi = -0.5 * law.shear_modulus * law.jm * std::log(room / law.jm);
      e.d1 = 0.5 * law.shear_modulus * law.jm / room;
      e.d11 = e.d1 / room;
      break;
    }
    case ModelKind::linear_elastic:
    case ModelKind::ogden:
      e.admissible = false;  // not invariant laws; never dispatched here
      break;
  }
  return e;
}

// The row-major 9-vector of a 3x3 matrix, in the tangent's index order.
Eigen::Matrix<double, 9, 1> flat(const Eigen::Matrix3d& m) {
  Eigen::Matrix<double, 9, 1> v;
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) {
      v(tangent_index(i, j)) = m(i, j);
    }
  }
  return v;
}

// dP/dF for a law in I1bar alone (neo-Hookean, Yeoh, Gent), as whole outer
// products: the same derivative as the column-by-column loop below with the
// I2 terms zero, written so that it vectorises (these laws are the common
// case and the tangent is most of their cost):
//   d g1_ij / dF_kl = 2a [ d_ik d_jl - 2/3 (F_ij G_kl + G_ij F_kl)
//                          + 2/9 I1 G_ij G_kl + 1/3 I1 G_il G_kj ]
//   dP = psi_1 d g1 + psi_11 g1 (x) g1
void first_invariant_tangent(const Eigen::Matrix3d& F, const Eigen::Matrix3d& G, const Eigen::Matrix3d& g1,
                             double a, double i1, double d1, double d11, Matrix9d& tangent) {
  const Eigen::Matrix<double, 9, 1> f = flat(F);
  const Eigen::Matrix<double, 9, 1> g = flat(G);
  const Eigen::Matrix<double, 9, 1> h = flat(g1);
  const double scale = 2.0 * a * d1;
  tangent.noalias() = (-2.0 / 3.0 * scale) * (f * g.transpose() + g * f.transpose());
  tangent.noalias() += (2.0 / 9.0 * scale * i1) * (g * g.transpose());
  if (d11 != 0.0) {
    tangent.noalias() += d11 * (h * h.transpose());
  }
  const double swap = scale * i1 / 3.0;
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) {
      for (int k = 0; k < 3; ++k) {
        for (int l = 0; l < 3; ++l) {
          tangent(tangent_index(i, j), tangent_index(k, l)) += swap * G(i, l) * G(k, j);
        }
      }
    }
  }
  tangent.diagonal().array() += scale;
}

}  // namespace

// With a = J^(-2/3), G = F^-T, C = F^T F, I1 = tr C, I2 = (I1^2 - C:C)/2:
//   g1 = dI1bar/dF = 2a (F - I1/3 G)
//   g2 = dI2bar/dF = a^2 (2 (I1 F - F C) - 4/3 I2 G)
//   P  = psi_1 g1 + psi_2 g2
// The tangent is built one column at a time: column (k, l) is the
// directional derivative of P along E = e_k e_l^T, using
//   dJ/J = G:E, dG = -G E^T G, dI1 = 2 F:E, dC = E^T F + F^T E.
void isochoric_invariant_law(const LawParameters& law, const Eigen::Matrix3d& F, Need need,
                             PointResponse& out) {
  const double J = F.determinant();
  const Eigen::Matrix3d G = F.inverse().transpose();
  const Eigen::Matrix3d C = F.transpose() * F;
  Eigen::Matrix3d FC;
  FC.noalias() = F * C;
  const double i1 = C.trace();
  const double i2 = 0.5 * (i1 * i1 - C.squaredNorm());
  const double a = std::pow(J, -2.0 / 3.0);
  const double b = a * a;
  const double i1bar = a * i1;
  const double i2bar = b * i2;

  const InvariantEnergy e = invariant_energy(law, i1bar, i2bar);
  if (!e.admissible) {
    out = PointResponse{};
    out.admissible = false;
    return;
  }
  const bool uses_i2 = e.d2 != 0.0 || e.d12 != 0.0 || e.d22 != 0.0;

  const Eigen::Matrix3d dev1 = F - (i1 / 3.0) * G;
  const Eigen::Matrix3d h2 = 2.0 * (i1 * F - FC);  // dI2/dF
  const Eigen::Matrix3d g1 = 2.0 * a * dev1;
  const Eigen::Matrix3d g2 = b * (h2 - (4.0 / 3.0) * i2 * G);

  out.energy = e.psi;
  out.first_piola = e.d1 * g1;
  if (uses_i2) {
    out.first_piola.noalias() += e.d2 * g2;
  }
  out.admissible = true;
  if (need == Need::stress_only) {
    return;
  }
  if (!uses_i2) {
    first_invariant_tangent(F, G, g1, a, i1, e.d1, e.d11, out.tangent);
    return;
  }

  for (int k = 0; k < 3; ++k) {
    for (int l = 0; l < 3; ++l) {
      const double trace_term = G(k, l);            // G : E
      const double di1 = 2.0 * F(k, l);            // 2 F : E
      // G E^T G = (column l of G)(row k of G)
      const Eigen::Matrix3d dG = -G.col(l) * G.row(k);
      Eigen::Matrix3d dg1 = (-4.0 / 3.0 * a * trace_term) * dev1 - (2.0 * a * di1 / 3.0) * G -
                            (2.0 * a * i1 / 3.0) * dG;
      dg1(k, l) += 2.0 * a;
      const double di1bar = g1(k, l);
      Eigen::Matrix3d dP = e.d1 * dg1 + (e.d11 * di1bar) * g1;
      if (uses_i2) {
        const double di2bar = g2(k, l);
        const double di2 = h2(k, l);
        // dC = E^T F + F^T E; E C puts row l of C into row k.
        Eigen::Matrix3d dC = Eigen::Matrix3d::Zero();
        dC.row(l) += F.row(k);
        dC.col(l) += F.row(k).transpose();
        Eigen::Matrix3d dFC;
        dFC.noalias() = F * dC;
        dFC.row(k) += C.row(l);
        Eigen::Matrix3d dh2 = 2.0 * (di1 * F - dFC);
        dh2(k, l) += 2.0 * i1;
        const Eigen::Matrix3d dg2 = (-4.0 / 3.0 * trace_term) * g2 +
                                    b * (dh2 - (4.0 / 3.0) * (di2 * G + i2 * dG));
        dP.noalias() += e.d2 * dg2;
        dP.noalias() += (e.d12 * di2bar) * g1 + (e.d12 * di1bar + e.d22 * di2bar) * g2;
      }
      for (int i = 0; i < 3; ++i) {
        for (int j = 0; j < 3; ++j) {
          out.tangent(tangent_index(i, j), tangent_index(k, l)) = dP(i, j);
        }
      }
    }
  }
}

}  // namespace plystrain::materials::detail
