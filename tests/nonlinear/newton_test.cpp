#include "plystrain/nonlinear/newton.hpp"

#include "nonlinear/test_systems.hpp"

#include <catch2/catch.hpp>

#include <Eigen/Dense>

#include <cmath>
#include <vector>

using plystrain::nonlinear::DirectSparseSolver;
using plystrain::nonlinear::NewtonOptions;
using plystrain::nonlinear::NewtonStatus;
using plystrain::nonlinear::PathEquation;
using plystrain::nonlinear::solve_newton;
using plystrain::test::ArctangentSystem;
using plystrain::test::HardeningSpringChain;
using plystrain::test::VonMisesTruss;

TEST_CASE("Test systems have tangents equal to finite differences", "[newton]") {
  HardeningSpringChain chain(6, 2.0, 0.7, 1.5);
  const Eigen::VectorXd q = Eigen::VectorXd::LinSpaced(6, 0.1, 0.9).array().square();
  Eigen::VectorXd residual;
  plystrain::nonlinear::SparseMatrix tangent;
  REQUIRE(chain.evaluate(q, 0.4, residual, &tangent).ok());
  const Eigen::MatrixXd numeric = plystrain::test::finite_difference_tangent(chain, q, 0.4);
  CHECK((Eigen::MatrixXd(tangent) - numeric).norm() <= 1e-7 * numeric.norm());

  VonMisesTruss truss(1.0, 0.3, 10.0, 1.0);
  const Eigen::Vector2d point(0.05, 0.2);
  REQUIRE(truss.evaluate(point, 0.3, residual, &tangent).ok());
  const Eigen::MatrixXd truss_numeric = plystrain::test::finite_difference_tangent(truss, point, 0.3);
  CHECK((Eigen::MatrixXd(tangent) - truss_numeric).norm() <= 1e-7 * truss_numeric.norm());
}

TEST_CASE("Newton converges quadratically on the hardening spring chain", "[newton]") {
  HardeningSpringChain chain(50, 1.0, 2.0, 3.0);
  DirectSparseSolver solver;
  NewtonOptions options;
  options.residual_tolerance = 1e-12;
  options.line_search = false;  // pure Newton
  const auto result = solve_newton(chain, solver, Eigen::VectorXd::Zero(50), 1.0, options);
  REQUIRE(result.converged());
  // Closed form (Cardano, see test_systems.hpp).
  const Eigen::VectorXd exact = chain.exact(1.0);
  CHECK((result.q - exact).norm() / exact.norm() < 1e-12);

  // Quadratic rate: for residuals well below the start and above rounding,
  // log(r_{k+1}/r_0) / log(r_k/r_0) approaches 2 (Newton's local theorem,
  // e.g. Dennis & Schnabel 1983, thm. 5.2.1).
  std::vector<double> relative;
  for (const auto& record : result.iterations) {
    relative.push_back(record.residual_norm / result.iterations.front().residual_norm);
  }
  int checked = 0;
  for (size_t k = 0; k + 1 < relative.size(); ++k) {
    if (relative[k] < 1e-2 && relative[k + 1] > 1e-15) {
      CHECK(std::log(relative[k + 1]) / std::log(relative[k]) > 1.8);
      ++checked;
    }
  }
  CHECK(checked >= 1);
  CHECK(result.iterations.size() < 12);
}

TEST_CASE("A linear problem converges after one step", "[newton]") {
  // c = 0: linear springs, u_i = i P / k.
  HardeningSpringChain chain(10, 4.0, 1e-300, 2.0);
  DirectSparseSolver solver;
  const auto result = solve_newton(chain, solver, Eigen::VectorXd::Zero(10), 1.0, NewtonOptions{});
  REQUIRE(result.converged());
  CHECK(result.iterations.size() == 2);  // the start and the converged state
  CHECK(result.q(9) == Approx(10 * 2.0 / 4.0).epsilon(1e-13));
}

