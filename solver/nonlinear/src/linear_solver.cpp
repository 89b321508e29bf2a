#include "plystrain/nonlinear/linear_solver.hpp"

#include "stopwatch.hpp"

#include <cholmod.h>
#include <umfpack.h>

#include <array>
#include <cmath>
#include <cstring>
#include <string>
#include <utility>

namespace plystrain::nonlinear {

namespace {

// A read-only CHOLMOD view of a compressed Eigen matrix (no copy). CHOLMOD's
// API takes non-const pointers but does not write through them here.
cholmod_sparse cholmod_view(const SparseMatrix& matrix, int stype) {
  cholmod_sparse view{};
  view.nrow = static_cast<size_t>(matrix.rows());
  view.ncol = static_cast<size_t>(matrix.cols());
  view.nzmax = static_cast<size_t>(matrix.nonZeros());
  view.p = const_cast<int*>(matrix.outerIndexPtr());
  view.i = const_cast<int*>(matrix.innerIndexPtr());
  view.nz = nullptr;
  view.x = const_cast<double*>(matrix.valuePtr());
  view.z = nullptr;
  view.stype = stype;  // > 0: only the upper triangle is read
  view.itype = CHOLMOD_INT;
  view.xtype = CHOLMOD_REAL;
  view.dtype = CHOLMOD_DOUBLE;
  view.sorted = 1;  // Eigen keeps row indices sorted within each column
  view.packed = 1;
  return view;
}

cholmod_dense cholmod_view(const Eigen::VectorXd& vector) {
  cholmod_dense view{};
  view.nrow = static_cast<size_t>(vector.size());
  view.ncol = 1;
  view.nzmax = static_cast<size_t>(vector.size());
  view.d = static_cast<size_t>(vector.size());
  view.x = const_cast<double*>(vector.data());
  view.z = nullptr;
  view.xtype = CHOLMOD_REAL;
  view.dtype = CHOLMOD_DOUBLE;
  return view;
}

std::string cholmod_status_text(int status) {
  switch (status) {
    case CHOLMOD_OK: return "ok";
    case CHOLMOD_NOT_INSTALLED: return "method not installed";
    case CHOLMOD_OUT_OF_MEMORY: return "out of memory";
    case CHOLMOD_TOO_LARGE: return "integer overflow (problem too large)";
    case CHOLMOD_INVALID: return "invalid input";
    case CHOLMOD_GPU_PROBLEM: return "GPU problem";
    case CHOLMOD_NOT_POSDEF: return "not positive definite";
    case CHOLMOD_DSMALL: return "tiny pivot";
    default: return "status " + std::to_string(status);
  }
}

FactorizationStatus from_cholmod_error(int status) {
  if (status == CHOLMOD_OUT_OF_MEMORY || status == CHOLMOD_TOO_LARGE) {
    return FactorizationStatus::out_of_memory;
  }
  if (status == CHOLMOD_INVALID) {
    return FactorizationStatus::bad_input;
  }
  return FactorizationStatus::numerical_failure;
}

// Eigen may hold a matrix in uncompressed (insertion) mode; the libraries
// need the compressed column form.
const SparseMatrix& compressed_form(const SparseMatrix& input, SparseMatrix& storage) {
  if (input.isCompressed()) {
    return input;
  }
  storage = input;
  storage.makeCompressed();
  return storage;
}

}  // namespace

const char* method_name(FactorizationMethod method) {
  switch (method) {
    case FactorizationMethod::none: return "none";
    case FactorizationMethod::cholesky_supernodal: return "supernodal Cholesky (CHOLMOD)";
    case FactorizationMethod::ldlt_simplicial: return "simplicial LDL' (CHOLMOD)";
    case FactorizationMethod::lu: return "LU (UMFPACK)";
  }
  return "unknown";
}

const char* status_name(FactorizationStatus status) {
  switch (status) {
    case FactorizationStatus::ok: return "ok";
    case FactorizationStatus::singular: return "singular matrix";
    case FactorizationStatus::numerical_failure: return "numerical failure";
    case FactorizationStatus::out_of_memory: return "out of memory";
    case FactorizationStatus::bad_input: return "bad input";
  }
  return "unknown";
}

std::uint64_t pattern_fingerprint(const SparseMatrix& matrix) {
  // FNV-1a style mixing over four independent lanes of 32-bit words, so the
  // multiply latency does not serialise the loop (this runs every Newton
  // iteration over tens of millions of indices).
  constexpr std::uint64_t prime = 0x100000001b3ULL;
  std::array<std::uint64_t, 4> lane = {0xcbf29ce484222325ULL, 0x84222325cbf29ce4ULL,
                                       0x9e3779b97f4a7c15ULL, 0xc2b2ae3d27d4eb4fULL};
  auto mix_array = [&](const int* data, Eigen::Index count) {
    Eigen::Index k = 0;
    for (; k + 4 <= count; k += 4) {
      for (int l = 0; l < 4; ++l) {
        lane[l] = (lane[l] ^ static_cast<std::uint32_t>(data[k + l])) * prime;
      }
    }
    for (; k < count; ++k) {
      lane[0] = (lane[0] ^ static_cast<std::uint32_t>(data[k])) * prime;
    }
  };
  const std::array<int, 3> sizes = {static_cast<int>(matrix.rows()), static_cast<int>(matrix.cols()),
                                    static_cast<int>(matrix.nonZeros())};
  mix_array(sizes.data(), 3);
  mix_array(matrix.outerIndexPtr(), matrix.outerSize() + 1);
  mix_array(matrix.innerIndexPtr(), matrix.nonZeros());
  std::uint64_t hash = 0;
  for (const std::uint64_t value : lane) {
    hash = (hash ^ value) * prime;
  }
  return hash;
}

struct DirectSparseSolver::Backend {
  cholmod_common common{};
  cholmod_factor* supernodal = nullptr;  // LL' analysis + numbers
  cholmod_factor* simplicial = nullptr;  // LDL' analysis + numbers
  std::uint64_t supernodal_pattern = 0;
  std::uint64_t simplicial_pattern = 0;

