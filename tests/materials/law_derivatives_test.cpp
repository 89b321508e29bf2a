// Every law: zero stress at F = I, P = dW/dF and dP/dF against central
// finite differences (common practice for verifying consistent tangents),
// and objectivity (rotating F rotates P and leaves W unchanged; Ogden,
// Non-linear Elastic Deformations, 1984, sec. 4.2).
#include "materials/law_test_support.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using namespace plystrain::materials;
using namespace plystrain::materials::testing;

namespace {

// Step for central differences: truncation h^2 and rounding eps/h balance
// near 1e-5 for O(1) entries of F.
constexpr double step = 1e-5;
constexpr double tolerance = 1e-6;

template <typename Evaluate>
void check_against_finite_differences(const NamedLaw& named, Evaluate evaluate_part,
                                      std::mt19937& random) {
  for (int sample = 0; sample < 6; ++sample) {
    const Eigen::Matrix3d F = random_deformation(random, 0.35);
    INFO(named.name << ", sample " << sample << ", det F = " << F.determinant());
    const PointResponse response = evaluate_part(named.law, F);
    REQUIRE(response.admissible);
    const Eigen::Matrix3d stress_fd = central_difference_of_energy(
        [&](const Eigen::Matrix3d& G) { return evaluate_part(named.law, G).energy; }, F, step);
    CHECK(relative_difference(response.first_piola, stress_fd) < tolerance);
    const Matrix9d tangent_fd = central_difference_of_stress(
        [&](const Eigen::Matrix3d& G) { return evaluate_part(named.law, G).first_piola; }, F,
        step);
    CHECK(relative_difference(response.tangent, tangent_fd) < tolerance);
  }
}

}  // namespace

TEST_CASE("every law is stress free at F = I with zero energy", "[materials][law]") {
  // A natural reference state (Ogden 1984, sec. 4.2.3): W(I) = 0, P(I) = 0.
  for (const NamedLaw& named : every_kind()) {
    INFO(named.name);
    const PointResponse response = evaluate(named.law, Eigen::Matrix3d::Identity());
    CHECK(response.admissible);
    CHECK(std::abs(response.energy) < 1e-15);
    CHECK(response.first_piola.norm() < 1e-14);
  }
}

TEST_CASE("stress and tangent match central differences", "[materials][law]") {
  std::mt19937 random(20240611);
  for (const NamedLaw& named : every_kind()) {
    check_against_finite_differences(
        named, [](const LawParameters& law, const Eigen::Matrix3d& F) { return evaluate(law, F); }, random);
  }
}

TEST_CASE("a stress-only evaluation gives the same energy and stress and no tangent", "[materials][law]") {
  std::mt19937 random(20261202);
  for (const NamedLaw& named : every_kind()) {
    for (int sample = 0; sample < 4; ++sample) {
      const Eigen::Matrix3d F = random_deformation(random, 0.35);
      INFO(named.name << ", sample " << sample);
      const PointResponse full = evaluate(named.law, F);
      const PointResponse stress = evaluate(named.law, F, Need::stress_only);
      REQUIRE(stress.admissible);
      CHECK(stress.energy == full.energy);
      CHECK((stress.first_piola - full.first_piola).norm() == 0.0);
      CHECK(stress.tangent.norm() == 0.0);
      const PointResponse iso = evaluate_isochoric(named.law, F, Need::stress_only);
      CHECK((iso.first_piola - evaluate_isochoric(named.law, F).first_piola).norm() == 0.0);
    }
  }
}

TEST_CASE("isochoric part alone matches central differences and is volume blind",
          "[materials][law]") {
  std::mt19937 random(4711);
  for (const NamedLaw& named : every_kind()) {
    check_against_finite_differences(
        named, [](const LawParameters& law, const Eigen::Matrix3d& F) { return evaluate_isochoric(law, F); },
        random);
    // W_iso(s F) = W_iso(F) for any s > 0, since Fbar is unchanged.
    const Eigen::Matrix3d F = random_deformation(random, 0.3);
    INFO(named.name);
    CHECK(evaluate_isochoric(named.law, 1.7 * F).energy ==
          Approx(evaluate_isochoric(named.law, F).energy).epsilon(1e-12));
  }
}

