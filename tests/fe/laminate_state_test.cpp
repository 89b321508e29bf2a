// The undisturbed laminate state under a uniform stretch, against the
// incompressible closed forms and the equilibrium conditions it must meet.
#include "plystrain/solver/laminate_state.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using plystrain::LaminateLayer;
using plystrain::stretched_laminate;
using plystrain::ThirdStretch;

namespace {

LaminateLayer neo_hookean(double shear, double bulk, double thickness) {
  LaminateLayer layer;
  layer.law.kind = plystrain::materials::ModelKind::neo_hookean;
  layer.law.shear_modulus = shear;
  layer.law.bulk_modulus = bulk;
  layer.thickness = thickness;
  return layer;
}

}  // namespace

TEST_CASE("one nearly incompressible layer: uniaxial, planar and equibiaxial nominal stress",
          "[fe][laminate]") {
  // Incompressible neo-Hookean nominal stresses (Ogden, Non-linear Elastic
  // Deformations, 1984): uniaxial mu (l - l^-2), pure shear mu (l - l^-3),
  // equibiaxial mu (l - l^-5); kappa / mu = 1e4 here, so within a few mu/kappa.
  const double mu = 1.0;
  const LaminateLayer layer = neo_hookean(mu, 1e4, 1.0);
  const double l = 1.3;
  const double tolerance = 5e-4;
  ThirdStretch free;
  free.kind = ThirdStretch::Kind::free;
  const auto uniaxial = stretched_laminate({layer}, l, free);
  REQUIRE(uniaxial);
  CHECK(uniaxial->nominal_stress_xx[0] == Approx(mu * (l - std::pow(l, -2))).epsilon(tolerance));
  // Free contraction: both other stretches near l^-1/2.
  CHECK(uniaxial->third_stretch == Approx(std::pow(l, -0.5)).epsilon(tolerance));
  CHECK(uniaxial->thickness_stretch[0] == Approx(std::pow(l, -0.5)).epsilon(tolerance));

  const auto planar = stretched_laminate({layer}, l, ThirdStretch{});
  REQUIRE(planar);
  CHECK(planar->nominal_stress_xx[0] == Approx(mu * (l - std::pow(l, -3))).epsilon(tolerance));

  ThirdStretch equibiaxial;
  equibiaxial.kind = ThirdStretch::Kind::equibiaxial;
  const auto biaxial = stretched_laminate({layer}, l, equibiaxial);
  REQUIRE(biaxial);
  CHECK(biaxial->nominal_stress_xx[0] == Approx(mu * (l - std::pow(l, -5))).epsilon(tolerance));
}

TEST_CASE("a bilayer with a free third direction: each face traction-free, no net force across",
          "[fe][laminate]") {
  // Equilibrium of the laminate state (common practice): P_zz = 0 in every
  // layer (free top and bottom, continuity of the normal traction), and
  // with the third direction free the thickness-weighted P_33 sums to zero.
  const std::vector<LaminateLayer> layers = {neo_hookean(0.5, 250.0, 100.0),
                                             neo_hookean(400.0, 900.0, 0.1)};
  ThirdStretch free;
  free.kind = ThirdStretch::Kind::free;
  const double l = 1.2;
  const auto state = stretched_laminate(layers, l, free);
  REQUIRE(state);
  double net = 0.0;
  for (std::size_t i = 0; i < layers.size(); ++i) {
    Eigen::Matrix3d F = Eigen::Matrix3d::Zero();
    F(0, 0) = l;
    F(1, 1) = state->thickness_stretch[i];
    F(2, 2) = state->third_stretch;
    const auto response = plystrain::materials::evaluate(layers[i].law, F);
    CHECK(std::abs(response.first_piola(1, 1)) < 1e-9 * layers[i].law.bulk_modulus);
    CHECK(response.first_piola(0, 0) == Approx(state->nominal_stress_xx[i]).epsilon(1e-12));
    net += layers[i].thickness * response.first_piola(2, 2);
  }
  CHECK(std::abs(net) < 1e-9 * 900.0 * 0.1);
  // The soft thick base sets the common contraction: close to its own
  // uniaxial value l^-1/2, pulled a little towards the stiff film's.
  CHECK(state->third_stretch < 1.0);
}
