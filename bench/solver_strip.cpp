// Solver benchmark: Newton iterations of a finite-strain plane-strain layered
// strip (quad9; nearly incompressible neo-Hookean substrate nu = 0.499 with
// the mixed u-p cure; a stiff thin film on top) under a stretch. Prints one
// JSON object with the time per phase of a Newton iteration and the peak
// resident memory. One size per process, so that the peak memory is its own.
//
//   plystrain_bench_solver_strip [--cells-along N] [--ordering metis|amd] [--stretch S]
//
// Moduli are invented for a demo (a PDMS-like substrate and a polymer-like
// film); only the timings matter here.
#include "plystrain/materials/law.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"
#include "plystrain/solver/model.hpp"
#include "plystrain/nonlinear/newton.hpp"

#include <omp.h>
#include <sys/resource.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <vector>

namespace {

using namespace plystrain;

materials::LawParameters neo_hookean(double youngs_modulus, double poisson_ratio) {
  const materials::ShearBulk moduli = materials::to_shear_bulk(youngs_modulus, poisson_ratio);
  materials::LawParameters law;
  law.kind = materials::ModelKind::neo_hookean;
  law.shear_modulus = moduli.shear_modulus;
  law.bulk_modulus = moduli.bulk_modulus;
  return law;
}

struct Arguments {
  int cells_along = 160;
  nonlinear::FillOrdering ordering = nonlinear::FillOrdering::metis;
  double stretch = 0.05;
  bool assembly_only = false;
};

Arguments parse(int argc, char** argv) {
  Arguments arguments;
  for (int i = 1; i < argc; i += 2) {
    const std::string key = argv[i];
    if (key == "--assembly-only") {
      arguments.assembly_only = true;
      --i;
      continue;
    }
    if (i + 1 >= argc) {
      std::fprintf(stderr, "option %s needs a value\n", key.c_str());
      std::exit(2);
    }
    const std::string value = argv[i + 1];
    if (key == "--cells-along") {
      arguments.cells_along = std::stoi(value);
    } else if (key == "--ordering") {
      arguments.ordering = value == "amd" ? nonlinear::FillOrdering::amd : nonlinear::FillOrdering::metis;
    } else if (key == "--stretch") {
      arguments.stretch = std::stod(value);
    } else {
      std::fprintf(stderr, "unknown option %s\n", key.c_str());
      std::exit(2);
    }
  }
  return arguments;
}

// Processor time of the whole process (all threads): compared with the
// wall time it shows whether the machine was shared during the run.
double cpu_seconds() {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  return static_cast<double>(usage.ru_utime.tv_sec + usage.ru_stime.tv_sec) +
         1e-6 * static_cast<double>(usage.ru_utime.tv_usec + usage.ru_stime.tv_usec);
}

double peak_rss_mb() {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  return static_cast<double>(usage.ru_maxrss) / 1024.0;  // kilobytes on Linux
}

// Median wall time of repeated evaluations at the reference state (no linear
// solves): the residual alone, and the residual with the tangent.
int time_assembly(solver::Model& model) {
  const Eigen::VectorXd q = Eigen::VectorXd::Zero(model.size());
  Eigen::VectorXd residual;
  nonlinear::SparseMatrix tangent;
  auto median_of = [&](bool with_tangent) {
    std::vector<double> seconds;
    for (int repeat = 0; repeat < 5; ++repeat) {
      const auto start = std::chrono::steady_clock::now();
      const nonlinear::Evaluation result = model.evaluate(q, 0.0, residual, with_tangent ? &tangent : nullptr);
      if (!result.ok()) {
        std::fprintf(stderr, "evaluation failed: %s\n", result.detail.c_str());
        std::exit(1);
      }
      seconds.push_back(std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count());
    }
    std::sort(seconds.begin(), seconds.end());
    return seconds[seconds.size() / 2];
  };
  (void)model.evaluate(q, 0.0, residual, &tangent);  // the pattern's first fill
  const double residual_seconds = median_of(false);
  const double tangent_seconds = median_of(true);
  std::printf("{\"unknowns\": %d, \"cells\": %d, \"threads\": %d, \"residual_s\": %.4f, "
              "\"residual_and_tangent_s\": %.4f, \"tangent_nonzeros\": %lld}\n",
              model.size(), model.mesh().cell_count(), omp_get_max_threads(), residual_seconds, tangent_seconds,
              static_cast<long long>(tangent.nonZeros()));
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  const Arguments arguments = parse(argc, argv);
  // A strip 8 times as long as thick: substrate cells square-ish, one film
  // cell through its thickness.
  const double width = 4000.0;  // micrometres
  const double substrate = 500.0;
  const double film = 2.0;
  mesh::LayeredRectangleSpec spec;
  spec.width = width;
  spec.cells_along = arguments.cells_along;
  spec.layers = {{"substrate", substrate, std::max(1, arguments.cells_along / 8), 1.0}, {"film", film, 1, 1.0}};
  spec.cell_type = mesh::CellType::quad9;

  const auto build_start = std::chrono::steady_clock::now();
  solver::ModelDefinition definition;
  definition.kinematics = solver::Kinematics::plane_strain;
  definition.regions = {{neo_hookean(1.0, 0.499), solver::LockingCure::automatic},
                        {neo_hookean(2000.0, 0.35), solver::LockingCure::automatic}};
  definition.displacements.push_back(solver::symmetry("left", 0));
  definition.displacements.push_back(solver::symmetry("bottom", 1));
  solver::PrescribedDisplacement pull;
  pull.node_set = "right";
  pull.component = 0;
  pull.value = solver::ScaledValue{arguments.stretch * width, {}};
  definition.displacements.push_back(pull);
  solver::Model model(mesh::layered_rectangle(spec), definition);
  const double build_seconds =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - build_start).count();