TEST_CASE("volumetric part: derivatives of U(J) and its split from the full law",
          "[materials][law]") {
  const LawParameters law = neo_hookean(1.0, 5.0);
  for (const double J : {0.2, 0.7, 1.0, 1.3, 3.0}) {
    INFO("J = " << J);
    const VolumetricResponse u = evaluate_volumetric(law, J);
    const double h = 1e-6;
    const VolumetricResponse up = evaluate_volumetric(law, J + h);
    const VolumetricResponse um = evaluate_volumetric(law, J - h);
    CHECK(u.pressure == Approx((up.energy - um.energy) / (2 * h)).epsilon(1e-7).margin(1e-9));
    CHECK(u.stiffness == Approx((up.pressure - um.pressure) / (2 * h)).epsilon(1e-7));
    CHECK(u.stiffness > 0.0);
  }
  // U(1) = U'(1) = 0 and U''(1) = kappa, so kappa is the small-strain bulk modulus.
  const VolumetricResponse at_rest = evaluate_volumetric(law, 1.0);
  CHECK(at_rest.energy == 0.0);
  CHECK(at_rest.pressure == 0.0);
  CHECK(at_rest.stiffness == Approx(5.0).epsilon(1e-15));

  // W = W_iso + U(J), P = P_iso + U'(J) J F^-T.
  std::mt19937 random(99);
  for (const NamedLaw& named : every_kind()) {
    const Eigen::Matrix3d F = random_deformation(random, 0.3);
    const double J = F.determinant();
    const PointResponse full = evaluate(named.law, F);
    const PointResponse iso = evaluate_isochoric(named.law, F);
    const VolumetricResponse vol = evaluate_volumetric(named.law, J);
    INFO(named.name);
    CHECK(full.energy == Approx(iso.energy + vol.energy).epsilon(1e-13));
    const Eigen::Matrix3d P_vol = vol.pressure * J * F.inverse().transpose();
    CHECK(relative_difference(full.first_piola, Eigen::Matrix3d(iso.first_piola + P_vol)) <
          1e-13);
  }
}

TEST_CASE("every law is objective", "[materials][law]") {
  std::mt19937 random(1234);
  for (const NamedLaw& named : every_kind()) {
    for (int sample = 0; sample < 5; ++sample) {
      const Eigen::Matrix3d F = random_deformation(random, 0.35);
      const Eigen::Matrix3d Q = random_rotation(random);
      INFO(named.name << ", sample " << sample);
      const PointResponse reference = evaluate(named.law, F);
      const PointResponse rotated = evaluate(named.law, Q * F);
      CHECK(rotated.energy == Approx(reference.energy).epsilon(1e-12));
      CHECK(relative_difference(rotated.first_piola, Eigen::Matrix3d(Q * reference.first_piola)) <
            1e-12);
      // A(QF)_ijkl = Q_im Q_kn A(F)_mjnl.
      Matrix9d expected = Matrix9d::Zero();
      for (int i = 0; i < 3; ++i) {
        for (int j = 0; j < 3; ++j) {
          for (int k = 0; k < 3; ++k) {
            for (int l = 0; l < 3; ++l) {
              for (int m = 0; m < 3; ++m) {
                for (int n = 0; n < 3; ++n) {
                  expected(3 * i + j, 3 * k + l) +=
                      Q(i, m) * Q(k, n) * reference.tangent(3 * m + j, 3 * n + l);
                }
              }
            }
          }
        }
      }
      CHECK(relative_difference(rotated.tangent, expected) < 1e-12);
    }
  }
}

TEST_CASE("tangent has the major symmetry of a hyperelastic law", "[materials][law]") {
  // dP_ij/dF_kl = d2W/dF_ij dF_kl is symmetric (common practice).
  std::mt19937 random(77);
  for (const NamedLaw& named : every_kind()) {
    const Eigen::Matrix3d F = random_deformation(random, 0.35);
    const Matrix9d A = evaluate(named.law, F).tangent;
    INFO(named.name);
    CHECK((A - A.transpose()).norm() < 1e-12 * A.norm());
  }
}

