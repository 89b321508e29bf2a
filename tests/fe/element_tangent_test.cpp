// Element and edge-load tangents against central finite differences of the
// residual (common practice: the consistent tangent is the derivative of the
// residual, so a central difference with step h agrees to O(h^2)).
#include "fe/support.hpp"
#include "plystrain/solver/elements.hpp"
#include "plystrain/solver/quadrature.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using namespace plystrain;
using solver::CellCoordinates;
using solver::CellMatrix;
using solver::CellSetting;
using solver::CellVector;
using solver::Kinematics;

namespace {

// A distorted cell with curved quadratic edges, away from the axis.
CellCoordinates distorted_cell(mesh::CellType type) {
  const int n = mesh::node_count(type);
  CellCoordinates X(n, 2);
  if (mesh::corner_count(type) == 3) {
    X.topRows(3) << 1.0, 0.0, 2.0, 0.2, 1.3, 1.1;
  } else {
    X.topRows(4) << 1.0, 0.1, 2.1, 0.0, 2.3, 1.2, 0.9, 1.0;
  }
  const int corners = mesh::corner_count(type);
  if (n > corners) {
    for (int e = 0; e < corners; ++e) {
      const Eigen::RowVector2d mid = 0.5 * (X.row(e) + X.row((e + 1) % corners));
      X.row(corners + e) = mid + Eigen::RowVector2d(0.03 * (e + 1), -0.02 * e);
    }
    if (n == 9) {
      X.row(8) = X.topRows(4).colwise().mean() + Eigen::RowVector2d(0.02, 0.01);
    }
  }
  return X;
}

CellVector trial_dofs(int ndof) {
  CellVector d(ndof);
  for (int i = 0; i < ndof; ++i) {
    d(i) = 0.08 * std::sin(1.7 * i + 0.3) + 0.03 * std::cos(0.9 * i * i);
  }
  return d;
}

double relative_difference(const Eigen::MatrixXd& a, const Eigen::MatrixXd& b) {
  return (a - b).cwiseAbs().maxCoeff() / b.cwiseAbs().maxCoeff();
}

}  // namespace

TEST_CASE("cell tangent equals the finite difference of the cell residual", "[fe][tangent]") {
  const mesh::CellType type = GENERATE(mesh::CellType::tri3, mesh::CellType::tri6, mesh::CellType::quad4,
                                       mesh::CellType::quad8, mesh::CellType::quad9);
  const Kinematics kinematics = GENERATE(Kinematics::plane_strain, Kinematics::generalized_plane_strain,
                                         Kinematics::axisymmetric);
  const bool mixed = GENERATE(false, true);
  const materials::LawParameters law = test::neo_hookean(1.0, mixed ? 80.0 : 4.0);
  CellSetting setting{type, kinematics, mixed, &law};
  CAPTURE(mesh::cell_type_name(type), solver::kinematics_name(kinematics), mixed);

  const CellCoordinates X = distorted_cell(type);
  const int ndof = solver::cell_dof_count(setting);
  const CellVector d = trial_dofs(ndof);
  CellVector r;
  CellMatrix K;
  REQUIRE(solver::cell_internal_forces(setting, X, d, r, &K).status == solver::KernelStatus::ok);

  Eigen::MatrixXd numeric(ndof, ndof);
  const double h = 1e-6;
  for (int j = 0; j < ndof; ++j) {
    CellVector plus = d, minus = d;
    plus(j) += h;
    minus(j) -= h;
    CellVector rp, rm;
    REQUIRE(solver::cell_internal_forces(setting, X, plus, rp, nullptr).status == solver::KernelStatus::ok);
    REQUIRE(solver::cell_internal_forces(setting, X, minus, rm, nullptr).status == solver::KernelStatus::ok);
    numeric.col(j) = (rp - rm) / (2.0 * h);
  }
  CHECK(relative_difference(Eigen::MatrixXd(K), numeric) < 1e-6);
  // Both formulations derive from a potential, so K is symmetric.
  CHECK(relative_difference(Eigen::MatrixXd(K), Eigen::MatrixXd(K.transpose())) < 1e-12);
}

TEST_CASE("a rigid motion gives no internal force", "[fe][tangent]") {
  // Objectivity of the laws and the kernel (common practice): a rigid
  // rotation of the cell leaves it stress free.
  const mesh::CellType type = GENERATE(mesh::CellType::tri6, mesh::CellType::quad9, mesh::CellType::quad4);
  const bool mixed = GENERATE(false, true);
  const materials::LawParameters law = test::neo_hookean(1.0, 100.0);
  CellSetting setting{type, Kinematics::plane_strain, mixed, &law};
  const CellCoordinates X = distorted_cell(type);
  const double angle = 0.7;
  Eigen::Matrix2d R;
  R << std::cos(angle), -std::sin(angle), std::sin(angle), std::cos(angle);
  CellVector d(solver::cell_dof_count(setting));
  for (int a = 0; a < X.rows(); ++a) {
    const Eigen::Vector2d x = R * X.row(a).transpose() + Eigen::Vector2d(0.3, -0.2);
    d.segment<2>(2 * a) = x - X.row(a).transpose();
  }
  CellVector r;
  REQUIRE(solver::cell_internal_forces(setting, X, d, r, nullptr).status == solver::KernelStatus::ok);
  CHECK(r.cwiseAbs().maxCoeff() < 1e-12);
}

