// Pieces shared by the law implementations; not part of the public interface.
#pragma once

#include "plystrain/materials/law.hpp"

#include <Eigen/Core>

namespace plystrain::materials::detail {

// Moduli a law uses at small strain, resolved from whichever parameters the
// kind reads (neo-Hookean and linear-elastic accept (mu, kappa) or (E, nu)).
[[nodiscard]] ShearBulk resolved_moduli(const LawParameters& law);

// Isochoric parts. Each writes energy, P and dP/dF of W_iso(J^(-1/3) F) and
// sets admissible. F must have det F > 0 (checked by the caller).
// With Need::stress_only the tangent is not computed (left as it was).
void isochoric_invariant_law(const LawParameters& law, const Eigen::Matrix3d& F, Need need,
                             PointResponse& out);
void isochoric_principal_stretch_law(const LawParameters& law, const Eigen::Matrix3d& F, Need need,
                                     PointResponse& out);

// The volumetric part added to P and dP/dF: P_vol = U'(J) J F^-T.
void add_volumetric(double bulk_modulus, const Eigen::Matrix3d& F, Need need, PointResponse& out);

[[nodiscard]] inline int tangent_index(int i, int j) { return 3 * i + j; }

}  // namespace plystrain::materials::detail
