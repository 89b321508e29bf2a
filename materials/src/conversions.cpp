#include "plystrain/materials/law.hpp"

namespace plystrain::materials {

// Isotropic linear elasticity (any elasticity text, e.g. Timoshenko & Goodier 1970):
// mu = E / (2 (1 + nu)), kappa = E / (3 (1 - 2 nu)).
ShearBulk to_shear_bulk(double youngs_modulus, double poisson_ratio) {
  return {youngs_modulus / (2.0 * (1.0 + poisson_ratio)),
          youngs_modulus / (3.0 * (1.0 - 2.0 * poisson_ratio))};
}

// E = 9 kappa mu / (3 kappa + mu), nu = (3 kappa - 2 mu) / (2 (3 kappa + mu)).
YoungPoisson to_young_poisson(double shear_modulus, double bulk_modulus) {
  const double denominator = 3.0 * bulk_modulus + shear_modulus;
  return {9.0 * bulk_modulus * shear_modulus / denominator,
          (3.0 * bulk_modulus - 2.0 * shear_modulus) / (2.0 * denominator)};
}

}  // namespace plystrain::materials