TEST_CASE("Ogden and Hencky tangents are exact at equal and near-equal stretches",
          "[materials][law][ogden]") {
  // The principal-stretch formula has removable 0/0 terms when eigenvalues of
  // C coincide; check F = I, exactly equal pairs, and pairs 1e-9 and 1e-5
  // apart, each rotated so that the eigenvectors are not the axes.
  std::mt19937 random(31337);
  const Eigen::Matrix3d R = random_rotation(random);
  const Eigen::Matrix3d S = random_rotation(random);
  for (const LawParameters& law : {ogden_1972(4.0), linear_elastic(10.0, 0.3)}) {
    for (const Eigen::Vector3d& stretches :
         {Eigen::Vector3d(1.0, 1.0, 1.0), Eigen::Vector3d(1.2, 1.2, 0.8),
          Eigen::Vector3d(1.3, 1.3, 1.3), Eigen::Vector3d(1.1, 1.1 + 1e-9, 0.9),
          Eigen::Vector3d(1.1, 1.1 + 1e-5, 0.9), Eigen::Vector3d(0.7, 1.0 + 1e-8, 1.0)}) {
      const Eigen::Matrix3d F = R * stretches.asDiagonal() * S;
      INFO(model_key(law.kind) << " stretches " << stretches.transpose());
      const PointResponse response = evaluate(law, F);
      REQUIRE(response.admissible);
      CHECK(response.tangent.allFinite());
      const Matrix9d tangent_fd = central_difference_of_stress(
          [&](const Eigen::Matrix3d& G) { return evaluate(law, G).first_piola; }, F, step);
      CHECK(relative_difference(response.tangent, tangent_fd) < tolerance);
      // At a pure rotation P = 0, so the stress check is absolute there.
      const Eigen::Matrix3d stress_fd = central_difference_of_energy(
          [&](const Eigen::Matrix3d& G) { return evaluate(law, G).energy; }, F, step);
      CHECK((response.first_piola - stress_fd).norm() < tolerance * (1.0 + stress_fd.norm()));
    }
  }
}

TEST_CASE("states outside a law's domain are inadmissible, never NaN", "[materials][law]") {
  const Eigen::Matrix3d inverted = Eigen::Vector3d(1.0, 1.0, -0.5).asDiagonal();
  const Eigen::Matrix3d flat = Eigen::Vector3d(1.0, 1.0, 0.0).asDiagonal();
  for (const NamedLaw& named : every_kind()) {
    for (const Eigen::Matrix3d& F : {inverted, flat}) {
      INFO(named.name);
      const PointResponse response = evaluate(named.law, F);
      CHECK_FALSE(response.admissible);
      CHECK(std::isfinite(response.energy));
      CHECK(response.first_piola.allFinite());
      CHECK(response.tangent.allFinite());
    }
    CHECK_FALSE(evaluate_volumetric(named.law, 0.0).admissible);
    CHECK_FALSE(evaluate_volumetric(named.law, -1.0).admissible);
  }

  // Gent locks at I1bar - 3 = Jm. Uniaxial isochoric stretch lambda:
  // I1bar - 3 = lambda^2 + 2/lambda - 3; Jm = 10 is reached near lambda = 3.5.
  const LawParameters law = gent(1.0, 10.0, 5.0);
  const auto uniaxial = [](double lambda) {
    return Eigen::Matrix3d(Eigen::Vector3d(lambda, 1 / std::sqrt(lambda), 1 / std::sqrt(lambda))
                               .asDiagonal());
  };
  CHECK(evaluate(law, uniaxial(3.4)).admissible);
  for (const double lambda : {3.6, 5.0, 50.0}) {
    const PointResponse response = evaluate(law, uniaxial(lambda));
    INFO("lambda = " << lambda);
    CHECK_FALSE(response.admissible);
    CHECK(response.first_piola.allFinite());
    CHECK(response.tangent.allFinite());
  }
}