TEST_CASE("follower pressure stiffness equals the finite difference of its force", "[fe][tangent]") {
  const int nodes = GENERATE(2, 3);
  const Kinematics kinematics = GENERATE(Kinematics::plane_strain, Kinematics::generalized_plane_strain,
                                         Kinematics::axisymmetric);
  solver::EdgeSetting setting{nodes, kinematics};
  solver::EdgeCoordinates X(nodes, 2);
  if (nodes == 2) {
    X << 1.0, 0.2, 2.0, 0.5;
  } else {
    X << 1.0, 0.2, 2.0, 0.5, 1.45, 0.42;
  }
  const int ndof = solver::edge_dof_count(setting);
  solver::EdgeVector d(ndof);
  for (int i = 0; i < ndof; ++i) {
    d(i) = 0.1 * std::sin(2.1 * i + 0.4);
  }
  solver::EdgeVector f;
  solver::EdgeMatrix K;
  solver::follower_pressure_forces(setting, X, d, 2.5, f, &K);
  Eigen::MatrixXd numeric(ndof, ndof);
  const double h = 1e-6;
  for (int j = 0; j < ndof; ++j) {
    solver::EdgeVector plus = d, minus = d, fp, fm;
    plus(j) += h;
    minus(j) -= h;
    solver::follower_pressure_forces(setting, X, plus, 2.5, fp, nullptr);
    solver::follower_pressure_forces(setting, X, minus, 2.5, fm, nullptr);
    numeric.col(j) = (fp - fm) / (2.0 * h);
  }
  CHECK(relative_difference(Eigen::MatrixXd(K), numeric) < 1e-6);
}

TEST_CASE("quadrature weights sum to the reference cell's area", "[fe]") {
  // Reference triangle area 1/2, square [-1, 1]^2 area 4 (definition).
  const mesh::CellType type = GENERATE(mesh::CellType::tri3, mesh::CellType::tri6, mesh::CellType::quad4,
                                       mesh::CellType::quad8, mesh::CellType::quad9);
  double sum = 0.0;
  for (const solver::QuadraturePoint& p : solver::cell_rule(type)) {
    sum += p.weight;
  }
  CHECK(sum == Approx(mesh::corner_count(type) == 3 ? 0.5 : 4.0).epsilon(1e-14));
}

TEST_CASE("shape functions form a partition of unity and interpolate nodes", "[fe]") {
  // Defining properties of Lagrange shape functions (common practice).
  const mesh::CellType type = GENERATE(mesh::CellType::tri3, mesh::CellType::tri6, mesh::CellType::quad4,
                                       mesh::CellType::quad8, mesh::CellType::quad9);
  const bool tri = mesh::corner_count(type) == 3;
  std::vector<Eigen::Vector2d> nodes;
  if (tri) {
    nodes = {{0, 0}, {1, 0}, {0, 1}, {0.5, 0}, {0.5, 0.5}, {0, 0.5}};
  } else {
    nodes = {{-1, -1}, {1, -1}, {1, 1}, {-1, 1}, {0, -1}, {1, 0}, {0, 1}, {-1, 0}, {0, 0}};
  }
  const int n = mesh::node_count(type);
  solver::ShapeValues N;
  solver::ShapeGradients dN;
  for (int a = 0; a < n; ++a) {
    solver::shape_functions(type, nodes[static_cast<std::size_t>(a)], N, dN);
    for (int b = 0; b < n; ++b) {
      CHECK(N(b) == Approx(a == b ? 1.0 : 0.0).margin(1e-14));
    }
  }
  const Eigen::Vector2d xi(0.21, 0.33);
  solver::shape_functions(type, xi, N, dN);
  CHECK(N.sum() == Approx(1.0).epsilon(1e-14));
  CHECK(dN.col(0).sum() == Approx(0.0).margin(1e-14));
  CHECK(dN.col(1).sum() == Approx(0.0).margin(1e-14));
  // Gradients against central differences.
  const double h = 1e-6;
  solver::ShapeValues Np, Nm;
  solver::ShapeGradients unused;
  for (int k = 0; k < 2; ++k) {
    Eigen::Vector2d step = Eigen::Vector2d::Zero();
    step(k) = h;
    solver::shape_functions(type, xi + step, Np, unused);
    solver::shape_functions(type, xi - step, Nm, unused);
    const Eigen::VectorXd numeric = (Np - Nm) / (2 * h);
    CHECK((numeric - Eigen::VectorXd(dN.col(k))).cwiseAbs().maxCoeff() < 1e-8);
  }
}
