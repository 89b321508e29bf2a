#include "plystrain/solver/run_pipeline.hpp"

#include "plystrain/mesh/gmsh_session.hpp"
#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/quality.hpp"
#include "plystrain/mesh/stack_mesher.hpp"
#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/case_writer.hpp"
#include "plystrain/solver/convergence_check.hpp"
#include "plystrain/solver/field_writer.hpp"
#include "plystrain/solver/limit_crossings.hpp"
#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/solver/local_checks.hpp"
#include "plystrain/solver/results_writers.hpp"
#include "plystrain/solver/stack_analysis.hpp"
#include "plystrain/solver/stack_from_case.hpp"
#include "plystrain/solver/zone_of_influence.hpp"

#include <chrono>
#include <cinttypes>
#include <cstdio>
#include <sstream>

namespace plystrain {

namespace {

using Clock = std::chrono::steady_clock;

// Thrown from the Newton iteration callback when a stop is asked for: the
// load stepper ends the path there and keeps its converged increments.
class StopRequested : public std::runtime_error {
 public:
  StopRequested() : std::runtime_error("the run was asked to stop") {}
};

using StopQuestion = std::function<std::string()>;

std::string asked_to_stop(const StopQuestion& stop_requested) {
  return stop_requested ? stop_requested() : std::string();
}

double seconds_since(Clock::time_point start) {
  return std::chrono::duration<double>(Clock::now() - start).count();
}

std::string format(const char* pattern, double a, double b = 0.0, double c = 0.0) {
  char buffer[256];
  std::snprintf(buffer, sizeof buffer, pattern, a, b, c);
  return buffer;
}

// The solver log: kept in memory and rewritten whole after every increment,
// so log.txt always holds everything up to the last converged state.
class RunLog {
 public:
  explicit RunLog(std::filesystem::path path) : path_(std::move(path)) {}
  void line(const std::string& text) { text_ += text + "\n"; }
  void flush() const { write_file_atomically(path_, text_); }

