// Small-strain limit: every law's tangent at F = I is Hooke's elasticity
// tensor with the E, nu of its initial moduli, and P at a strain of 1e-6 is
// Hooke's stress to first order (Timoshenko & Goodier, Theory of
// Elasticity, 1970).
#include "materials/law_test_support.hpp"

#include <catch2/catch.hpp>

using namespace plystrain::materials;
using namespace plystrain::materials::testing;

TEST_CASE("tangent at F = I is Hooke's tensor with the same E and nu", "[materials][law]") {
  for (const NamedLaw& named : every_kind()) {
    const YoungPoisson elastic =
        to_young_poisson(initial_shear_modulus(named.law), initial_bulk_modulus(named.law));
    INFO(named.name << ": E = " << elastic.youngs_modulus << ", nu = " << elastic.poisson_ratio);
    const Matrix9d tangent = evaluate(named.law, Eigen::Matrix3d::Identity()).tangent;
    CHECK(relative_difference(tangent, hooke_tensor(elastic.youngs_modulus,
                                                    elastic.poisson_ratio)) < 1e-12);
  }
}

TEST_CASE("linear-elastic reproduces Hooke's stress for its E and nu", "[materials][law]") {
  // E = 10 MPa, nu = 0.3: the law's own parameters, no conversion in between.
  const LawParameters law = linear_elastic(10.0, 0.3);
  const Matrix9d hooke = hooke_tensor(10.0, 0.3);
  std::mt19937 random(5);
  for (int sample = 0; sample < 5; ++sample) {
    const double size = 1e-6;
    const Eigen::Matrix3d displacement_gradient =
        (random_deformation(random, 1.0) - Eigen::Matrix3d::Identity()) * size;
    const Eigen::Matrix3d F = Eigen::Matrix3d::Identity() + displacement_gradient;
    const Eigen::Matrix3d strain =
        0.5 * (displacement_gradient + displacement_gradient.transpose());
    Eigen::Matrix3d sigma;
    for (int i = 0; i < 3; ++i) {
      for (int j = 0; j < 3; ++j) {
        sigma(i, j) = 0.0;
        for (int k = 0; k < 3; ++k) {
          for (int l = 0; l < 3; ++l) {
            sigma(i, j) += hooke(3 * i + j, 3 * k + l) * strain(k, l);
          }
        }
      }
    }
    // P - sigma = O(|grad u|^2): relative error of order the strain.
    CHECK(relative_difference(evaluate(law, F).first_piola, sigma) < 1e-5);
  }
  // Uniaxial stress: with the lateral stretches free, the lateral contraction
  // is -nu times the axial strain and the axial stress E times it.
  const double strain = 1e-6;
  double lateral = 1.0;
  for (int iteration = 0; iteration < 20; ++iteration) {
    const Eigen::Matrix3d F = Eigen::Vector3d(1.0 + strain, lateral, lateral).asDiagonal();
    const PointResponse r = evaluate(law, F);
    lateral -= r.first_piola(1, 1) / (r.tangent(4, 4) + r.tangent(4, 8));
  }
  const PointResponse r =
      evaluate(law, Eigen::Matrix3d(Eigen::Vector3d(1.0 + strain, lateral, lateral).asDiagonal()));
  CHECK((1.0 - lateral) / strain == Approx(0.3).epsilon(1e-5));
  CHECK(r.first_piola(0, 0) / strain == Approx(10.0).epsilon(1e-5));
}

TEST_CASE("(E, nu) and (mu, kappa) conversions are inverse and match the textbook",
          "[materials][law]") {
  // mu = E/(2(1 + nu)), kappa = E/(3(1 - 2 nu)) (Timoshenko & Goodier 1970):
  // E = 210000, nu = 0.3 gives mu = 80769.23, kappa = 175000.
  const ShearBulk steel = to_shear_bulk(210000.0, 0.3);
  CHECK(steel.shear_modulus == Approx(80769.230769).epsilon(1e-9));
  CHECK(steel.bulk_modulus == Approx(175000.0).epsilon(1e-12));
  for (const double nu : {-0.9, 0.0, 0.25, 0.49, 0.4999}) {
    const ShearBulk moduli = to_shear_bulk(3.0, nu);
    const YoungPoisson back = to_young_poisson(moduli.shear_modulus, moduli.bulk_modulus);
    CHECK(back.youngs_modulus == Approx(3.0).epsilon(1e-12));
    CHECK(back.poisson_ratio == Approx(nu).epsilon(1e-12).margin(1e-14));
  }
  // neo-Hookean given by (E, nu) evaluates with the converted moduli.
  LawParameters by_young;
  by_young.kind = ModelKind::neo_hookean;
  by_young.youngs_modulus = 1.5;
  by_young.poisson_ratio = 0.499;
  CHECK(initial_shear_modulus(by_young) == Approx(1.5 / (2 * 1.499)).epsilon(1e-14));
  CHECK(initial_bulk_modulus(by_young) == Approx(1.5 / (3 * 0.002)).epsilon(1e-12));
  // ... and gives its Young's modulus back (E = 9 kappa mu / (3 kappa + mu)).
  CHECK(initial_youngs_modulus(by_young) == Approx(1.5).epsilon(1e-12));
  // Initial shear moduli of the other kinds (Holzapfel, Nonlinear Solid
  // Mechanics, 2000, sec. 6.5): MR 2(c10 + c01), Yeoh 2 c10, Ogden
  // sum(mu_p alpha_p)/2 = 0.4225 MPa for the 1972 fit (verification.md).
  CHECK(initial_shear_modulus(mooney_rivlin(0.3, 0.1, 4.0)) == Approx(0.8));
  CHECK(initial_shear_modulus(yeoh(0.5, -0.05, 0.01, 6.0)) == Approx(1.0));
  CHECK(initial_shear_modulus(ogden_1972(4.0)) == Approx(0.4225).epsilon(1e-12));
}