TEST_CASE("The line search rescues Newton where full steps diverge", "[newton]") {
  // Full Newton on atan diverges from |x| > 1.39 (see test_systems.hpp).
  // One unknown: with several, a decrease of the summed norm can hide one
  // component running off along the flat tail of atan, which is what a
  // residual-norm merit allows.
  const Eigen::VectorXd centres = Eigen::VectorXd::Constant(1, 0.5);
  ArctangentSystem system(centres);
  DirectSparseSolver solver;
  const Eigen::VectorXd start = Eigen::VectorXd::Constant(1, 3.0);
  NewtonOptions plain;
  plain.line_search = false;
  plain.max_iterations = 30;
  const auto undamped = solve_newton(system, solver, start, 1.0, plain);
  CHECK_FALSE(undamped.converged());

  NewtonOptions damped;
  damped.max_iterations = 30;
  const auto result = solve_newton(system, solver, start, 1.0, damped);
  REQUIRE(result.converged());
  CHECK((result.q - centres).norm() < 1e-10);
  bool backtracked = false;
  for (const auto& record : result.iterations) {
    backtracked = backtracked || record.line_search_factor < 1.0;
  }
  CHECK(backtracked);
}

// r(q) = q^2 + 1 has no real root: |r| >= 1 wherever Newton goes, so an
// iteration from q = 3 (|r| = 10) can fall towards 1 but never halve its
// residual once there. Closed-form fact, no source needed.
class NoRealRoot : public plystrain::nonlinear::NonlinearSystem {
 public:
  [[nodiscard]] int size() const override { return 1; }
  plystrain::nonlinear::Evaluation evaluate(const Eigen::VectorXd& q, double, Eigen::VectorXd& residual,
                                         plystrain::nonlinear::SparseMatrix* tangent) override {
    residual = Eigen::VectorXd::Constant(1, q(0) * q(0) + 1.0);
    if (tangent != nullptr) {
      tangent->resize(1, 1);
      tangent->setZero();
      tangent->insert(0, 0) = 2.0 * q(0);
      tangent->makeCompressed();
    }
    return {};
  }
};

TEST_CASE("Newton stops early when the residual stops falling", "[newton]") {
  NoRealRoot system;
  DirectSparseSolver solver;
  NewtonOptions options;
  options.max_iterations = 50;
  const auto result = solve_newton(system, solver, Eigen::VectorXd::Constant(1, 3.0), 1.0, options);
  CHECK(result.status == NewtonStatus::stagnated);
  CHECK(result.iterations.size() < 20);
  CHECK(result.detail.find("fell only") != std::string::npos);

  options.progress_window = 0;  // the rule off: runs to the limit
  const auto unlimited = solve_newton(system, solver, Eigen::VectorXd::Constant(1, 3.0), 1.0, options);
  CHECK(unlimited.status == NewtonStatus::iteration_limit);
}

TEST_CASE("Newton failures come back as data", "[newton]") {
  HardeningSpringChain chain(5, 1.0, 2.0, 3.0);
  DirectSparseSolver solver;
  NewtonOptions options;
  options.max_iterations = 1;
  const auto limited = solve_newton(chain, solver, Eigen::VectorXd::Zero(5), 1.0, options);
  CHECK(limited.status == NewtonStatus::iteration_limit);
  CHECK_FALSE(limited.detail.empty());
  CHECK(limited.iterations.size() == 2);

  plystrain::test::FailureInjector failing(chain);
  failing.ceiling = 0.5;
  const auto failed = solve_newton(failing, solver, Eigen::VectorXd::Zero(5), 1.0, NewtonOptions{});
  CHECK(failed.status == NewtonStatus::evaluation_failed);
  CHECK(failed.detail.find("injected failure") != std::string::npos);

  Eigen::VectorXd nan_start = Eigen::VectorXd::Zero(5);
  nan_start(2) = std::nan("");
  const auto non_finite = solve_newton(chain, solver, nan_start, 1.0, NewtonOptions{});
  CHECK(non_finite.status == NewtonStatus::non_finite);
}

TEST_CASE("Displacement control finds the load on the falling branch of the truss", "[newton]") {
  // Between the limit point and v = H the load falls: prescribing v there
  // and solving for lambda is well posed while load control is not.
  VonMisesTruss truss(1.0, 0.3, 10.0, 1.0);
  DirectSparseSolver solver;
  const double v = 0.2;  // between H (1 - 1/sqrt 3) = 0.127 and H = 0.3
  PathEquation path;
  path.q_coefficients = Eigen::Vector2d(0.0, 1.0);
  path.value = v;
  const auto result = solve_newton(truss, solver, Eigen::Vector2d(0.0, v), 0.0, NewtonOptions{}, &path);
  REQUIRE(result.converged());
  CHECK(result.q(1) == Approx(v).epsilon(1e-14));
  CHECK(std::abs(result.q(0)) < 1e-14);
  CHECK(result.load_factor == Approx(truss.load_factor_at(v)).epsilon(1e-10));
  // Past the limit point the tangent has one negative eigenvalue.
  REQUIRE(result.last_factorization.negative_pivots.has_value());
  CHECK(*result.last_factorization.negative_pivots == 1);
}