 private:
  std::filesystem::path path_;
  std::string text_;
};

mesh::Mesh mesh_case(const CaseSpec& spec, RunLog& log, MeshFigures& figures) {
  mesh::Mesh grid;
  mesh::MeshQuality quality;
  const Clock::time_point start = Clock::now();
  try {
    mesh::GmshSession session;
    grid = mesh::build_stack_mesh(session, stack_from_case(spec));
    quality = mesh::measure_quality(grid);
  } catch (const mesh::MeshError& error) {
    throw input_error_from_mesh_error(error, spec);
  }
  figures.nodes = grid.node_count();
  figures.elements = grid.cell_count();
  figures.min_quality = quality.min_scaled_jacobian();
  log.line("mesh: " + std::to_string(figures.nodes) + " nodes, " +
           std::to_string(figures.elements) + " cells, min scaled Jacobian " +
           format("%.3f", figures.min_quality) + format(", %.2f s", seconds_since(start)));
  for (const mesh::LayerQuality& layer : quality.layers) {
    log.line("  layer " + layer.layer + ": " + std::to_string(layer.cells) + " cells" +
             format(", min scaled Jacobian %.3f, max aspect ratio %.1f",
                    layer.min_scaled_jacobian, layer.max_aspect_ratio));
  }
  return grid;
}

// Largest accepted penetration of the bottom face into a rigid surface, as a
// fraction of the local node spacing: the penalty (1e3 E / h) keeps it near
// p / (1e3 E) of the spacing, so this is only passed where the contact
// pressure reaches ten times the modulus.
constexpr double surface_penetration_tolerance = 0.01;

// A converged state whose tangent is not positive definite is an equilibrium
// the stack would leave at the slightest imperfection (a compressed film
// wrinkles, a layer folds); a model this idealised stays on it.
std::string unstable_state_caution(const std::string& prefix, int negative_eigenvalues) {
  return prefix + "the last converged state is an unstable equilibrium: its tangent stiffness has " +
         std::to_string(negative_eigenvalues) +
         " negative eigenvalues. A real stack would leave it (a compressed film wrinkles or buckles, a "
         "layer folds), so the strains reported are those of a state it need not reach; treat the "
         "verdicts as unconfirmed";
}

std::vector<std::string> model_cautions(const CaseSpec& spec) {
  std::vector<std::string> cautions;
  for (const LayerSpec& layer : spec.layers) {
    const materials::MaterialRecord* record = spec.library.find(layer.material.value);
    if (record == nullptr) {
      continue;
    }
    if (record->law.kind == materials::ModelKind::linear_elastic) {
      cautions.push_back("layer " + layer.name.value +
                         ": the linear-elastic law is meant for small strains only");
    }
    if (record->basis == "from-memory" || record->basis == "demo") {
      cautions.push_back("layer " + layer.name.value + ": material \"" + record->key +
                         "\" rests on " + record->basis +
                         " values; its margin is indicative only");
    }
  }
  for (const DefectSpec& defect : spec.defects) {
    if (defect.kind.value == DefectKind::delamination) {
      cautions.push_back(
          "delaminated faces: frictionless node-to-node contact with a penalty, valid while the faces "
          "slide less than a cell along each other; the log gives the largest slip and penetration");
      break;
    }
  }
  return cautions;
}

// Edge disturbance above which the cell is not called isolated: the
// concentration then belongs to a row of defects, not to one.
constexpr double isolated_edge_disturbance = 0.02;

// The cell's width, each defect's zone of influence, and the cautions that
// say what a cell narrower than the defects' reach models.
void describe_cell(const CaseSpec& spec, RunResults& run) {
  const GeometrySpec& geometry = spec.geometry;
  run.cell.width = geometry.width.value;
  run.cell.evaluated_extent = evaluated_extent(spec);
  run.cell.width_basis = geometry.defect_spacing.given ? "defect spacing"
                         : geometry.width.given        ? "given"
                                                       : "isolating";
  const StackScales scales = stack_scales(spec.layers, spec.library);
  const OutputUnit unit{unit_name(spec.units.value), micrometres_per(spec.units.value)};
  const auto length = [&](double micrometres) {
    return format("%.4g", micrometres / unit.length_scale) + " " + unit.name;
  };
  for (std::size_t i = 0; i < spec.defects.size(); ++i) {
    const DefectSpec& defect = spec.defects[i];
    DefectZone zone;
    zone.index = static_cast<int>(i) + 1;
    zone.kind = defect_kind_name(defect.kind.value, geometry.shape.value);
    zone.zone_of_influence = zone_of_influence(defect, scales);
    zone.covered = geometry.width.value >= zone.zone_of_influence * (1.0 - 1e-9);
    if (!zone.covered && spec.load.kind.value != LoadKind::conform) {
      run.cautions.push_back(
          geometry.defect_spacing.given
              ? "defect " + std::to_string(zone.index) + " is modelled in a row of defects " +
                    length(geometry.defect_spacing.value) +
                    " apart (geometry.defect_spacing), closer than its estimated zone of "
                    "influence of " +
                    length(zone.zone_of_influence) + ": neighbours interact"
              : "defect " + std::to_string(zone.index) + ": the modelled width of " +
                    length(geometry.width.value) +
                    " lies inside its estimated zone of influence (" +
                    length(zone.zone_of_influence) + "), so the model is a row of such defects " +
                    length(2.0 * geometry.width.value) +
                    " apart, not an isolated one. Leave geometry.width out (or set at least " +
                    length(zone.zone_of_influence) +
                    ") to model an isolated defect, or state geometry.defect_spacing for a row");
    }
    run.defects.push_back(zone);
  }
}

// Measured afterwards: whether the defects still change the strain at the
// cell's edge, against the undisturbed state.
void measure_edge_disturbance(const CaseSpec& spec, RunResults& run) {
  if (spec.defects.empty() || spec.load.kind.value == LoadKind::conform) {
    return;
  }
  std::string worst_layer;
  double worst = 0.0;
  for (const LayerResult& layer : run.layers) {
    if (!layer.strain_at_cell_edge || !(std::abs(layer.far_field_strain) > 1e-9)) {
      continue;
    }
    const double disturbance = std::abs(*layer.strain_at_cell_edge / layer.far_field_strain - 1.0);
    if (!run.cell.edge_disturbance || disturbance > *run.cell.edge_disturbance) {
      run.cell.edge_disturbance = disturbance;
      worst = disturbance;
      worst_layer = layer.name;
    }
  }
  if (worst > isolated_edge_disturbance && !spec.geometry.defect_spacing.given) {
    run.cautions.push_back(
        "at the edge of the modelled width the defects still change the strain of "
        "layer " +
        worst_layer + " by " + format("%.1f", 100.0 * worst) +
        " % against the undisturbed state: the cell does not isolate them, and "
        "its peaks are those of a row of defects at twice its width; widen it");
  }
}

// The contact of a conform run: logged, and the figures of the conform block.
template <typename Say>
ConformResult conform_result(const CaseSpec& spec, const solver::Model& model, const Eigen::VectorXd& q,
                             double load_factor, RunLog& log, const Say& say) {
  const solver::SurfaceContactState contact = model.surface_contact_state(q, load_factor);
  ConformResult conform;
  conform.surface = surface_name(spec.load.surface.value);
  conform.method = method_name(spec.load.method.value);
  conform.contact_fraction = contact.touching_fraction;
  conform.max_penetration = contact.max_penetration;
  std::ostringstream line;
  line << "surface contact: " << contact.nodes << " nodes of the bottom face, " << contact.touching
       << " pressed onto the surface (" << format("%.1f", 100.0 * contact.touching_fraction)
       << " % of the face)";
  if (contact.pulling > 0) {
    line << ", " << contact.pulling << " held on by pulling (" << format("%.1f", 100.0 * contact.pulling_fraction)
         << " %)";
  }
  line << "; largest penetration " << format("%.3g", contact.max_penetration) << " um ("
       << format("%.2g", contact.max_penetration_to_spacing) << " of the node spacing, tolerance "
       << format("%.2g", surface_penetration_tolerance) << "), largest contact pressure "
       << format("%.3g", contact.max_pressure) << " MPa";
  log.line(line.str());
  if (contact.max_penetration_to_spacing > surface_penetration_tolerance) {
    const std::string warning = "warning: the bottom face sank into the surface by " +
                                format("%.2g", contact.max_penetration_to_spacing) +
                                " of the node spacing, above the tolerance of " +
                                format("%.2g", surface_penetration_tolerance) +
                                "; the contact pressure is high for the penalty";
    log.line(warning);
    say(warning);
  }
  if (contact.unsettled) {
    log.line("warning: the set of nodes touching the surface was still changing when the last increment "
             "stopped updating it");
  }
  return conform;
}

// The undisturbed state of load case `index` at `load_factor`, solved
// without files; empty (and said in the log) when it cannot be had.
std::optional<UndisturbedState> solve_undisturbed(const CaseSpec& spec, std::size_t index,
                                                  double load_factor, int threads, RunLog& log,
                                                  const StopQuestion& stop_requested) {
  const std::optional<CaseSpec> reference = undisturbed_case(spec, load_factor);
  if (!reference) {
    log.line("undisturbed state: not solved (a wrap that stopped early is not a scaled case)");
    return std::nullopt;
  }
  const Clock::time_point start = Clock::now();
  mesh::Mesh grid;
  try {
    mesh::GmshSession session;
    grid = mesh::build_stack_mesh(session, stack_from_case(*reference));
  } catch (const mesh::MeshError& error) {
    log.line(std::string("undisturbed state: could not be meshed: ") + error.what());
    return std::nullopt;
  }
  std::vector<LoadCase> cases = build_load_cases(*reference, grid);
  LoadCase& load_case = cases.at(index);
  load_case.definition.threads = threads;
  solver::Model model(grid, load_case.definition);
  nonlinear::DirectSparseSolver linear_solver;
  load_case.stepper.newton.symmetry = model.tangent_is_symmetric()
                                          ? nonlinear::MatrixSymmetry::symmetric
                                          : nonlinear::MatrixSymmetry::unsymmetric;
  load_case.stepper.keep_states = false;
  nonlinear::LoadStepperCallbacks callbacks;
  callbacks.on_iteration = [&](int, const nonlinear::NewtonIterationRecord&) {
    if (!asked_to_stop(stop_requested).empty()) {
      throw StopRequested();
    }
  };
  const nonlinear::LoadPathResult path = nonlinear::solve_load_path(
      model, linear_solver, Eigen::VectorXd::Zero(model.size()), load_case.stepper, callbacks);
  if (!path.completed()) {
    log.line("undisturbed state: stopped at load factor " + format("%.4f", path.load_factor) +
             ": " + path.reason);
    return std::nullopt;
  }
  UndisturbedState state;
  state.points = solver::evaluate_points(model, path.q, path.load_factor);
  state.uniform_along_x = spec.load.kind.value != LoadKind::conform;
  if (!state.points.status.ok()) {
    log.line("undisturbed state: could not be evaluated: " + state.points.status.detail);
    return std::nullopt;
  }
  log.line("undisturbed state: the stack without defects, " + std::to_string(model.size()) +
           " unknowns, " + std::to_string(path.increments.size()) + " increments" +
           format(", %.2f s", seconds_since(start)));
  return state;
}

// The message of a run stopped by `stop` at `load_factor`.
std::string interruption_text(const std::string& stop, double load_factor, int increments) {
  return "interrupted by " + stop + ": stopped at load factor " + format("%.4f", load_factor) +
         " after " + std::to_string(increments) + " converged increment" +
         (increments == 1 ? "" : "s") + "; the last one is kept";
}

// A stop asked for after the load was applied, before `what`.
template <typename Say>
void stop_before(const std::string& what, const std::string& stop, RunResults& run, RunLog& log,
                 const Say& say) {
  run.completed = false;
  run.interrupted_by = stop;
  run.message = "interrupted by " + stop + " before " + what + " was done; the load factor " +
                format("%.4f", run.load_reached) + " was reached";
  log.line(run.message);
  say(run.message);
}

// The convergence check of report.verify: the case again with both mesh
// sizes halved and (stretch, bend) with the width doubled, each into its own
// folder, and how far each layer's peak moved.
template <typename Say>
void check_convergence(const CaseSpec& spec, const RunOptions& options, RunResults& run,
                       RunLog& log, const Say& say) {
  const std::vector<ConvergenceRerunPlan> plans = convergence_reruns(spec);
  std::vector<RunResults> reruns;
  for (const ConvergenceRerunPlan& plan : plans) {
    log.line("convergence check: " + plan.what + ", in " + plan.folder + "/");
    say("convergence check: " + plan.what);
    RunOptions rerun_options = options;
    rerun_options.verify = false;
    rerun_options.out = options.out / plan.folder;
    rerun_options.progress = [&](const std::string& text) {
      say("  " + plan.folder + ": " + text);
    };
    reruns.push_back(run_case(plan.spec, rerun_options).results);
    if (const std::string stop = asked_to_stop(options.stop_requested); !stop.empty()) {
      stop_before("the convergence check", stop, run, log, say);
      return;
    }
  }
  run.verification = compare_reruns(run, plans, reruns);
  for (const ConvergenceRerun& rerun : run.verification->reruns) {
    for (const PeakChange& change : rerun.layers) {
      log.line("convergence check, " + rerun.what + ": layer " + change.layer +
               format(" peak %.6g, rerun %.6g, change %.3g %%", change.peak, change.rerun_peak,
                      100.0 * change.change));
    }
  }
  log.line("convergence check: " + run.verification->verdict);
  say("convergence check: " + run.verification->verdict);
  if (!run.verification->converged) {
    run.cautions.push_back("convergence check: " + run.verification->verdict +
                           "; the peaks depend on that modelling choice");
  }
}

}  // namespace

std::string case_hash(const std::string& case_text) {
  // FNV-1a, 64 bit: a stamp to tell runs of different cases apart, not a
  // cryptographic digest.
  std::uint64_t hash = 14695981039346656037ull;
  for (const unsigned char c : case_text) {
    hash ^= c;
    hash *= 1099511628211ull;
  }
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%016" PRIx64, hash);
  return buffer;
}

RunOutcome run_case(const CaseSpec& spec_as_given, const RunOptions& options) {
  // A conform case that checks its defects in local cells solves the
  // defect-free device globally.
  const bool local_checks = spec_as_given.load.kind.value == LoadKind::conform &&
                            spec_as_given.load.local.value && !spec_as_given.defects.empty();
  const CaseSpec spec = local_checks ? without_defects(spec_as_given) : spec_as_given;
  const Clock::time_point start = Clock::now();
  const auto say = [&](const std::string& text) {
    if (options.progress) {
      options.progress(text);
    }
  };
  const auto stop_reason = [&] { return asked_to_stop(options.stop_requested); };
  std::filesystem::create_directories(options.out);
  RunLog log(options.out / "log.txt");
  const OutputUnit unit{unit_name(spec.units.value), micrometres_per(spec.units.value)};

  // The case as run names its material files by absolute path, so that it
  // runs again from the output directory.
  CaseSpec as_run = spec_as_given;
  for (Located<std::string>& file : as_run.material_files) {
    const std::filesystem::path path(file.value);
    if (path.is_relative()) {
      file.value = std::filesystem::absolute(spec_as_given.source.parent_path() / path).lexically_normal().string();
    }
  }
  const std::string case_text = write_case_toml(as_run);
  write_file_atomically(options.out / "case.toml", case_text);

  RunResults run;
  run.tool_version = PLYSTRAIN_VERSION;
  run.case_file = spec_as_given.source.filename().string();
  run.case_hash = case_hash(case_text);
  run.title = spec.title.value;
  run.shape = shape_name(spec.geometry.shape.value);
  run.load = load_kind_name(spec.load.kind.value);
  run.lateral = lateral_text(spec);
  run.cautions = model_cautions(spec);
  describe_cell(spec, run);
  log.line("plystrain " + run.tool_version + ", case " + spec.source.string() + " (hash " +
           run.case_hash + ")");
  if (local_checks) {
    log.line("global solve without the defects; each defect is analysed in a local cell afterwards");
  }

  mesh::Mesh grid = mesh_case(spec, log, run.mesh);
  std::vector<LoadCase> load_cases = build_load_cases(spec, grid);
  say("mesh: " + std::to_string(run.mesh.nodes) + " nodes, " + std::to_string(run.mesh.elements) +
      " cells");

  std::optional<FieldSeriesWriter> fields;
  if (spec.report.fields.value) {
    fields.emplace(options.out, grid, unit.length_scale);
  }

  std::vector<std::vector<LayerResult>> evaluations;
  solver::PointResults last_points;
  run.completed = true;
  for (std::size_t index = 0; index < load_cases.size(); ++index) {
    LoadCase& load_case = load_cases[index];
    load_case.definition.threads = options.threads;
    const std::string prefix = load_case.label.empty() ? "" : load_case.label + ": ";
    solver::Model model(grid, load_case.definition);
    run.mesh.unknowns = model.size();
    for (const std::string& warning : model.warnings()) {
      log.line("model: " + warning);
      run.cautions.push_back(warning);
    }
    log.line(prefix + "model " + solver::kinematics_name(load_case.definition.kinematics) + ", " +
             std::to_string(model.size()) + " unknowns");

    nonlinear::DirectSparseSolver linear_solver;
    load_case.stepper.newton.symmetry = model.tangent_is_symmetric()
                                            ? nonlinear::MatrixSymmetry::symmetric
                                            : nonlinear::MatrixSymmetry::unsymmetric;
    // Time in the field series: the run index plus the load factor, so the
    // slider plays each bend radius in turn.
    const double time_offset = static_cast<double>(index);
    LimitCrossings crossings;
    nonlinear::LoadStepperCallbacks callbacks;
    callbacks.on_iteration = [&](int attempt, const nonlinear::NewtonIterationRecord& record) {
      std::ostringstream line;
      line << "  attempt " << attempt << ", iteration " << record.iteration << ": residual "
           << record.residual_norm << ", increment " << record.increment_norm << ", step "
           << record.line_search_factor;
      if (record.method != nonlinear::FactorizationMethod::none) {
        line << "; assembly " << format("%.3f", record.assemble_seconds) << " s, "
             << nonlinear::method_name(record.method) << " " << format("%.3f", record.factorize_seconds) << " s";
        if (record.analyse_seconds > 0.0) {
          line << " (analysis " << format("%.3f", record.analyse_seconds) << " s)";
        }
      }
      log.line(line.str());
      if (!stop_reason().empty()) {
        throw StopRequested();
      }
    };
    callbacks.on_failure = [&](const nonlinear::FailedAttempt& failure) {
      std::ostringstream line;
      line << prefix << "increment of " << failure.increment << " failed ("
           << nonlinear::status_name(failure.status) << (failure.detail.empty() ? "" : ": ")
           << failure.detail << "); next " << failure.next_increment;
      log.line(line.str());
      say(line.str());
      ++run.solver.cutbacks;
    };
    callbacks.on_increment = [&](const nonlinear::ConvergedIncrement& increment) {
      std::ostringstream line;
      line << prefix << "increment " << increment.index << ": load factor "
           << format("%.4f", increment.load_factor) << ", " << increment.newton_iterations
           << " Newton iterations, residual " << format("%.2e", increment.residual_norm);
      log.line(line.str());
      if (increment.negative_pivots.value_or(0) > 0) {
        log.line(prefix + "  the tangent has " + std::to_string(*increment.negative_pivots) +
                 " negative eigenvalues here (LDL' inertia): an unstable equilibrium");
      }
      say(line.str());
      // Every converged state is evaluated for the load factors at which the
      // layers reach their limits, whether or not fields are written.
      if (increment.q.size() > 0) {
        const solver::PointResults points =
            solver::evaluate_points(model, increment.q, increment.load_factor);
        if (points.status.ok()) {
          crossings.add(increment.load_factor, evaluate_layers(spec, points, nullptr));
        }
        if (fields && points.status.ok()) {
          FieldSnapshot snapshot =
              make_field_snapshot(spec, model, points, increment.q, increment.load_factor);
          snapshot.load_factor = time_offset + increment.load_factor;
          fields->write_increment(snapshot);
        }
      }
      log.flush();
      return stop_reason().empty();
    };

    const Eigen::VectorXd q_start = Eigen::VectorXd::Zero(model.size());
    const nonlinear::LoadPathResult path =
        nonlinear::solve_load_path(model, linear_solver, q_start, load_case.stepper, callbacks);
    run.solver.increments += static_cast<int>(path.increments.size());
    run.solver.newton_iterations += path.newton_iterations;
    if (!stop_reason().empty()) {
      // A stop inside an attempt leaves its trial contact state behind.
      model.begin_attempt();
    }
    if (!path.increments.empty() && path.increments.back().negative_pivots.value_or(0) > 0) {
      const std::string warning = unstable_state_caution(prefix, *path.increments.back().negative_pivots);
      log.line(warning);
      say(warning);
      run.cautions.push_back(warning);
    }

    const solver::ContactState contact = model.contact_state(path.q, path.load_factor);
    if (contact.pairs > 0) {
      std::ostringstream line;
      line << prefix << "contact: " << contact.pairs << " node pairs, " << contact.closed
           << " closed; largest penetration " << format("%.3g", contact.max_penetration)
           << " um, largest contact pressure " << format("%.3g", contact.max_pressure)
           << " MPa, largest opening " << format("%.3g", contact.max_opening) << " um, largest slip "
           << format("%.3g", contact.max_slip) << " um (" << format("%.2f", contact.max_slip_to_spacing)
           << " of the node spacing)";
      log.line(line.str());
      if (contact.unsettled) {
        log.line(prefix + "warning: the set of closed contact pairs was still changing when the last "
                          "increment stopped updating it (pairs flipping between open and closed)");
      }
      if (contact.max_slip_to_spacing > 1.0) {
        const std::string warning =
            prefix + "note: the delaminated faces slid along each other by up to " +
            format("%.1f", contact.max_slip_to_spacing) +
            " node spacings; node-to-node contact stays exact only where the faces are flat and parallel "
            "over that distance, so strains next to a curved debond are approximate";
        log.line(warning);
        say(warning);
      }
    }
    if (load_case.definition.surface_contacts.size() > 0) {
      run.conform = conform_result(spec, model, path.q, path.load_factor, log, say);
    }
    const solver::PointResults points = solver::evaluate_points(model, path.q, path.load_factor);
    if (!points.status.ok()) {
      throw std::runtime_error("the last converged state could not be evaluated: " +
                               points.status.detail);
    }
    // A conform run that checks its defects in local cells solved the
    // device without them: it is its own undisturbed state.
    std::optional<UndisturbedState> undisturbed;
    if (spec.load.kind.value == LoadKind::conform && spec.defects.empty()) {
      undisturbed = UndisturbedState{points, false};
    } else if (!stop_reason().empty()) {
      log.line("undisturbed state: not solved, the run was asked to stop");
    } else {
      undisturbed = solve_undisturbed(spec, index, path.load_factor, options.threads, log,
                                      options.stop_requested);
    }
    std::vector<LayerResult> layers =
        evaluate_layers(spec, points, undisturbed ? &*undisturbed : nullptr);
    crossings.add(path.load_factor, layers);
    crossings.apply_to(layers);
    for (std::size_t i = 0; i < layers.size(); ++i) {
      log.line(prefix + "layer " + layers[i].name +
               format(": peak %.6g (raw integration-point peak %.6g), undisturbed %.6g",
                      layers[i].peak_strain, layers[i].raw_peak_strain,
                      layers[i].far_field_strain) +
               (layers[i].strain_at_cell_edge
                    ? format(", at the cell edge %.6g", *layers[i].strain_at_cell_edge)
                    : std::string()));
    }
    if (!undisturbed) {
      run.cautions.push_back(prefix +
                             "the undisturbed state could not be solved, so no concentration is "
                             "given (log.txt says why)");
    }
    evaluations.push_back(std::move(layers));
    last_points = points;
    if (spec.report.profiles.value) {
      const std::string name = index == 0 ? std::string("profiles.csv")
                                          : "profiles-" + std::to_string(index + 1) + ".csv";
      write_profiles_csv(options.out / name, sample_profiles(spec, points), unit);
    }

    const std::string stop = stop_reason();
    if (!path.completed() || !stop.empty()) {
      run.completed = false;
      run.load_reached = path.load_factor;
      run.interrupted_by = stop;
      run.message = stop.empty()
                        ? prefix + "stopped at load factor " + format("%.4f", path.load_factor) +
                              ": " + path.reason
                        : prefix + interruption_text(stop, path.load_factor, run.solver.increments);
      log.line(run.message);
      say(run.message);
      break;
    }
    run.load_reached = path.load_factor;
  }

  run.layers = envelope(evaluations);
  for (const std::string& caution : averaging_cautions(spec, run.layers)) {
    run.cautions.push_back(caution);
  }
  measure_edge_disturbance(spec, run);
  if (run.conform) {
    for (const LayerResult& layer : run.layers) {
      run.conform->required_strain.push_back({layer.name, layer.peak_strain, layer.peak_at, layer.min_strain});
    }
  }
  if (local_checks && run.completed) {
    log.flush();
    for (LocalCellPlan& plan : plan_local_cells(spec_as_given, last_points, run.layers)) {
      const std::string label = "local " + std::to_string(plan.defect_index);
      if (const std::string stop = stop_reason(); !stop.empty()) {
        stop_before(label, stop, run, log, say);
        break;
      }
      const std::string state = format("major %.4g, minor %.4g", plan.major, plan.minor) + " at r = " +
                                format("%.4g", plan.at[0]) + " um";
      log.line(label + ": defect " + std::to_string(plan.defect_index) + " in a " +
               shape_name(plan.cell.geometry.shape.value) + " cell of width " +
               format("%.4g", plan.cell.geometry.width.value) + " um, loaded with the in-plane state " + state);
      say(label + ": " + shape_name(plan.cell.geometry.shape.value) + " cell, " + state);
      if (plan.cell.geometry.shape.value == Shape::strip) {
        // A plane-strain cell turns the round defect of the device into a
        // line defect across it, which concentrates strain more: the local
        // verdict is then an upper estimate.
        const DefectKind kind =
            spec_as_given.defects[static_cast<std::size_t>(plan.defect_index - 1)].kind.value;
        const char* as_line = kind == DefectKind::pinhole     ? "a slit"
                              : kind == DefectKind::thin_spot ? "a groove"
                                                              : "a delaminated band";
        run.cautions.push_back(
            label + ": the in-plane strain at the defect is not equibiaxial (" + state +
            "), which an axisymmetric cell cannot hold, so the round defect is checked as " +
            as_line +
            " across the device in a plane-strain cell; a line defect concentrates strain "
            "more than a round one, so this local peak is an upper estimate of the round defect's");
      }
      plan.cell.source = spec_as_given.source;
      plan.cell.report.verify.value = false;
      RunOptions cell_options = options;
      cell_options.verify = false;
      cell_options.out = options.out / ("local-" + std::to_string(plan.defect_index));
      cell_options.progress = [&](const std::string& text) { say("  " + label + ": " + text); };
      const RunOutcome cell = run_case(plan.cell, cell_options);
      LocalCheck check;
      check.defect_index = plan.defect_index;
      check.applied_major = plan.major;
      check.applied_minor = plan.minor;
      check.applied_at = plan.at;
      check.layers = cell.results.layers;
      run.local.push_back(std::move(check));
      run.solver.increments += cell.results.solver.increments;
      run.solver.newton_iterations += cell.results.solver.newton_iterations;
      run.solver.cutbacks += cell.results.solver.cutbacks;
      if (!cell.results.completed) {
        run.completed = false;
        run.interrupted_by = cell.results.interrupted_by;
        run.message = label + ": " + cell.results.message;
        log.line(run.message);
        break;
      }
      log.line(label + ": done, results in " + cell_options.out.filename().string() + "/");
    }
  }
  if ((options.verify || spec_as_given.report.verify.value) && run.completed) {
    log.flush();
    check_convergence(spec_as_given, options, run, log, say);
  }
  run.solver.seconds = seconds_since(start);
  log.line(format("finished in %.2f s", run.solver.seconds));

  RunOutcome outcome;
  outcome.table = format_results_table(run, unit);
  write_results_json(options.out / "results.json", run, unit);
  write_summary_text(options.out / "summary.txt", run, unit);
  log.flush();
  outcome.results = std::move(run);
  outcome.out = options.out;
  return outcome;
}

}  // namespace plystrain
