// Newton-Raphson with a backtracking line search on the residual norm, for a
// NonlinearSystem R(q, lambda) = 0. Optionally the load factor lambda is an
// unknown too, fixed by one extra linear equation (displacement or arc-length
// control); the bordered system is then solved by block elimination with two
// solves per factorization.
//
// Nothing here throws for numerical trouble: every failure is a status in the
// result, with the iterate reached and the history of iterations.
#pragma once

#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/nonlinear/nonlinear_system.hpp"

#include <Eigen/Core>

#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace plystrain::nonlinear {

// Convergence: with r_k = |R(q_k)| and d_k = |q_k - q_{k-1}| (Euclidean),
// an iterate k >= 1 is converged when
//     (r_k <= max(residual_tolerance * r_ref, residual_floor)  and
//      d_k min(1, r_k / r_{k-1}) <= max(increment_tolerance * d_ref, increment_floor))
//  or  r_k <= residual_floor (also at k = 0),
// where r_ref = max(r_0, reference_residual) and d_ref = d_1 (the first
// increment); the increment test also passes below increment_rounding |q_0|,
// the rounding level of q (from a good predictor d_1 itself is tiny, and
// increment_tolerance d_1 lies below what q can resolve). d_k r_k / r_{k-1} estimates the next correction: near the
// solution both the correction and the residual shrink together, and a step
// that solved the equations exactly (a linear problem) is recognised without
// another solve. The floors are absolute, in the units of R and q; they only
// matter when the first residual of an increment is already tiny.
// Rounding: when the load of an increment is small against the internal
// forces (nearly incompressible solids, small cut-back increments), the
// residual stalls at rounding above residual_tolerance * r_ref. An iterate
// whose residual no longer contracts (r_k >= r_{k-1} / 2), whose predicted
// correction passes the increment test and whose residual is below
// stalled_residual_tolerance * r_ref is then accepted as converged
// (NewtonResult::stalled_at_rounding says so).
enum class LineSearchMerit { residual_norm, energy_slope };

struct NewtonOptions {
  int max_iterations = 25;
  double residual_tolerance = 1e-8;
  double residual_floor = 1e-12;
  double increment_tolerance = 1e-8;
  double increment_floor = 1e-14;
  double increment_rounding = 1e-11;
  double stalled_residual_tolerance = 1e-5;
  // Stop as diverged when r_k exceeds this multiple of r_ref.
  double divergence_factor = 1e8;
  // Stop as stagnated when r_k > progress_factor * r_(k - progress_window):
  // an iteration that has not even halved its residual in that many steps
  // is far outside Newton's region of attraction, and a cut-back increment
  // is cheaper than running on to the iteration limit (each of those steps
  // costs a factorization, often of an indefinite tangent). 0 switches the
  // rule off.
  int progress_window = 4;
  double progress_factor = 0.5;

  // Backtracking (Armijo) on |R|: accept the step factor a when
  //     |R(q + a dq)| <= (1 - sufficient_decrease * a) |R(q)|,
  // otherwise shrink a by the minimiser of a quadratic model of |R|^2/2,
  // kept within [0.1 a, 0.5 a]. Trial points use residual-only evaluations.
  // An evaluation failure at a trial point (an inverted element) counts as
  // no decrease. When no factor passes, the smallest one tried is taken.
  // With line_search_merit = energy_slope (for systems whose residual is the
  // gradient of an energy: hyperelastic solids, frictionless penalty contact
  // on rigid surfaces, dead loads), the factor is instead the root of the
  // energy's slope along the step, s(a) = dq . R(q + a dq): accepted where
  // |s(a)| <= slope_tolerance |s(0)|, or at a = 1 when the energy is still
  // falling there, found by regula falsi (Illinois) on [0, 1]; Crisfield,
  // Non-linear Finite Element Analysis of Solids and Structures, vol. 1
  // (1991), section 9.3. Where penalty contact switches on along a step the
  // residual norm jumps with the penalty while the energy barely moves, and
  // the norm-based search keeps cutting a converging step to a tenth. Used
  // for load-controlled steps with a descent direction (s(0) < 0); otherwise
  // the search falls back to the residual norm.
  bool line_search = true;
  LineSearchMerit line_search_merit = LineSearchMerit::residual_norm;
  double slope_tolerance = 0.5;
  int max_line_search_steps = 8;
  double sufficient_decrease = 1e-4;

