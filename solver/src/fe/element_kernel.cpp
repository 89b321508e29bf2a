// Total Lagrangian element kernels. One path for the three kinematic kinds:
// the in-plane gradient plus F33 form a full 3x3 F that goes to the material
// law; only the five components F11, F12, F21, F22, F33 vary, so the kernel
// works with their 5-vector and the 5 x ndof matrix B = dF/du (F is linear in
// the local unknowns for every kind, so B does not depend on u).
//
// Mixed cells (Simo, Taylor & Pister, CMAME 51, 177, 1985, three-field
// u-p-theta with theta and p in the same discontinuous space M, condensed per
// cell):
//   theta = M^T H^-1 g,  g = int M J dV,  H = int M M^T dV
//   p     = M^T H^-1 int M U'(theta) dV
//   r     = int B^T (P_iso + p cof F) dV
//   K     = int B^T (A_iso + p dcof/dF) B dV + G^T H^-1 K_theta H^-1 G,
//   G = int M (cof F : B) dV,  K_theta = int M U''(theta) M^T dV.
// This is the exact Hessian of the condensed energy int W_iso + U(theta) dV,
// so it is symmetric. The pressure space never reaches beyond a cell, so it is
// discontinuous across cells and across layers.
#include "cell_kernels.hpp"
#include "plystrain/solver/elements.hpp"
#include "plystrain/solver/quadrature.hpp"

#include <cmath>
#include <numbers>
#include <stdexcept>
#include <string>