  void* lu_symbolic = nullptr;
  void* lu_numeric = nullptr;
  std::uint64_t lu_pattern = 0;
  bool lu_symmetric_strategy = false;
  std::array<double, UMFPACK_CONTROL> lu_control{};

  // Solve workspaces kept between calls (cholmod_solve2).
  cholmod_dense* solution = nullptr;
  cholmod_dense* work_y = nullptr;
  cholmod_dense* work_e = nullptr;

  FactorizationMethod active = FactorizationMethod::none;
  int size = 0;
  // The last symmetric matrix was indefinite: start with LDL' next time
  // rather than paying for a failed Cholesky on every Newton iteration.
  bool prefer_ldlt = false;

  explicit Backend(const LinearSolverOptions& options) {
    cholmod_start(&common);
    common.print = 0;  // failures are reported as data, not printed
    common.nmethods = 1;
    common.method[0].ordering = options.ordering == FillOrdering::metis ? CHOLMOD_METIS : CHOLMOD_AMD;
    common.postorder = 1;
    common.quick_return_if_not_posdef = 1;
    umfpack_di_defaults(lu_control.data());
    lu_control[UMFPACK_PRL] = 0;
    lu_control[UMFPACK_IRSTEP] = 0;  // solve() then needs only the factors
  }

  ~Backend() {
    free_cholmod_factor(supernodal);
    free_cholmod_factor(simplicial);
    free_lu();
    for (cholmod_dense** dense : {&solution, &work_y, &work_e}) {
      if (*dense != nullptr) {
        cholmod_free_dense(dense, &common);
      }
    }
    cholmod_finish(&common);
  }
  Backend(const Backend&) = delete;
  Backend& operator=(const Backend&) = delete;

  void free_cholmod_factor(cholmod_factor*& factor) {
    if (factor != nullptr) {
      cholmod_free_factor(&factor, &common);
    }
  }

  void free_lu() {
    if (lu_numeric != nullptr) {
      umfpack_di_free_numeric(&lu_numeric);
    }
    if (lu_symbolic != nullptr) {
      umfpack_di_free_symbolic(&lu_symbolic);
    }
  }

