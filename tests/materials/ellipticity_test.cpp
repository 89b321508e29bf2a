// Strong ellipticity at kappa/mu = 1e5: the acoustic tensor
// Q_ik(N) = A_ijkl N_j N_l must be positive definite for every direction N
// (Ogden, Non-linear Elastic Deformations, 1984, sec. 6.2.7). The chosen
// volumetric energy must not spoil it at large kappa/mu.
#include "materials/law_test_support.hpp"

#include <Eigen/Eigenvalues>
#include <catch2/catch.hpp>

#include <cmath>

using namespace plystrain::materials;
using namespace plystrain::materials::testing;

namespace {

double smallest_acoustic_eigenvalue(const Matrix9d& A, const Eigen::Vector3d& N) {
  Eigen::Matrix3d Q = Eigen::Matrix3d::Zero();
  for (int i = 0; i < 3; ++i) {
    for (int k = 0; k < 3; ++k) {
      for (int j = 0; j < 3; ++j) {
        for (int l = 0; l < 3; ++l) {
          Q(i, k) += A(3 * i + j, 3 * k + l) * N(j) * N(l);
        }
      }
    }
  }
  const Eigen::Matrix3d symmetric = 0.5 * (Q + Q.transpose());
  return Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d>(symmetric).eigenvalues().minCoeff();
}

void check_strongly_elliptic(const LawParameters& law, const std::vector<double>& stretches) {
  std::mt19937 random(2718);
  std::normal_distribution<double> normal(0.0, 1.0);
  const double mu = initial_shear_modulus(law);
  const Eigen::Matrix3d R = random_rotation(random);
  for (const double lambda : stretches) {
    // Uniaxial isochoric stretch with a small volume change, rotated.
    const double volume = 1.0 + 1e-5;
    const Eigen::Matrix3d F =
        R * Eigen::Vector3d(lambda, 1 / std::sqrt(lambda), 1 / std::sqrt(lambda)).asDiagonal() *
        std::cbrt(volume);
    const Matrix9d A = evaluate(law, F).tangent;
    double smallest = 1e300;
    for (int sample = 0; sample < 200; ++sample) {
      const Eigen::Vector3d N =
          Eigen::Vector3d(normal(random), normal(random), normal(random)).normalized();
      smallest = std::min(smallest, smallest_acoustic_eigenvalue(A, N));
    }
    INFO(model_key(law.kind) << " lambda = " << lambda << ": smallest acoustic eigenvalue / mu = "
                             << smallest / mu);
    // Rounding on a tensor of size kappa = 1e5 mu is about 1e-10 mu; the
    // shear eigenvalues are of order mu.
    CHECK(smallest > 1e-3 * mu);
  }
}

constexpr double kappa_over_mu = 1e5;

}  // namespace

TEST_CASE("laws stay strongly elliptic at kappa/mu = 1e5", "[materials][law]") {
  const std::vector<double> large = {0.4, 0.7, 1.0, 1.5, 2.5, 4.0};
  check_strongly_elliptic(neo_hookean(1.0, kappa_over_mu), large);
  check_strongly_elliptic(mooney_rivlin(0.4, 0.1, kappa_over_mu), large);
  check_strongly_elliptic(yeoh(0.5, 0.02, 0.001, kappa_over_mu), large);
  check_strongly_elliptic(gent(1.0, 30.0, kappa_over_mu), large);
  check_strongly_elliptic(ogden_1972(kappa_over_mu * 0.4225), large);
  // The isochoric Hencky energy of linear-elastic is elliptic only at
  // moderate strain (Bruhns, Xiao & Meyers, Proc. R. Soc. A 457, 2207, 2001,
  // from memory); it is a small-strain law and checked there.
  check_strongly_elliptic(linear_elastic(1.0, 0.5 - 1.5 / kappa_over_mu), {0.9, 1.0, 1.1});
}

TEST_CASE("volumetric energy is convex for every J > 0", "[materials][law]") {
  // U'' = kappa/2 (1 + 1/J^2) > 0 (Simo & Taylor, CMAME 35, 107, 1982).
  const LawParameters law = neo_hookean(1.0, 1e5);
  for (const double J : {1e-3, 0.1, 0.5, 1.0, 2.0, 10.0, 1e3}) {
    INFO("J = " << J);
    CHECK(evaluate_volumetric(law, J).stiffness >= 0.5e5);
  }
}