// E(q) = (q - 3)^2 / 2 + k/2 max(q - 1, 0)^2: a unit spring pulling towards
// 3 against a stiff penalty wall at 1, the one-unknown image of a node
// pressed onto a rigid surface. Minimiser q* = (3 + k) / (1 + k), a closed
// form. From q = 0 the first Newton step (tangent 1) lands deep behind the
// wall, where the residual is k times larger than at the start while the
// energy's slope along the step changes sign just past the wall.
class PenaltyWall : public plystrain::nonlinear::NonlinearSystem {
 public:
  explicit PenaltyWall(double stiffness) : stiffness_(stiffness) {}
  [[nodiscard]] int size() const override { return 1; }
  plystrain::nonlinear::Evaluation evaluate(const Eigen::VectorXd& q, double, Eigen::VectorXd& residual,
                                         plystrain::nonlinear::SparseMatrix* tangent) override {
    const double behind = std::max(q(0) - 1.0, 0.0);
    residual = Eigen::VectorXd::Constant(1, q(0) - 3.0 + stiffness_ * behind);
    if (tangent != nullptr) {
      tangent->resize(1, 1);
      tangent->setZero();
      tangent->insert(0, 0) = 1.0 + (behind > 0.0 ? stiffness_ : 0.0);
      tangent->makeCompressed();
    }
    return {};
  }
  [[nodiscard]] double energy(double q) const {
    const double behind = std::max(q - 1.0, 0.0);
    return 0.5 * (q - 3.0) * (q - 3.0) + 0.5 * stiffness_ * behind * behind;
  }

 private:
  double stiffness_;
};

TEST_CASE("The energy-slope line search stops a step at a penalty wall", "[newton]") {
  constexpr double stiffness = 1e4;
  PenaltyWall wall(stiffness);
  DirectSparseSolver solver;
  const Eigen::VectorXd start = Eigen::VectorXd::Zero(1);
  NewtonOptions by_norm;
  by_norm.max_iterations = 60;
  by_norm.progress_window = 0;
  NewtonOptions by_slope = by_norm;
  by_slope.line_search_merit = plystrain::nonlinear::LineSearchMerit::energy_slope;

  const auto norm_result = solve_newton(wall, solver, start, 1.0, by_norm);
  const auto slope_result = solve_newton(wall, solver, start, 1.0, by_slope);
  const double exact = (3.0 + stiffness) / (1.0 + stiffness);
  REQUIRE(norm_result.converged());
  REQUIRE(slope_result.converged());
  CHECK(slope_result.q(0) == Approx(exact).epsilon(1e-12));
  CHECK(norm_result.q(0) == Approx(exact).epsilon(1e-12));
  // The slope search finds the wall within its first step; the norm search
  // creeps towards it by a tenth of the step at a time.
  CHECK(slope_result.iterations.size() <= 5);  // the converged state included
  INFO("norm search: " << norm_result.iterations.size() << " records");
  CHECK(norm_result.iterations.size() > slope_result.iterations.size() + 3);
  // Every accepted step lowers the energy.
  double q = 0.0;
  for (const auto& record : slope_result.iterations) {
    const double next = q + (record.increment_norm > 0.0 ? record.increment_norm : 0.0);
    CHECK(wall.energy(next) <= wall.energy(q) + 1e-12);
    q = next;
  }
}

TEST_CASE("The energy-slope line search also solves the arctangent from afar", "[newton]") {
  // atan(q - c) is the gradient of a convex energy; full Newton steps
  // diverge from |q - c| > 1.39 (see test_systems.hpp).
  const Eigen::VectorXd centres = Eigen::VectorXd::Constant(1, 0.5);
  ArctangentSystem system(centres);
  DirectSparseSolver solver;
  NewtonOptions options;
  options.max_iterations = 30;
  options.line_search_merit = plystrain::nonlinear::LineSearchMerit::energy_slope;
  const auto result = solve_newton(system, solver, Eigen::VectorXd::Constant(1, 3.0), 1.0, options);
  REQUIRE(result.converged());
  CHECK((result.q - centres).norm() < 1e-10);
}
