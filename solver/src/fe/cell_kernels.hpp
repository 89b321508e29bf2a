// The cell kernels as templates on the cell's unknown count, shared by the
// translation units that instantiate them (cell_kernels_*.cpp: the sizes are
// split over several files because the large ones take a minute each to
// compile) and by element_kernel.cpp, which dispatches on the size. Internal
// to the solver library. The formulation is described in element_kernel.cpp.
#pragma once

#include "plystrain/solver/elements.hpp"
#include "plystrain/solver/quadrature.hpp"

#include <Eigen/LU>

#include <array>
#include <cmath>
#include <numbers>
#include <span>

namespace plystrain::solver::cell_kernels {

using Vector5 = Eigen::Matrix<double, 5, 1>;
using Matrix5 = Eigen::Matrix<double, 5, 5>;
using BMatrix = Eigen::Matrix<double, 5, Eigen::Dynamic, 0, 5, max_cell_dofs>;

// Positions of F11, F12, F21, F22, F33 in the 9-vector (row 3 i + j).
inline constexpr std::array<int, 5> component = {0, 1, 3, 4, 8};

struct PointKinematics {
  BMatrix B;
  Eigen::Matrix3d F;
  ShapeValues N;
  Eigen::Vector2d X;
  double area_weight = 0.0;
  double volume_weight = 0.0;
};

// Returns false when the reference mapping is degenerate or inverted.
inline bool point_kinematics(const CellSetting& setting, const CellCoordinates& X, const CellVector& dofs,
                      const QuadraturePoint& qp, PointKinematics& out) {
  const int n = mesh::node_count(setting.type);
  ShapeGradients dN_dxi;
  shape_functions(setting.type, qp.xi, out.N, dN_dxi);
  Eigen::Matrix2d jac;
  jac.noalias() = X.transpose() * dN_dxi;  // jac(i, j) = dX_i / dxi_j
  const double det = jac.determinant();
  if (!(det > 0.0)) {
    return false;
  }
  ShapeGradients dN;
  dN.resize(n, 2);
  dN.noalias() = dN_dxi * jac.inverse();
  out.X.noalias() = X.transpose() * out.N;
  out.area_weight = qp.weight * det;
  const bool axisymmetric = setting.kinematics == Kinematics::axisymmetric;
  const double R = out.X.x();
  out.volume_weight = axisymmetric ? out.area_weight * 2.0 * std::numbers::pi * R : out.area_weight;

  Eigen::Matrix2d H = Eigen::Matrix2d::Zero();
  double ur = 0.0;
  for (int a = 0; a < n; ++a) {
    const Eigen::Vector2d u(dofs(2 * a), dofs(2 * a + 1));
    H.noalias() += u * dN.row(a);
    ur += out.N(a) * u.x();
  }
  out.F.setIdentity();
  out.F.topLeftCorner<2, 2>() += H;
  switch (setting.kinematics) {
    case Kinematics::plane_strain: break;
    case Kinematics::generalized_plane_strain: out.F(2, 2) = 1.0 + dofs(2 * n); break;
    case Kinematics::axisymmetric: out.F(2, 2) = 1.0 + ur / R; break;
  }

  const int ndof = cell_dof_count(setting);
  out.B.setZero(5, ndof);
  for (int a = 0; a < n; ++a) {
    out.B(0, 2 * a) = dN(a, 0);
    out.B(1, 2 * a) = dN(a, 1);
    out.B(2, 2 * a + 1) = dN(a, 0);
    out.B(3, 2 * a + 1) = dN(a, 1);
    if (axisymmetric) {
      out.B(4, 2 * a) = out.N(a) / R;
    }
  }
  if (setting.kinematics == Kinematics::generalized_plane_strain) {
    out.B(4, 2 * n) = 1.0;
  }
  return true;
}

inline Vector5 reduce(const Eigen::Matrix3d& P) {
  Vector5 v;
  v << P(0, 0), P(0, 1), P(1, 0), P(1, 1), P(2, 2);
  return v;
}

inline Matrix5 reduce(const materials::Matrix9d& A) {
  Matrix5 m;
  for (int i = 0; i < 5; ++i) {
    for (int j = 0; j < 5; ++j) {
      m(i, j) = A(component[static_cast<std::size_t>(i)], component[static_cast<std::size_t>(j)]);
    }
  }
  return m;
}

// cof F = J F^-T and d(cof F)_iJ / dF_kL = J (Finv_Ji Finv_Lk - Finv_Jk Finv_Li),
// restricted to the five active components.
inline void cofactor(const Eigen::Matrix3d& F, Vector5& cof, Matrix5& dcof) {
  const double J = F.determinant();
  const Eigen::Matrix3d Finv = F.inverse();
  const Eigen::Matrix3d full = J * Finv.transpose();
  cof = reduce(full);
  for (int r = 0; r < 5; ++r) {
    const int i = component[static_cast<std::size_t>(r)] / 3;
    const int Jc = component[static_cast<std::size_t>(r)] % 3;
    for (int c = 0; c < 5; ++c) {
      const int k = component[static_cast<std::size_t>(c)] / 3;
      const int L = component[static_cast<std::size_t>(c)] % 3;
      dcof(r, c) = J * (Finv(Jc, i) * Finv(L, k) - Finv(Jc, k) * Finv(L, i));
    }
  }
}

inline bool finite(const CellVector& v) { return v.allFinite(); }

inline KernelOutcome failure(KernelStatus status, int point, double jacobian) {
  return KernelOutcome{status, point, jacobian};
}

// The material law is asked for its tangent only when the cell's is wanted.
inline materials::Need law_need(const CellMatrix* tangent) {
  return tangent ? materials::Need::stress_and_tangent : materials::Need::stress_only;
}

// The cell's B as a fixed-size matrix: the element products are then
// unrolled by the compiler instead of going through Eigen's general
// matrix-matrix path, which for 18 x 5 x 18 costs more than the arithmetic.
template <int NDOF>
Eigen::Map<const Eigen::Matrix<double, 5, NDOF>> fixed_b(const BMatrix& B) {
  return Eigen::Map<const Eigen::Matrix<double, 5, NDOF>>(B.data());
}

// K += B^T A B for one point. B has the pattern of point_kinematics: the
// x column of node a is (dN_a/dX, dN_a/dZ, 0, 0, c_a) with c_a = N_a / R in
// axisymmetry and 0 otherwise, the z column is (0, 0, dN_a/dX, dN_a/dZ, 0),
// and the out-of-plane unknown's column is e_5. Using that pattern, every
// column of B^T A B is a sum of two or three columns of B^T A, which
// vectorises; a dense B^T A B does 5/2 times the work and, in Eigen's
// general product, costs more than the material law.
template <int NDOF>
void add_point_stiffness(const Eigen::Map<const Eigen::Matrix<double, 5, NDOF>>& B, const Matrix5& A,
                         bool axisymmetric, Eigen::Matrix<double, NDOF, NDOF>& K) {
  constexpr int nodes = NDOF / 2;
  constexpr bool out_of_plane = NDOF % 2 == 1;
  Eigen::Matrix<double, NDOF, 5> BtA;
  for (int a = 0; a < nodes; ++a) {
    const double gx = B(0, 2 * a);
    const double gz = B(1, 2 * a);
    BtA.row(2 * a) = gx * A.row(0) + gz * A.row(1);
    if (axisymmetric) {
      BtA.row(2 * a) += B(4, 2 * a) * A.row(4);
    }
    BtA.row(2 * a + 1) = gx * A.row(2) + gz * A.row(3);
  }
  if constexpr (out_of_plane) {
    BtA.row(NDOF - 1) = A.row(4);
  }
  for (int b = 0; b < nodes; ++b) {
    const double gx = B(0, 2 * b);
    const double gz = B(1, 2 * b);
    K.col(2 * b) += gx * BtA.col(0) + gz * BtA.col(1);
    if (axisymmetric) {
      K.col(2 * b) += B(4, 2 * b) * BtA.col(4);
    }
    K.col(2 * b + 1) += gx * BtA.col(2) + gz * BtA.col(3);
  }
  if constexpr (out_of_plane) {
    K.col(NDOF - 1) += BtA.col(4);
  }
}

// B^T v for a 5-vector v, with the pattern of B (see add_point_stiffness).
template <int NDOF>
Eigen::Matrix<double, NDOF, 1> b_transpose_times(const Eigen::Map<const Eigen::Matrix<double, 5, NDOF>>& B,
                                                 const Vector5& v, bool axisymmetric) {
  constexpr int nodes = NDOF / 2;
  Eigen::Matrix<double, NDOF, 1> out;
  for (int a = 0; a < nodes; ++a) {
    const double gx = B(0, 2 * a);
    const double gz = B(1, 2 * a);
    out(2 * a) = gx * v(0) + gz * v(1) + (axisymmetric ? B(4, 2 * a) * v(4) : 0.0);
    out(2 * a + 1) = gx * v(2) + gz * v(3);
  }
  if constexpr (NDOF % 2 == 1) {
    out(NDOF - 1) = v(4);
  }
  return out;
}

template <int NDOF>
void store(const Eigen::Matrix<double, NDOF, 1>& r, const Eigen::Matrix<double, NDOF, NDOF>& K,
           CellVector* residual, CellMatrix* tangent) {
  if (residual) {
    *residual = r;
  }
  if (tangent) {
    *tangent = K;
  }
}

// Plain displacement cell.
template <int NDOF>
KernelOutcome plain_cell(const CellSetting& s, const CellCoordinates& X, const CellVector& dofs,
                         CellVector* residual, CellMatrix* tangent, std::span<PointState> states) {
  const std::span<const QuadraturePoint> rule = cell_rule(s.type);
  PointKinematics pk;
  Eigen::Matrix<double, NDOF, 1> r = Eigen::Matrix<double, NDOF, 1>::Zero();
  Eigen::Matrix<double, NDOF, NDOF> K;
  if (tangent) {
    K.setZero();
  }
  for (int p = 0; p < static_cast<int>(rule.size()); ++p) {
    if (!point_kinematics(s, X, dofs, rule[static_cast<std::size_t>(p)], pk)) {
      return failure(KernelStatus::inverted, p, 0.0);
    }
    const double J = pk.F.determinant();
    if (!(J > 0.0)) {
      return failure(KernelStatus::inverted, p, J);
    }
    const materials::PointResponse response = materials::evaluate(*s.law, pk.F, law_need(tangent));
    if (!response.admissible) {
      return failure(KernelStatus::material_failure, p, J);
    }
    const auto B = fixed_b<NDOF>(pk.B);
    if (residual) {
      r += b_transpose_times<NDOF>(B, reduce(response.first_piola) * pk.volume_weight,
                                   s.kinematics == Kinematics::axisymmetric);
    }
    if (tangent) {
      add_point_stiffness<NDOF>(B, reduce(response.tangent) * pk.volume_weight,
                                s.kinematics == Kinematics::axisymmetric, K);
    }
    if (!states.empty()) {
      PointState& state = states[static_cast<std::size_t>(p)];
      state.position = pk.X;
      state.area_weight = pk.area_weight;
      state.volume_weight = pk.volume_weight;
      state.deformation_gradient = pk.F;
      state.first_piola = response.first_piola;
      state.pressure = materials::evaluate_volumetric(*s.law, J).pressure;
    }
  }
  store<NDOF>(r, K, residual, tangent);
  return {};
}

// Mixed cell with NP pressure functions: 1 (P0) or 3 (P1 in x, z).
template <int NDOF, int NP>
KernelOutcome mixed_cell(const CellSetting& s, const CellCoordinates& X, const CellVector& dofs,
                         CellVector* residual, CellMatrix* tangent, std::span<PointState> states) {
  using VectorP = Eigen::Matrix<double, NP, 1>;
  using MatrixP = Eigen::Matrix<double, NP, NP>;
  using GMatrix = Eigen::Matrix<double, NP, NDOF, (NP == 1 ? Eigen::RowMajor : Eigen::ColMajor)>;
  const std::span<const QuadraturePoint> rule = cell_rule(s.type);
  const int points = static_cast<int>(rule.size());

  // Pressure basis centred and scaled on the cell's corners for conditioning.
  const int corners = mesh::corner_count(s.type);
  const Eigen::Vector2d centre = X.topRows(corners).colwise().mean().transpose();
  const double size = (X.topRows(corners).colwise().maxCoeff() - X.topRows(corners).colwise().minCoeff()).norm();
  auto basis = [&](const Eigen::Vector2d& x) {
    VectorP m;
    m(0) = 1.0;
    if constexpr (NP == 3) {
      m(1) = (x.x() - centre.x()) / size;
      m(2) = (x.y() - centre.y()) / size;
    }
    return m;
  };

  std::array<PointKinematics, max_cell_points> pk;
  std::array<VectorP, max_cell_points> M;
  std::array<Vector5, max_cell_points> cof;
  std::array<Matrix5, max_cell_points> dcof;
  VectorP g = VectorP::Zero();
  MatrixP H = MatrixP::Zero();
  GMatrix G = GMatrix::Zero();
  for (int p = 0; p < points; ++p) {
    PointKinematics& k = pk[static_cast<std::size_t>(p)];
    if (!point_kinematics(s, X, dofs, rule[static_cast<std::size_t>(p)], k)) {
      return failure(KernelStatus::inverted, p, 0.0);
    }
    const double J = k.F.determinant();
    if (!(J > 0.0)) {
      return failure(KernelStatus::inverted, p, J);
    }
    const std::size_t ip = static_cast<std::size_t>(p);
    M[ip] = basis(k.X);
    cofactor(k.F, cof[ip], dcof[ip]);
    g += M[ip] * (J * k.volume_weight);
    H.noalias() += M[ip] * M[ip].transpose() * k.volume_weight;
    G.noalias() += (M[ip] * k.volume_weight) *
                   b_transpose_times<NDOF>(fixed_b<NDOF>(k.B), cof[ip], s.kinematics == Kinematics::axisymmetric)
                       .transpose();
  }
  const MatrixP Hinv = H.inverse();
  const VectorP dilatation = Hinv * g;
  VectorP pressure_load = VectorP::Zero();
  MatrixP Ktheta = MatrixP::Zero();
  for (int p = 0; p < points; ++p) {
    const std::size_t ip = static_cast<std::size_t>(p);
    const double theta = M[ip].dot(dilatation);
    if (!(theta > 0.0)) {
      return failure(KernelStatus::inverted, p, theta);
    }
    const materials::VolumetricResponse vol = materials::evaluate_volumetric(*s.law, theta);
    if (!vol.admissible) {
      return failure(KernelStatus::material_failure, p, theta);
    }
    pressure_load += M[ip] * (vol.pressure * pk[ip].volume_weight);
    Ktheta.noalias() += M[ip] * M[ip].transpose() * (vol.stiffness * pk[ip].volume_weight);
  }
  const VectorP pressure_coefficients = Hinv * pressure_load;

  Eigen::Matrix<double, NDOF, 1> r = Eigen::Matrix<double, NDOF, 1>::Zero();
  Eigen::Matrix<double, NDOF, NDOF> K;
  if (tangent) {
    K.setZero();
  }
  for (int p = 0; p < points; ++p) {
    const std::size_t ip = static_cast<std::size_t>(p);
    const PointKinematics& k = pk[ip];
    const materials::PointResponse iso = materials::evaluate_isochoric(*s.law, k.F, law_need(tangent));
    if (!iso.admissible) {
      return failure(KernelStatus::material_failure, p, k.F.determinant());
    }
    const double pressure = M[ip].dot(pressure_coefficients);
    const auto B = fixed_b<NDOF>(k.B);
    if (residual) {
      const Vector5 P = reduce(iso.first_piola) + pressure * cof[ip];
      r += b_transpose_times<NDOF>(B, P * k.volume_weight, s.kinematics == Kinematics::axisymmetric);
    }
    if (tangent) {
      add_point_stiffness<NDOF>(B, (reduce(iso.tangent) + pressure * dcof[ip]) * k.volume_weight,
                                s.kinematics == Kinematics::axisymmetric, K);
    }
    if (!states.empty()) {
      PointState& state = states[ip];
      state.position = k.X;
      state.area_weight = k.area_weight;
      state.volume_weight = k.volume_weight;
      state.deformation_gradient = k.F;
      state.first_piola = iso.first_piola + pressure * k.F.determinant() * k.F.inverse().transpose();
      state.pressure = pressure;
    }
  }
  if (tangent) {
    const MatrixP C = Hinv * Ktheta * Hinv;
    const GMatrix CG = C * G;
    K.noalias() += G.transpose().lazyProduct(CG);
  }
  store<NDOF>(r, K, residual, tangent);
  return {};
}

template <int NDOF>
KernelOutcome sized_cell(const CellSetting& s, const CellCoordinates& X, const CellVector& dofs,
                         CellVector* residual, CellMatrix* tangent, std::span<PointState> states) {
  const int np = s.mixed ? pressure_function_count(s.type) : 0;
  if (np == 3) {
    return mixed_cell<NDOF, 3>(s, X, dofs, residual, tangent, states);
  }
  if (np == 1) {
    return mixed_cell<NDOF, 1>(s, X, dofs, residual, tangent, states);
  }
  return plain_cell<NDOF>(s, X, dofs, residual, tangent, states);
}

// Instantiated in cell_kernels_*.cpp, one per unknown count: 2 per node of
// tri3, quad4, tri6, quad8 and quad9, plus one for the out-of-plane unknown.
#define PLYSTRAIN_CELL_KERNEL_SIZE(N)                                                                   \
  extern template KernelOutcome sized_cell<N>(const CellSetting&, const CellCoordinates&, const CellVector&, \
                                              CellVector*, CellMatrix*, std::span<PointState>);
PLYSTRAIN_CELL_KERNEL_SIZE(6)
PLYSTRAIN_CELL_KERNEL_SIZE(7)
PLYSTRAIN_CELL_KERNEL_SIZE(8)
PLYSTRAIN_CELL_KERNEL_SIZE(9)
PLYSTRAIN_CELL_KERNEL_SIZE(12)
PLYSTRAIN_CELL_KERNEL_SIZE(13)
PLYSTRAIN_CELL_KERNEL_SIZE(16)
PLYSTRAIN_CELL_KERNEL_SIZE(17)
PLYSTRAIN_CELL_KERNEL_SIZE(18)
PLYSTRAIN_CELL_KERNEL_SIZE(19)
#undef PLYSTRAIN_CELL_KERNEL_SIZE

}  // namespace plystrain::solver::cell_kernels