namespace plystrain::solver {
namespace {

using cell_kernels::sized_cell;

KernelOutcome run_cell(const CellSetting& s, const CellCoordinates& X, const CellVector& dofs,
                       CellVector* residual, CellMatrix* tangent, std::span<PointState> states) {
  const int ndof = cell_dof_count(s);
  if (residual) {
    residual->setZero(ndof);
  }
  if (tangent) {
    tangent->setZero(ndof, ndof);
  }
  KernelOutcome outcome;
  // One instantiation per unknown count: 2 per node of tri3, quad4, tri6,
  // quad8 and quad9, plus one for the out-of-plane unknown.
  switch (ndof) {
    case 6: outcome = sized_cell<6>(s, X, dofs, residual, tangent, states); break;
    case 7: outcome = sized_cell<7>(s, X, dofs, residual, tangent, states); break;
    case 8: outcome = sized_cell<8>(s, X, dofs, residual, tangent, states); break;
    case 9: outcome = sized_cell<9>(s, X, dofs, residual, tangent, states); break;
    case 12: outcome = sized_cell<12>(s, X, dofs, residual, tangent, states); break;
    case 13: outcome = sized_cell<13>(s, X, dofs, residual, tangent, states); break;
    case 16: outcome = sized_cell<16>(s, X, dofs, residual, tangent, states); break;
    case 17: outcome = sized_cell<17>(s, X, dofs, residual, tangent, states); break;
    case 18: outcome = sized_cell<18>(s, X, dofs, residual, tangent, states); break;
    case 19: outcome = sized_cell<19>(s, X, dofs, residual, tangent, states); break;
    default: throw std::logic_error("element kernel: no kernel for " + std::to_string(ndof) + " unknowns");
  }
  if (outcome.status == KernelStatus::ok) {
    if ((residual && !cell_kernels::finite(*residual)) || (tangent && !tangent->allFinite())) {
      outcome.status = KernelStatus::non_finite;
    }
  }
  return outcome;
}

}  // namespace

int cell_dof_count(const CellSetting& setting) {
  return 2 * mesh::node_count(setting.type) +
         (setting.kinematics == Kinematics::generalized_plane_strain ? 1 : 0);
}

KernelOutcome cell_internal_forces(const CellSetting& setting, const CellCoordinates& coordinates,
                                   const CellVector& dofs, CellVector& residual,
                                   CellMatrix* tangent) {
  return run_cell(setting, coordinates, dofs, &residual, tangent, {});
}

int cell_point_states(const CellSetting& setting, const CellCoordinates& coordinates,
                      const CellVector& dofs, std::span<PointState> states,
                      KernelOutcome& outcome) {
  const int points = static_cast<int>(cell_rule(setting.type).size());
  outcome = run_cell(setting, coordinates, dofs, nullptr, nullptr, states.first(static_cast<std::size_t>(points)));
  return points;
}

int edge_dof_count(const EdgeSetting& setting) {
  return 2 * setting.node_count +
         (setting.kinematics == Kinematics::generalized_plane_strain ? 1 : 0);
}

// f_a = -p int N_a c n ds on the deformed edge, with n ds = (t_z, -t_x) dxi
// for the deformed tangent t = dx/dxi (material on the left), and c = 1
// (plane strain), lambda3 (generalized plane strain: the deformed depth), or
// 2 pi r (axisymmetric: the deformed ring).
void follower_pressure_forces(const EdgeSetting& s, const EdgeCoordinates& X, const EdgeVector& dofs,
                              double pressure, EdgeVector& force, EdgeMatrix* tangent) {
  const int n = s.node_count;
  const int ndof = edge_dof_count(s);
  force.setZero(ndof);
  if (tangent) {
    tangent->setZero(ndof, ndof);
  }
  Eigen::Matrix2d rot;
  rot << 0.0, 1.0, -1.0, 0.0;
  const double stretch3 = s.kinematics == Kinematics::generalized_plane_strain ? 1.0 + dofs(2 * n) : 1.0;
  for (const LinePoint& lp : line_rule(n)) {
    Eigen::Vector3d N, dN;
    line_shape_functions(n, lp.xi, N, dN);
    Eigen::Vector2d t = Eigen::Vector2d::Zero();
    double r = 0.0;
    for (int a = 0; a < n; ++a) {
      const Eigen::Vector2d x = X.row(a).transpose() + Eigen::Vector2d(dofs(2 * a), dofs(2 * a + 1));
      t += x * dN(a);
      r += N(a) * x.x();
    }
    double factor = 1.0;
    if (s.kinematics == Kinematics::generalized_plane_strain) {
      factor = stretch3;
    } else if (s.kinematics == Kinematics::axisymmetric) {
      factor = 2.0 * std::numbers::pi * r;
    }
    const Eigen::Vector2d normal = rot * t;
    for (int a = 0; a < n; ++a) {
      force.segment<2>(2 * a) += (-pressure * lp.weight * N(a) * factor) * normal;
    }
    if (!tangent) {
      continue;
    }
    for (int a = 0; a < n; ++a) {
      const double scale = -pressure * lp.weight * N(a);
      for (int b = 0; b < n; ++b) {
        Eigen::Matrix2d block = factor * dN(b) * rot;
        if (s.kinematics == Kinematics::axisymmetric) {
          block.col(0) += normal * (2.0 * std::numbers::pi * N(b));
        }
        tangent->block<2, 2>(2 * a, 2 * b) += scale * block;
      }
      if (s.kinematics == Kinematics::generalized_plane_strain) {
        tangent->block<2, 1>(2 * a, 2 * n) += scale * normal;
      }
    }
  }
}

void dead_traction_forces(const EdgeSetting& s, const EdgeCoordinates& X,
                          const std::function<Eigen::Vector2d(const Eigen::Vector2d&, double)>& traction,
                          double load_factor, EdgeVector& force) {
  const int n = s.node_count;
  force.setZero(edge_dof_count(s));
  for (const LinePoint& lp : line_rule(n)) {
    Eigen::Vector3d N, dN;
    line_shape_functions(n, lp.xi, N, dN);
    Eigen::Vector2d position = Eigen::Vector2d::Zero();
    Eigen::Vector2d tangent_vector = Eigen::Vector2d::Zero();
    for (int a = 0; a < n; ++a) {
      position += N(a) * X.row(a).transpose();
      tangent_vector += dN(a) * X.row(a).transpose();
    }
    double weight = lp.weight * tangent_vector.norm();
    if (s.kinematics == Kinematics::axisymmetric) {
      weight *= 2.0 * std::numbers::pi * position.x();
    }
    const Eigen::Vector2d t = traction(position, load_factor);
    for (int a = 0; a < n; ++a) {
      force.segment<2>(2 * a) += (weight * N(a)) * t;
    }
  }
}

}  // namespace plystrain::solver