  // Tangent symmetry: symmetric goes to Cholesky (with fallbacks), otherwise LU.
  MatrixSymmetry symmetry = MatrixSymmetry::symmetric;
};

// One extra equation that makes lambda an unknown:
//     q_coefficients . q + load_coefficient * lambda = value.
// Displacement control of unknown i: e_i . q = target; arc-length (normal
// plane): t_q . q + t_lambda * lambda = t . z_n + ds.
struct PathEquation {
  Eigen::VectorXd q_coefficients;
  double load_coefficient = 0.0;
  double value = 0.0;

  [[nodiscard]] double residual(const Eigen::VectorXd& q, double load_factor) const {
    return q_coefficients.dot(q) + load_coefficient * load_factor - value;
  }
};

enum class NewtonStatus {
  converged,
  evaluation_failed,      // the system reported a failure at an iterate (not a line-search trial)
  factorization_failed,   // every factorization method failed
  solve_failed,
  non_finite,             // a non-finite residual norm or step
  iteration_limit,
  stagnated,              // the residual stopped falling (see NewtonOptions::progress_window)
  diverged,
  singular_path_equation, // the bordered system has no unique load-factor correction
};

[[nodiscard]] const char* status_name(NewtonStatus status);

struct NewtonIterationRecord {
  int iteration = 0;                 // 0-based
  double residual_norm = 0.0;        // |R| at the start of the iteration
  double increment_norm = 0.0;       // |a dq| taken in this iteration (0 if none)
  double load_factor = 0.0;          // at the start of the iteration
  double load_factor_change = 0.0;   // a dlambda (path-controlled only)
  double line_search_factor = 1.0;   // a
  int line_search_evaluations = 0;   // residual evaluations beyond the first
  bool line_search_failed = false;   // no factor passed the sufficient-decrease test
  double assemble_seconds = 0.0;     // evaluate() with the tangent, plus trial residuals
  double analyse_seconds = 0.0;      // symbolic analysis (first iteration, or a changed pattern)
  double factorize_seconds = 0.0;    // numeric factorization, failed attempts before a fallback included
  double solve_seconds = 0.0;        // triangular solves
  FactorizationMethod method = FactorizationMethod::none;
  bool not_positive_definite = false;
  std::optional<int> negative_pivots;
};

struct NewtonResult {
  NewtonStatus status = NewtonStatus::iteration_limit;
  std::string detail;  // what failed, where (system detail, factorization detail)
  Eigen::VectorXd q;   // converged or last iterate
  double load_factor = 0.0;
  double residual_norm = 0.0;
  std::vector<NewtonIterationRecord> iterations;
  FactorizationReport last_factorization;
  int active_set_updates = 0;
  bool stalled_at_rounding = false;  // converged by the rounding rule above

  [[nodiscard]] bool converged() const { return status == NewtonStatus::converged; }
};

using NewtonIterationCallback = std::function<void(const NewtonIterationRecord&)>;

// Solves R(q, lambda) = 0 from (q_start, load_factor). With `path` given,
// lambda is an unknown as well (starting at load_factor). reference_residual
// enters r_ref above (0 = use the first residual only).
[[nodiscard]] NewtonResult solve_newton(NonlinearSystem& system, LinearSolver& linear_solver,
                                        const Eigen::VectorXd& q_start, double load_factor,
                                        const NewtonOptions& options,
                                        const PathEquation* path = nullptr,
                                        double reference_residual = 0.0,
                                        const NewtonIterationCallback& on_iteration = {});

}  // namespace plystrain::nonlinear
