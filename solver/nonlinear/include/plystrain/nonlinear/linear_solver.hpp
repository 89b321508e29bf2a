// Sparse direct solves of the Newton tangent, behind one small interface so
// that another backend (distributed, iterative) can be added later.
//
// The direct solver keeps its symbolic analysis while the sparsity pattern
// stays the same (it is recomputed when the pattern changes) and refactorizes
// the numbers on every call. Symmetric tangents go to CHOLMOD's supernodal
// Cholesky; a tangent that is not positive definite falls back to CHOLMOD's
// simplicial LDL' (which also gives the inertia) and, if that breaks down, to
// UMFPACK's LU with pivoting. Non-symmetric tangents (follower loads) go to
// UMFPACK directly. Every failure comes back as data.
#pragma once

#include "plystrain/nonlinear/nonlinear_system.hpp"

#include <Eigen/Core>

#include <cstdint>
#include <memory>
#include <optional>
#include <string>

namespace plystrain::nonlinear {

enum class MatrixSymmetry { symmetric, unsymmetric };

// Fill-reducing ordering for the Cholesky / LDL' factors. METIS nested
// dissection was measured faster than AMD on the layered-strip tangents
// (docs/performance.md) and is the default.
enum class FillOrdering { amd, metis };

enum class FactorizationMethod {
  none,
  cholesky_supernodal,  // CHOLMOD LL', symmetric positive definite
  ldlt_simplicial,      // CHOLMOD LDL' without pivoting, symmetric (indefinite allowed)
  lu,                   // UMFPACK LU with partial pivoting
};

enum class FactorizationStatus {
  ok,
  singular,           // a zero pivot in every method tried
  numerical_failure,  // non-finite entries, or the library reported an error
  out_of_memory,
  bad_input,          // not square, or the size differs from the analysed pattern in a way that cannot be handled
};

[[nodiscard]] const char* method_name(FactorizationMethod method);
[[nodiscard]] const char* status_name(FactorizationStatus status);

struct LinearSolverOptions {
  FillOrdering ordering = FillOrdering::metis;
  // When the Cholesky fails, try LDL' before LU. LDL' reports the inertia;
  // LU only the sign of the determinant.
  bool try_ldlt_before_lu = true;
};

struct AnalysisReport {
  bool ok = true;
  std::string detail;
  double seconds = 0.0;
  double factor_nonzeros = 0.0;  // nnz(L) predicted by the analysis (symmetric path)
  double factor_flops = 0.0;     // flop count of one factorization (symmetric path)
};

struct FactorizationReport {
  FactorizationStatus status = FactorizationStatus::ok;
  FactorizationMethod method = FactorizationMethod::none;  // the method that succeeded (or was last tried)
  // The symmetric matrix was not positive definite: the Cholesky stopped at
  // failed_column (in the permuted order) and a fallback was used.
  bool not_positive_definite = false;
  int failed_column = -1;
  // Inertia from LDL': the number of negative and zero pivots of D. By
  // Sylvester's law of inertia these are the numbers of negative and zero
  // eigenvalues. 0 after a successful Cholesky; unknown (nullopt) after LU.
  std::optional<int> negative_pivots;
  std::optional<int> zero_pivots;
  // Sign of det(A) where known (Cholesky, LDL', LU); 0 when singular.
  int determinant_sign = 0;
  bool analysed = false;  // the symbolic analysis was (re)done in this call
  bool pattern_changed = false;
  double analyse_seconds = 0.0;
  double factorize_seconds = 0.0;  // includes failed attempts before the fallback
  std::string detail;

  [[nodiscard]] bool ok() const { return status == FactorizationStatus::ok; }
};

struct SolveReport {
  bool ok = true;
  std::string detail;
  double seconds = 0.0;
};

class LinearSolver {
 public:
  virtual ~LinearSolver() = default;

  // Symbolic analysis of the pattern (ordering, elimination tree). Optional:
  // factorize() analyses by itself when the pattern is new or changed.
  virtual AnalysisReport analyse(const SparseMatrix& matrix, MatrixSymmetry symmetry) = 0;

  // Numeric factorization. A symmetric matrix must be stored with both
  // triangles (only the upper one is read).
  virtual FactorizationReport factorize(const SparseMatrix& matrix, MatrixSymmetry symmetry) = 0;

  // Solves with the last successful factorization.
  virtual SolveReport solve(const Eigen::VectorXd& rhs, Eigen::VectorXd& solution) = 0;
};

// CHOLMOD + UMFPACK. Each instance owns its own library workspace; instances
// are independent (no shared state) but one instance is not thread-safe.
class DirectSparseSolver final : public LinearSolver {
 public:
  explicit DirectSparseSolver(LinearSolverOptions options = {});
  ~DirectSparseSolver() override;
  DirectSparseSolver(const DirectSparseSolver&) = delete;
  DirectSparseSolver& operator=(const DirectSparseSolver&) = delete;
  DirectSparseSolver(DirectSparseSolver&&) noexcept;
  DirectSparseSolver& operator=(DirectSparseSolver&&) noexcept;

  AnalysisReport analyse(const SparseMatrix& matrix, MatrixSymmetry symmetry) override;
  FactorizationReport factorize(const SparseMatrix& matrix, MatrixSymmetry symmetry) override;
  SolveReport solve(const Eigen::VectorXd& rhs, Eigen::VectorXd& solution) override;

  [[nodiscard]] const LinearSolverOptions& options() const { return options_; }

 private:
  struct Backend;
  LinearSolverOptions options_;
  std::unique_ptr<Backend> backend_;
};

// A fingerprint of a sparsity pattern (sizes, column pointers, row indices).
// Used to decide whether a symbolic analysis can be reused.
[[nodiscard]] std::uint64_t pattern_fingerprint(const SparseMatrix& matrix);

}  // namespace plystrain::nonlinear
