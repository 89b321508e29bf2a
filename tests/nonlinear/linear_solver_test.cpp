#include "plystrain/nonlinear/linear_solver.hpp"

#include <catch2/catch.hpp>

#include <Eigen/Dense>

#include <cmath>
#include <vector>

using plystrain::nonlinear::DirectSparseSolver;
using plystrain::nonlinear::FactorizationMethod;
using plystrain::nonlinear::FactorizationStatus;
using plystrain::nonlinear::FillOrdering;
using plystrain::nonlinear::LinearSolverOptions;
using plystrain::nonlinear::MatrixSymmetry;
using plystrain::nonlinear::SparseMatrix;

namespace {

// tridiag(-1, 2 - shift, -1), both triangles stored.
SparseMatrix shifted_laplacian(int n, double shift) {
  std::vector<Eigen::Triplet<double>> entries;
  for (int i = 0; i < n; ++i) {
    entries.emplace_back(i, i, 2.0 - shift);
    if (i + 1 < n) {
      entries.emplace_back(i, i + 1, -1.0);
      entries.emplace_back(i + 1, i, -1.0);
    }
  }
  SparseMatrix matrix(n, n);
  matrix.setFromTriplets(entries.begin(), entries.end());
  return matrix;
}

// The 5-point Laplacian on an m x m grid (Dirichlet), SPD.
SparseMatrix grid_laplacian(int m) {
  std::vector<Eigen::Triplet<double>> entries;
  auto id = [m](int i, int j) { return i * m + j; };
  for (int i = 0; i < m; ++i) {
    for (int j = 0; j < m; ++j) {
      entries.emplace_back(id(i, j), id(i, j), 4.0);
      if (i + 1 < m) {
        entries.emplace_back(id(i, j), id(i + 1, j), -1.0);
        entries.emplace_back(id(i + 1, j), id(i, j), -1.0);
      }
      if (j + 1 < m) {
        entries.emplace_back(id(i, j), id(i, j + 1), -1.0);
        entries.emplace_back(id(i, j + 1), id(i, j), -1.0);
      }
    }
  }
  SparseMatrix matrix(m * m, m * m);
  matrix.setFromTriplets(entries.begin(), entries.end());
  return matrix;
}

double relative_residual(const SparseMatrix& matrix, const Eigen::VectorXd& x, const Eigen::VectorXd& b) {
  return (matrix * x - b).norm() / b.norm();
}

}  // namespace

TEST_CASE("Cholesky solves an SPD system and reuses its analysis", "[linear_solver]") {
  for (const FillOrdering ordering : {FillOrdering::amd, FillOrdering::metis}) {
    LinearSolverOptions options;
    options.ordering = ordering;
    DirectSparseSolver solver(options);
    const SparseMatrix matrix = grid_laplacian(40);
    const Eigen::VectorXd exact = Eigen::VectorXd::LinSpaced(matrix.rows(), -1.0, 2.0);
    const Eigen::VectorXd rhs = matrix * exact;

    const auto first = solver.factorize(matrix, MatrixSymmetry::symmetric);
    REQUIRE(first.ok());
    CHECK(first.method == FactorizationMethod::cholesky_supernodal);
    CHECK(first.analysed);
    CHECK_FALSE(first.not_positive_definite);
    CHECK(first.negative_pivots == 0);
    CHECK(first.determinant_sign == 1);
    Eigen::VectorXd x;
    REQUIRE(solver.solve(rhs, x).ok);
    // A direct solve of a well-conditioned system is exact to rounding
    // (common practice): condition number of this Laplacian is about 700.
    CHECK((x - exact).norm() / exact.norm() < 1e-12);

    // Same pattern, new values: no new analysis.
    const SparseMatrix scaled = 3.0 * matrix;
    const auto second = solver.factorize(scaled, MatrixSymmetry::symmetric);
    REQUIRE(second.ok());
    CHECK_FALSE(second.analysed);
    REQUIRE(solver.solve(rhs, x).ok);
    CHECK((x - exact / 3.0).norm() / exact.norm() < 1e-12);

    // A changed pattern is detected and analysed again.
    SparseMatrix extended = matrix;
    extended.coeffRef(0, 5) = -0.1;
    extended.coeffRef(5, 0) = -0.1;
    extended.makeCompressed();
    const auto third = solver.factorize(extended, MatrixSymmetry::symmetric);
    REQUIRE(third.ok());
    CHECK(third.analysed);
    CHECK(third.pattern_changed);
    REQUIRE(solver.solve(rhs, x).ok);
    CHECK(relative_residual(extended, x, rhs) < 1e-12);
  }
}