  // Symbolic analysis for LL' (supernodal) or LDL' (simplicial).
  // CHOLMOD's supernodal LL' or simplicial LDL' (with the inertia) of the
  // symmetric matrix; false when it failed or, for LL', the matrix is not
  // positive definite (the report says which).
  bool factorize_cholmod(const SparseMatrix& matrix, std::uint64_t pattern, bool supernodal_factor,
                         FactorizationReport& report);
  // UMFPACK's LU with partial pivoting; false when it failed (the report says why).
  bool factorize_lu(const SparseMatrix& matrix, std::uint64_t pattern, bool symmetric_strategy,
                    FactorizationReport& report);

  AnalysisReport analyse_symmetric(const SparseMatrix& matrix, bool want_supernodal, std::uint64_t pattern) {
    const detail::Stopwatch start;
    cholmod_factor*& factor = want_supernodal ? supernodal : simplicial;
    free_cholmod_factor(factor);
    cholmod_sparse view = cholmod_view(matrix, 1);
    common.supernodal = want_supernodal ? CHOLMOD_SUPERNODAL : CHOLMOD_SIMPLICIAL;
    factor = cholmod_analyze(&view, &common);
    AnalysisReport report;
    report.seconds = start.seconds();
    if (factor == nullptr || common.status < CHOLMOD_OK) {
      report.ok = false;
      report.detail = "CHOLMOD analysis failed: " + cholmod_status_text(common.status);
      free_cholmod_factor(factor);
      return report;
    }
    report.factor_nonzeros = common.lnz;
    report.factor_flops = common.fl;
    (want_supernodal ? supernodal_pattern : simplicial_pattern) = pattern;
    return report;
  }