  if (arguments.assembly_only) {
    return time_assembly(model);
  }

  nonlinear::LinearSolverOptions linear_options;
  linear_options.ordering = arguments.ordering;
  nonlinear::DirectSparseSolver linear_solver(linear_options);
  nonlinear::NewtonOptions newton;
  newton.symmetry = model.tangent_is_symmetric() ? nonlinear::MatrixSymmetry::symmetric : nonlinear::MatrixSymmetry::unsymmetric;

  // One load increment with the tangent predictor (which spreads the pulled
  // edge's motion over the strip), then Newton iterations.
  nonlinear::LoadStepperOptions options;
  options.steps = 1;
  options.predictor = nonlinear::Predictor::tangent;
  options.keep_states = false;
  options.newton = newton;
  std::vector<nonlinear::NewtonIterationRecord> records;
  nonlinear::LoadStepperCallbacks callbacks;
  callbacks.on_iteration = [&records](int, const nonlinear::NewtonIterationRecord& record) { records.push_back(record); };
  // Symbolic analysis once per mesh, timed on its own (the path below then
  // reuses it).
  double analyse_seconds = 0.0;
  {
    Eigen::VectorXd residual;
    nonlinear::SparseMatrix tangent;
    (void)model.evaluate(Eigen::VectorXd::Zero(model.size()), 0.0, residual, &tangent);
    analyse_seconds = linear_solver.analyse(tangent, newton.symmetry).seconds;
  }
  const double cpu_before = cpu_seconds();
  const auto start = std::chrono::steady_clock::now();
  const nonlinear::LoadPathResult path =
      nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()), options, callbacks);
  const double total = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  const double cpu = cpu_seconds() - cpu_before;

  // Per Newton iteration: the records with a linear solve (the record of the
  // converged state has none). The symbolic analysis is reported apart.
  // One Newton iteration is one assembly of residual and tangent, one
  // factorization and one solve. Each Newton solve also assembles once at its
  // start point (the first iteration's tangent), so the evaluations are the
  // iterations plus one per attempt, plus any line-search residuals.
  int iterations = 0;
  int evaluations = path.attempts;
  double assemble = 0.0, analyse = analyse_seconds, factorize = 0.0, solve = 0.0, final_residual = 0.0;
  for (const auto& record : records) {
    final_residual = record.residual_norm;
    analyse += record.analyse_seconds;
    assemble += record.assemble_seconds;
    evaluations += record.line_search_evaluations;
    if (record.solve_seconds > 0.0) {
      ++iterations;
      ++evaluations;
      factorize += record.factorize_seconds;
      solve += record.solve_seconds;
    }
  }
  const double per = iterations > 0 ? 1.0 / iterations : 0.0;
  const double per_evaluation = evaluations > 0 ? assemble / evaluations : 0.0;
  std::printf(
      "{\"unknowns\": %d, \"cells\": %d, \"ordering\": \"%s\", \"threads\": %d, \"status\": \"%s\", "
      "\"increments\": %zu, \"failed_attempts\": %d, \"newton_iterations\": %d, \"evaluations\": %d, "
      "\"final_residual\": %.3e, \"build_s\": %.3f, \"analyse_s\": %.3f, \"assemble_s\": %.4f, "
      "\"factorize_s\": %.4f, \"solve_s\": %.4f, \"newton_iteration_s\": %.4f, "
      "\"assemble_path_per_iteration_s\": %.4f, \"path_s\": %.3f, \"path_cpu_s\": %.3f, \"peak_rss_mb\": %.1f}\n",
      model.size(), model.mesh().cell_count(), arguments.ordering == nonlinear::FillOrdering::metis ? "metis" : "amd",
      omp_get_max_threads(), nonlinear::status_name(path.status), path.increments.size(), path.failed_attempts,
      iterations, evaluations, final_residual, build_seconds, analyse, per_evaluation, factorize * per, solve * per,
      per_evaluation + (factorize + solve) * per, assemble * per, total, cpu, peak_rss_mb());
  return path.completed() ? 0 : 1;
}
