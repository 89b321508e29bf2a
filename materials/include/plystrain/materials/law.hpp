// Pointwise constitutive laws: a 3x3 deformation gradient in, energy, first
// Piola-Kirchhoff stress and its tangent out. Nothing here knows of meshes,
// files or the solver.
//
// Every law is written as an isochoric part W_iso(Fbar), Fbar = J^(-1/3) F,
// plus a volumetric part U(J). The split is exposed so that a mixed
// displacement-pressure element can replace the pointwise pressure U'(J) by
// its own field.
#pragma once

#include <Eigen/Core>

#include <string>
#include <vector>

namespace plystrain::materials {

enum class ModelKind { linear_elastic, neo_hookean, mooney_rivlin, yeoh, gent, ogden };

[[nodiscard]] const char* model_key(ModelKind kind);  // "neo-hookean", ...

// Parameters of one law in MPa. Only the members of the chosen kind are read.
struct LawParameters {
  ModelKind kind = ModelKind::neo_hookean;
  double shear_modulus = 0.0;  // mu (initial shear modulus for every kind)
  double bulk_modulus = 0.0;   // kappa
  // linear-elastic keeps E and nu for reporting; mu and kappa are derived.
  double youngs_modulus = 0.0;
  double poisson_ratio = 0.0;
  double c10 = 0.0, c01 = 0.0, c20 = 0.0, c30 = 0.0;  // Mooney-Rivlin, Yeoh
  double jm = 0.0;                                    // Gent locking parameter
  std::vector<double> ogden_mu;                       // Ogden terms
  std::vector<double> ogden_alpha;
};

using Matrix9d = Eigen::Matrix<double, 9, 9>;

// Tangent layout: dP/dF as a 9x9 matrix with row index 3*i + j for P(i, j)
// and column index 3*k + l for F(k, l).
//
// admissible is false where the law is not defined: det F <= 0, or a Gent
// material stretched to or beyond its locking limit. Energy, stress and
// tangent are then all zero (never NaN) and must not be used: the caller
// treats the state as a failed trial (cut the step back).
struct PointResponse {
  double energy = 0.0;
  Eigen::Matrix3d first_piola = Eigen::Matrix3d::Zero();
  Matrix9d tangent = Matrix9d::Zero();
  bool admissible = true;
};

// The volumetric function and its first two derivatives at J.
struct VolumetricResponse {
  double energy = 0.0;        // U(J)
  double pressure = 0.0;      // U'(J)
  double stiffness = 0.0;     // U''(J)
  bool admissible = true;     // false for J <= 0 (all values then zero)
};

// What a caller needs from a law: residual evaluations (line searches,
// post-processing) need only the energy and P, and skip the tangent, which
// costs several times as much. With stress_only the tangent is left zero.
enum class Need { stress_only, stress_and_tangent };

// Full response W(F) = W_iso(Fbar) + U(J). Requires det F > 0.
[[nodiscard]] PointResponse evaluate(const LawParameters& law, const Eigen::Matrix3d& F,
                                     Need need = Need::stress_and_tangent);

// Isochoric part only: W_iso(J^(-1/3) F), its P and dP/dF with respect to F.
[[nodiscard]] PointResponse evaluate_isochoric(const LawParameters& law, const Eigen::Matrix3d& F,
                                               Need need = Need::stress_and_tangent);

// Volumetric part only.
[[nodiscard]] VolumetricResponse evaluate_volumetric(const LawParameters& law, double J);

// Initial (small-strain) moduli, used for the choice of the locking cure, for
// reports and for the small-strain limit checks.
[[nodiscard]] double initial_shear_modulus(const LawParameters& law);
[[nodiscard]] double initial_bulk_modulus(const LawParameters& law);
// 9 kappa mu / (3 kappa + mu), from the two above.
[[nodiscard]] double initial_youngs_modulus(const LawParameters& law);

// Conversions between (E, nu) and (mu, kappa), 3D isotropic.
struct ShearBulk {
  double shear_modulus;
  double bulk_modulus;
};
struct YoungPoisson {
  double youngs_modulus;
  double poisson_ratio;
};
[[nodiscard]] ShearBulk to_shear_bulk(double youngs_modulus, double poisson_ratio);
[[nodiscard]] YoungPoisson to_young_poisson(double shear_modulus, double bulk_modulus);

// Checks that the parameters describe a usable law (positive moduli, Ogden
// arrays of equal length with positive initial shear modulus, poisson ratio
// in (-1, 0.5), ...). Returns an empty string when valid, otherwise a message
// that says what is wrong and, where useful, what to do instead.
[[nodiscard]] std::string validate(const LawParameters& law);

}  // namespace plystrain::materials