  bool analyse_lu(const SparseMatrix& matrix, bool symmetric_strategy, std::uint64_t pattern,
                  std::string& detail) {
    free_lu();
    lu_control[UMFPACK_STRATEGY] = symmetric_strategy ? UMFPACK_STRATEGY_SYMMETRIC : UMFPACK_STRATEGY_AUTO;
    std::array<double, UMFPACK_INFO> info{};
    const int code = umfpack_di_symbolic(static_cast<int>(matrix.rows()), static_cast<int>(matrix.cols()),
                                         matrix.outerIndexPtr(), matrix.innerIndexPtr(), matrix.valuePtr(),
                                         &lu_symbolic, lu_control.data(), info.data());
    if (code != UMFPACK_OK) {
      detail = "UMFPACK symbolic analysis failed with code " + std::to_string(code);
      lu_symbolic = nullptr;
      return false;
    }
    lu_pattern = pattern;
    lu_symmetric_strategy = symmetric_strategy;
    return true;
  }
};

DirectSparseSolver::DirectSparseSolver(LinearSolverOptions options)
    : options_(options), backend_(std::make_unique<Backend>(options)) {}

DirectSparseSolver::~DirectSparseSolver() = default;
DirectSparseSolver::DirectSparseSolver(DirectSparseSolver&&) noexcept = default;
DirectSparseSolver& DirectSparseSolver::operator=(DirectSparseSolver&&) noexcept = default;

AnalysisReport DirectSparseSolver::analyse(const SparseMatrix& input, MatrixSymmetry symmetry) {
  SparseMatrix compressed;
  const SparseMatrix& matrix = compressed_form(input, compressed);
  const std::uint64_t pattern = pattern_fingerprint(matrix);
  if (symmetry == MatrixSymmetry::symmetric) {
    return backend_->analyse_symmetric(matrix, true, pattern);
  }
  AnalysisReport report;
  const detail::Stopwatch start;
  report.ok = backend_->analyse_lu(matrix, false, pattern, report.detail);
  report.seconds = start.seconds();
  return report;
}

bool DirectSparseSolver::Backend::factorize_cholmod(const SparseMatrix& matrix, std::uint64_t pattern,
                                                   bool supernodal_factor, FactorizationReport& report) {
  Backend& b = *this;
  const int n = static_cast<int>(matrix.rows());
  cholmod_factor*& factor = supernodal_factor ? b.supernodal : b.simplicial;
  const std::uint64_t known = supernodal_factor ? b.supernodal_pattern : b.simplicial_pattern;
  if (factor == nullptr || known != pattern) {
    report.pattern_changed = report.pattern_changed || factor != nullptr;
    const AnalysisReport analysis = b.analyse_symmetric(matrix, supernodal_factor, pattern);
    report.analysed = true;
    report.analyse_seconds += analysis.seconds;
    if (!analysis.ok) {
      report.status = FactorizationStatus::numerical_failure;
      report.detail = analysis.detail;
      return false;
    }
  }
  const detail::Stopwatch start;
  cholmod_sparse view = cholmod_view(matrix, 1);
  b.common.final_ll = supernodal_factor ? 1 : 0;
  const int success = cholmod_factorize(&view, factor, &b.common);
  report.factorize_seconds += start.seconds();
  report.method = supernodal_factor ? FactorizationMethod::cholesky_supernodal : FactorizationMethod::ldlt_simplicial;
  if (success == 0 || b.common.status < CHOLMOD_OK) {
    report.status = from_cholmod_error(b.common.status);
    report.detail = std::string(method_name(report.method)) + " failed: " + cholmod_status_text(b.common.status);
    return false;
  }
  const bool broke_down = factor->minor < factor->n;
  if (supernodal_factor) {
    if (broke_down) {
      report.not_positive_definite = true;
      report.failed_column = static_cast<int>(factor->minor);
      return false;
    }
    report.negative_pivots = 0;
    report.zero_pivots = 0;
    report.determinant_sign = 1;
    return true;
  }
  if (broke_down) {
    report.detail = "LDL' met a zero pivot at column " + std::to_string(factor->minor);
    return false;
  }
  // Simplicial LDL': D(j) is the first entry of column j of L.
  const auto* column_start = static_cast<const int*>(factor->p);
  const auto* values = static_cast<const double*>(factor->x);
  int negative = 0;
  int zero = 0;
  for (int j = 0; j < n; ++j) {
    const double pivot = values[column_start[j]];
    negative += pivot < 0.0 ? 1 : 0;
    zero += pivot == 0.0 ? 1 : 0;
  }
  report.negative_pivots = negative;
  report.zero_pivots = zero;
  report.determinant_sign = zero > 0 ? 0 : (negative % 2 == 0 ? 1 : -1);
  if (zero > 0) {
    report.detail = "LDL' has " + std::to_string(zero) + " zero pivots";
    return false;
  }
  return true;
}

bool DirectSparseSolver::Backend::factorize_lu(const SparseMatrix& matrix, std::uint64_t pattern,
                                              bool symmetric_strategy, FactorizationReport& report) {
  Backend& b = *this;
  if (b.lu_symbolic == nullptr || b.lu_pattern != pattern || b.lu_symmetric_strategy != symmetric_strategy) {
    report.pattern_changed = report.pattern_changed || b.lu_symbolic != nullptr;
    const detail::Stopwatch start;
    std::string detail;
    const bool analysed = b.analyse_lu(matrix, symmetric_strategy, pattern, detail);
    report.analysed = true;
    report.analyse_seconds += start.seconds();
    if (!analysed) {
      report.status = FactorizationStatus::numerical_failure;
      report.detail = detail;
      return false;
    }
  }
  if (b.lu_numeric != nullptr) {
    umfpack_di_free_numeric(&b.lu_numeric);
  }
  const detail::Stopwatch start;
  std::array<double, UMFPACK_INFO> info{};
  const int code = umfpack_di_numeric(matrix.outerIndexPtr(), matrix.innerIndexPtr(), matrix.valuePtr(),
                                      b.lu_symbolic, &b.lu_numeric, b.lu_control.data(), info.data());
  report.factorize_seconds += start.seconds();
  report.method = FactorizationMethod::lu;
  report.negative_pivots.reset();
  report.zero_pivots.reset();
  if (code == UMFPACK_WARNING_singular_matrix) {
    report.status = FactorizationStatus::singular;
    report.determinant_sign = 0;
    report.detail = "LU: matrix is singular";
    return false;
  }
  if (code != UMFPACK_OK) {
    report.status = code == UMFPACK_ERROR_out_of_memory ? FactorizationStatus::out_of_memory
                                                        : FactorizationStatus::numerical_failure;
    report.detail = "UMFPACK numeric factorization failed with code " + std::to_string(code);
    return false;
  }
  // Mantissa and exponent: the plain product of thousands of pivots
  // overflows or underflows.
  double mantissa = 0.0;
  double exponent = 0.0;
  umfpack_di_get_determinant(&mantissa, &exponent, b.lu_numeric, info.data());
  report.determinant_sign = mantissa > 0.0 ? 1 : (mantissa < 0.0 ? -1 : 0);
  return true;
}

FactorizationReport DirectSparseSolver::factorize(const SparseMatrix& input, MatrixSymmetry symmetry) {
  Backend& b = *backend_;
  FactorizationReport report;
  b.active = FactorizationMethod::none;
  if (input.rows() != input.cols() || input.rows() == 0) {
    report.status = FactorizationStatus::bad_input;
    report.detail = "matrix is " + std::to_string(input.rows()) + " x " + std::to_string(input.cols()) +
                    ", expected square and non-empty";
    return report;
  }
  SparseMatrix compressed;
  const SparseMatrix& matrix = compressed_form(input, compressed);
  if (!matrix.coeffs().allFinite()) {
    report.status = FactorizationStatus::numerical_failure;
    report.detail = "matrix has non-finite entries";
    return report;
  }
  const std::uint64_t pattern = pattern_fingerprint(matrix);
  const int n = static_cast<int>(matrix.rows());
  b.size = n;

  bool done = false;
  if (symmetry == MatrixSymmetry::symmetric) {
    if (!b.prefer_ldlt) {
      done = b.factorize_cholmod(matrix, pattern, true, report);
      if (!done && !report.not_positive_definite) {
        return report;  // a hard failure, not indefiniteness
      }
    }
    if (!done && options_.try_ldlt_before_lu) {
      report.status = FactorizationStatus::ok;
      done = b.factorize_cholmod(matrix, pattern, false, report);
      if (done) {
        // Indefinite (or first time after an indefinite one): keep LDL'
        // while it finds negative pivots, back to Cholesky once it does not.
        report.not_positive_definite = report.not_positive_definite || report.negative_pivots.value_or(0) > 0;
        b.prefer_ldlt = report.negative_pivots.value_or(0) > 0;
      }
    }
    if (!done) {
      report.status = FactorizationStatus::ok;
      done = b.factorize_lu(matrix, pattern, true, report);
      b.prefer_ldlt = false;
    }
  } else {
    done = b.factorize_lu(matrix, pattern, false, report);
  }
  if (!done) {
    if (report.status == FactorizationStatus::ok) {
      report.status = FactorizationStatus::singular;
    }
    return report;
  }
  report.status = FactorizationStatus::ok;
  b.active = report.method;
  return report;
}

SolveReport DirectSparseSolver::solve(const Eigen::VectorXd& rhs, Eigen::VectorXd& solution) {
  Backend& b = *backend_;
  SolveReport report;
  const detail::Stopwatch start;
  if (b.active == FactorizationMethod::none) {
    report.ok = false;
    report.detail = "no successful factorization to solve with";
    return report;
  }
  if (rhs.size() != b.size) {
    report.ok = false;
    report.detail = "right-hand side has size " + std::to_string(rhs.size()) + ", the factorization " +
                    std::to_string(b.size);
    return report;
  }
  solution.resize(b.size);
  if (b.active == FactorizationMethod::lu) {
    std::array<double, UMFPACK_INFO> info{};
    const int code = umfpack_di_solve(UMFPACK_A, nullptr, nullptr, nullptr, solution.data(), rhs.data(),
                                      b.lu_numeric, b.lu_control.data(), info.data());
    if (code != UMFPACK_OK && code != UMFPACK_WARNING_singular_matrix) {
      report.ok = false;
      report.detail = "UMFPACK solve failed with code " + std::to_string(code);
    }
  } else {
    cholmod_factor* factor = b.active == FactorizationMethod::cholesky_supernodal ? b.supernodal : b.simplicial;
    cholmod_dense rhs_view = cholmod_view(rhs);
    const int success =
        cholmod_solve2(CHOLMOD_A, factor, &rhs_view, nullptr, &b.solution, nullptr, &b.work_y, &b.work_e, &b.common);
    if (success == 0 || b.solution == nullptr) {
      report.ok = false;
      report.detail = "CHOLMOD solve failed: " + cholmod_status_text(b.common.status);
    } else {
      std::memcpy(solution.data(), b.solution->x, sizeof(double) * static_cast<size_t>(b.size));
    }
  }
  if (report.ok && !solution.allFinite()) {
    report.ok = false;
    report.detail = "solution has non-finite entries";
  }
  report.seconds = start.seconds();
  return report;
}

}  // namespace plystrain::nonlinear
