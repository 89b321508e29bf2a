// Dispatch from a law's kind to its isochoric part, plus the shared
// volumetric part.
//
// linear-elastic is the isochoric Hencky energy mu |ln Vbar|^2 (Vbar the
// isochoric left stretch) plus the volumetric U(J) of volumetric.cpp. At
// small strain ln Vbar -> dev(eps) and U -> kappa/2 (tr eps)^2, so the energy
// is exactly Hooke's mu |dev eps|^2 + kappa/2 (tr eps)^2 with the same E and
// nu. At finite strain it is an objective, isotropic hyperelastic law with a
// constant shear modulus in logarithmic strain; it is not a linear law in any
// finite-strain measure beyond small strain, so the solver warns when it is
// used for large strain.
#include "law_detail.hpp"

#include <Eigen/LU>

#include <algorithm>

namespace plystrain::materials {

const char* model_key(ModelKind kind) {
  switch (kind) {
    case ModelKind::linear_elastic:
      return "linear-elastic";
    case ModelKind::neo_hookean:
      return "neo-hookean";
    case ModelKind::mooney_rivlin:
      return "mooney-rivlin";
    case ModelKind::yeoh:
      return "yeoh";
    case ModelKind::gent:
      return "gent";
    case ModelKind::ogden:
      return "ogden";
  }
  return "unknown";
}

namespace detail {

ShearBulk resolved_moduli(const LawParameters& law) {
  const bool uses_young_poisson =
      law.kind == ModelKind::linear_elastic || law.kind == ModelKind::neo_hookean;
  if (uses_young_poisson && !(law.shear_modulus > 0.0 && law.bulk_modulus > 0.0) &&
      law.youngs_modulus > 0.0) {
    return to_shear_bulk(law.youngs_modulus, law.poisson_ratio);
  }
  double shear = law.shear_modulus;
  switch (law.kind) {
    case ModelKind::mooney_rivlin:
      shear = 2.0 * (law.c10 + law.c01);
      break;
    case ModelKind::yeoh:
      shear = 2.0 * law.c10;
      break;
    case ModelKind::ogden: {
      shear = 0.0;
      const std::size_t terms = std::min(law.ogden_mu.size(), law.ogden_alpha.size());
      for (std::size_t p = 0; p < terms; ++p) {
        shear += 0.5 * law.ogden_mu[p] * law.ogden_alpha[p];
      }
      break;
    }
    default:
      break;
  }
  return {shear, law.bulk_modulus};
}

namespace {

bool is_principal_stretch_law(ModelKind kind) {
  return kind == ModelKind::ogden || kind == ModelKind::linear_elastic;
}

}  // namespace
}  // namespace detail

double initial_shear_modulus(const LawParameters& law) {
  return detail::resolved_moduli(law).shear_modulus;
}

double initial_bulk_modulus(const LawParameters& law) {
  return detail::resolved_moduli(law).bulk_modulus;
}

double initial_youngs_modulus(const LawParameters& law) {
  const double mu = initial_shear_modulus(law);
  const double kappa = initial_bulk_modulus(law);
  return 9.0 * kappa * mu / (3.0 * kappa + mu);
}

PointResponse evaluate_isochoric(const LawParameters& law, const Eigen::Matrix3d& F, Need need) {
  // One named result on every path, so that it is built in the caller's
  // storage (the 9x9 tangent is most of its size).
  PointResponse out;
  if (!(F.determinant() > 0.0)) {
    out.admissible = false;
    return out;
  }
  if (detail::is_principal_stretch_law(law.kind)) {
    detail::isochoric_principal_stretch_law(law, F, need, out);
  } else {
    detail::isochoric_invariant_law(law, F, need, out);
  }
  return out;
}

PointResponse evaluate(const LawParameters& law, const Eigen::Matrix3d& F, Need need) {
  PointResponse out = evaluate_isochoric(law, F, need);
  if (out.admissible) {
    detail::add_volumetric(initial_bulk_modulus(law), F, need, out);
  }
  return out;
}

}  // namespace plystrain::materials
