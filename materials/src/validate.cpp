// Parameter checks for every law, with messages that say what to do.
#include "law_detail.hpp"

#include <algorithm>
#include <cmath>
#include <sstream>

namespace plystrain::materials {
namespace {

bool finite(double value) { return std::isfinite(value); }

std::string positive(const char* name, double value) {
  if (!finite(value) || !(value > 0.0)) {
    std::ostringstream text;
    text << name << " must be a positive number (MPa), found " << value;
    return text.str();
  }
  return {};
}

std::string check_poisson(double nu) {
  if (!finite(nu)) {
    return "poisson_ratio must be a finite number";
  }
  if (nu == 0.5) {
    return "poisson_ratio = 0.5 (exactly incompressible) cannot be used: the volumetric "
           "energy needs a finite bulk modulus. Use 0.4999 (bulk modulus about 5000 times "
           "the shear modulus); the mixed displacement-pressure element keeps such "
           "nearly incompressible layers free of locking";
  }
  if (!(nu > -1.0 && nu < 0.5)) {
    std::ostringstream text;
    text << "poisson_ratio must lie in (-1, 0.5) for a stable isotropic solid, found " << nu;
    return text.str();
  }
  return {};
}

// Neo-Hookean and linear-elastic take (E, nu) or (mu, kappa).
std::string check_two_moduli(const LawParameters& law) {
  const bool has_young_poisson = law.youngs_modulus != 0.0 || law.poisson_ratio != 0.0;
  const bool has_shear_bulk = law.shear_modulus != 0.0 || law.bulk_modulus != 0.0;
  if (has_young_poisson) {
    if (std::string problem = positive("youngs_modulus", law.youngs_modulus); !problem.empty()) {
      return problem;
    }
    if (std::string problem = check_poisson(law.poisson_ratio); !problem.empty()) {
      return problem;
    }
    if (has_shear_bulk) {
      // Both given: the reader stores E, nu for reports beside the derived
      // mu, kappa; they must agree.
      const ShearBulk derived = to_shear_bulk(law.youngs_modulus, law.poisson_ratio);
      const double mismatch =
          std::max(std::abs(derived.shear_modulus - law.shear_modulus) / derived.shear_modulus,
                   std::abs(derived.bulk_modulus - law.bulk_modulus) / derived.bulk_modulus);
      if (!(mismatch < 1e-9)) {
        return "give either youngs_modulus and poisson_ratio, or shear_modulus and "
               "bulk_modulus, not both";
      }
    }
    return {};
  }
  if (std::string problem = positive("shear_modulus", law.shear_modulus); !problem.empty()) {
    return problem + " (or give youngs_modulus and poisson_ratio)";
  }
  return positive("bulk_modulus", law.bulk_modulus);
}

std::string check_ogden(const LawParameters& law) {
  if (law.ogden_mu.empty() || law.ogden_mu.size() != law.ogden_alpha.size()) {
    std::ostringstream text;
    text << "ogden mu and alpha must be non-empty arrays of equal length, found "
         << law.ogden_mu.size() << " and " << law.ogden_alpha.size() << " terms";
    return text.str();
  }
  for (std::size_t p = 0; p < law.ogden_mu.size(); ++p) {
    if (!finite(law.ogden_mu[p]) || !finite(law.ogden_alpha[p])) {
      return "ogden mu and alpha must be finite numbers";
    }
    if (law.ogden_alpha[p] == 0.0) {
      std::ostringstream text;
      text << "ogden alpha[" << p << "] must not be zero (the term mu/alpha is undefined)";
      return text.str();
    }
  }
  const double shear = initial_shear_modulus(law);
  if (!(shear > 0.0)) {
    std::ostringstream text;
    text << "the initial shear modulus sum(mu_i alpha_i)/2 must be positive, found " << shear
         << " MPa";
    return text.str();
  }
  return positive("bulk_modulus", law.bulk_modulus);
}

}  // namespace

std::string validate(const LawParameters& law) {
  switch (law.kind) {
    case ModelKind::linear_elastic:
    case ModelKind::neo_hookean:
      return check_two_moduli(law);
    case ModelKind::mooney_rivlin: {
      if (!finite(law.c10) || !finite(law.c01)) {
        return "c10 and c01 must be finite numbers";
      }
      if (!(law.c10 + law.c01 > 0.0)) {
        std::ostringstream text;
        text << "the initial shear modulus 2 (c10 + c01) must be positive, found "
             << 2.0 * (law.c10 + law.c01) << " MPa";
        return text.str();
      }
      return positive("bulk_modulus", law.bulk_modulus);
    }
    case ModelKind::yeoh: {
      if (!finite(law.c20) || !finite(law.c30)) {
        return "c20 and c30 must be finite numbers";
      }
      if (std::string problem = positive("c10", law.c10); !problem.empty()) {
        return problem;
      }
      return positive("bulk_modulus", law.bulk_modulus);
    }
    case ModelKind::gent: {
      if (std::string problem = positive("shear_modulus", law.shear_modulus); !problem.empty()) {
        return problem;
      }
      if (!finite(law.jm) || !(law.jm > 0.0)) {
        std::ostringstream text;
        text << "jm (the Gent locking parameter, I1 - 3 at locking) must be positive, found "
             << law.jm;
        return text.str();
      }
      return positive("bulk_modulus", law.bulk_modulus);
    }
    case ModelKind::ogden:
      return check_ogden(law);
  }
  return "unknown model kind";
}

}  // namespace plystrain::materials