TEST_CASE("An indefinite symmetric matrix falls back to LDL' and reports its inertia", "[linear_solver]") {
  // Eigenvalues of tridiag(-1, 2, -1) of size n are 2 - 2 cos(k pi / (n + 1)),
  // k = 1..n (Strang, Introduction to Applied Mathematics, 1986, sec. 1.5).
  // Shifted by s, the count of negative eigenvalues is the count of k with
  // 2 - 2 cos(k pi / (n + 1)) < s.
  const int n = 200;
  for (const double shift : {0.05, 0.5, 1.3}) {
    int expected_negative = 0;
    for (int k = 1; k <= n; ++k) {
      expected_negative += (2.0 - 2.0 * std::cos(k * M_PI / (n + 1)) < shift) ? 1 : 0;
    }
    DirectSparseSolver solver;
    const SparseMatrix matrix = shifted_laplacian(n, shift);
    const auto report = solver.factorize(matrix, MatrixSymmetry::symmetric);
    REQUIRE(report.ok());
    CHECK(report.not_positive_definite);
    CHECK(report.method == FactorizationMethod::ldlt_simplicial);
    REQUIRE(report.negative_pivots.has_value());
    CHECK(*report.negative_pivots == expected_negative);
    CHECK(report.determinant_sign == (expected_negative % 2 == 0 ? 1 : -1));
    const Eigen::VectorXd rhs = Eigen::VectorXd::Ones(n);
    Eigen::VectorXd x;
    REQUIRE(solver.solve(rhs, x).ok);
    CHECK(relative_residual(matrix, x, rhs) < 1e-9);

    // Once it was indefinite the next factorization starts with LDL'; a
    // positive definite matrix then goes back to Cholesky.
    const auto again = solver.factorize(matrix, MatrixSymmetry::symmetric);
    REQUIRE(again.ok());
    CHECK(again.method == FactorizationMethod::ldlt_simplicial);
    const SparseMatrix definite = shifted_laplacian(n, -0.5);
    const auto first_definite = solver.factorize(definite, MatrixSymmetry::symmetric);
    REQUIRE(first_definite.ok());
    CHECK(first_definite.negative_pivots == 0);
    const auto back = solver.factorize(definite, MatrixSymmetry::symmetric);
    CHECK(back.method == FactorizationMethod::cholesky_supernodal);
  }
}

TEST_CASE("A singular symmetric matrix is reported as singular", "[linear_solver]") {
  SparseMatrix matrix = shifted_laplacian(10, 0.0);
  // Decouple unknown 4 and give it a zero diagonal: exactly singular.
  for (int j = 0; j < 10; ++j) {
    if (j != 4) {
      matrix.coeffRef(4, j) = 0.0;
      matrix.coeffRef(j, 4) = 0.0;
    }
  }
  matrix.coeffRef(4, 4) = 0.0;
  DirectSparseSolver solver;
  const auto report = solver.factorize(matrix, MatrixSymmetry::symmetric);
  CHECK_FALSE(report.ok());
  CHECK(report.status == FactorizationStatus::singular);
  Eigen::VectorXd x;
  CHECK_FALSE(solver.solve(Eigen::VectorXd::Ones(10), x).ok);
}

TEST_CASE("Non-symmetric matrices are solved by LU with the determinant sign", "[linear_solver]") {
  const int n = 60;
  std::vector<Eigen::Triplet<double>> entries;
  for (int i = 0; i < n; ++i) {
    entries.emplace_back(i, i, (i % 7 == 3) ? -4.0 : 4.0);
    entries.emplace_back(i, (i + 1) % n, 1.5);
    entries.emplace_back(i, (i + 5) % n, -0.7);
    entries.emplace_back((i + 2) % n, i, 0.3);
  }
  SparseMatrix matrix(n, n);
  matrix.setFromTriplets(entries.begin(), entries.end());
  const Eigen::VectorXd exact = Eigen::VectorXd::LinSpaced(n, 1.0, 3.0);
  const Eigen::VectorXd rhs = matrix * exact;
  DirectSparseSolver solver;
  const auto report = solver.factorize(matrix, MatrixSymmetry::unsymmetric);
  REQUIRE(report.ok());
  CHECK(report.method == FactorizationMethod::lu);
  CHECK_FALSE(report.negative_pivots.has_value());
  // Reference: Eigen's dense partial-pivoting LU determinant.
  const double dense_determinant = Eigen::MatrixXd(matrix).partialPivLu().determinant();
  CHECK(report.determinant_sign == (dense_determinant > 0 ? 1 : -1));
  Eigen::VectorXd x;
  REQUIRE(solver.solve(rhs, x).ok);
  CHECK((x - exact).norm() / exact.norm() < 1e-12);
  // Refactorization with the same pattern reuses the symbolic analysis.
  const auto second = solver.factorize(2.0 * matrix, MatrixSymmetry::unsymmetric);
  REQUIRE(second.ok());
  CHECK_FALSE(second.analysed);
}

TEST_CASE("Bad matrices are reported, not thrown", "[linear_solver]") {
  DirectSparseSolver solver;
  SparseMatrix matrix = shifted_laplacian(5, 0.0);
  matrix.coeffRef(2, 2) = std::nan("");
  const auto report = solver.factorize(matrix, MatrixSymmetry::symmetric);
  CHECK(report.status == FactorizationStatus::numerical_failure);
  SparseMatrix rectangular(3, 4);
  CHECK(solver.factorize(rectangular, MatrixSymmetry::symmetric).status == FactorizationStatus::bad_input);
  Eigen::VectorXd x;
  CHECK_FALSE(solver.solve(Eigen::VectorXd::Ones(5), x).ok);
}

TEST_CASE("The pattern fingerprint sees pattern changes, not value changes", "[linear_solver]") {
  const SparseMatrix a = grid_laplacian(6);
  SparseMatrix b = 2.0 * a;
  CHECK(plystrain::nonlinear::pattern_fingerprint(a) == plystrain::nonlinear::pattern_fingerprint(b));
  b.coeffRef(0, 7) = 1.0;
  b.makeCompressed();
  CHECK(plystrain::nonlinear::pattern_fingerprint(a) != plystrain::nonlinear::pattern_fingerprint(b));
}
