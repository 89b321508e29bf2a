#include "model_impl.hpp"
#include "plystrain/solver/quadrature.hpp"
#include "plystrain/solver/thread_exceptions.hpp"

#include <omp.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <sstream>
#include <stdexcept>

namespace plystrain::solver {
namespace {

// Cells are evaluated in parallel in chunks into per-cell buffers; then each
// thread adds the whole chunk into the matrix columns and variables it owns
// (ScatterShare), in cell order. Every sum is formed in the same order
// whatever the thread count, so results are bitwise identical. (Colouring
// cannot give that here: the out-of-plane unknown of generalized plane strain
// and multi-point constraints couple every cell.)
constexpr int chunk_size = 512;

Signal signal_of(const ScaledValue& value) {
  return [value](double load_factor) { return value.at(load_factor); };
}

std::string cell_where(int cell, int point) {
  std::ostringstream out;
  out << "cell " << cell << ", point " << point;
  return out.str();
}

const std::vector<int>& require_node_set(const mesh::Mesh& mesh, const std::string& name,
                                         const std::string& what) {
  const auto found = mesh.node_sets.find(name);
  if (found == mesh.node_sets.end()) {
    throw std::invalid_argument(what + ": the mesh has no node set '" + name + "'");
  }
  return found->second;
}

const std::vector<mesh::Edge>& require_edge_set(const mesh::Mesh& mesh, const std::string& name,
                                                const std::string& what) {
  const auto found = mesh.edge_sets.find(name);
  if (found == mesh.edge_sets.end()) {
    throw std::invalid_argument(what + ": the mesh has no edge set '" + name + "'");
  }
  return found->second;
}

int require_component(int component, const std::string& what) {
  if (component != 0 && component != 1) {
    throw std::invalid_argument(what + ": component must be 0 (x or r) or 1 (z), got " +
                                std::to_string(component));
  }
  return component;
}

Evaluation cell_failure(int cell, const KernelOutcome& outcome) {
  Evaluation failed;
  std::ostringstream detail;
  detail << cell_where(cell, outcome.point);
  switch (outcome.status) {
    case KernelStatus::inverted:
      failed.status = EvaluationStatus::inverted_element;
      detail << ": J = " << outcome.jacobian;
      break;
    case KernelStatus::material_failure:
      failed.status = EvaluationStatus::material_failure;
      detail << ": the law is not defined there (J = " << outcome.jacobian << ")";
      break;
    default:
      failed.status = EvaluationStatus::non_finite;
      detail << ": non-finite force or stiffness";
      break;
  }
  failed.detail = detail.str();
  return failed;
}

}  // namespace

const char* kinematics_name(Kinematics kinematics) {
  switch (kinematics) {
    case Kinematics::plane_strain: return "plane strain";
    case Kinematics::generalized_plane_strain: return "generalized plane strain";
    case Kinematics::axisymmetric: return "axisymmetric";
  }
  return "unknown";
}

PrescribedDisplacement symmetry(std::string node_set, int component) {
  PrescribedDisplacement p;
  p.node_set = std::move(node_set);
  p.component = component;
  p.value = ScaledValue{0.0, {}};
  return p;
}

ModelImpl::ModelImpl(mesh::Mesh mesh_in, ModelDefinition definition_in)
    : mesh(std::move(mesh_in)),
      definition(std::move(definition_in)),
      variable_count(2 * mesh.node_count() +
                     (definition.kinematics == Kinematics::generalized_plane_strain ? 1 : 0)),
      constraints(variable_count, 2 * static_cast<int>(definition.rigid_faces.size())) {
  if (const std::string problem = mesh::check_consistency(mesh); !problem.empty()) {
    throw std::invalid_argument("model: inconsistent mesh: " + problem);
  }
  check_regions();
  set_cells();
  build_constraints();
  std::vector<std::vector<int>> blocks = cell_and_load_blocks();
  const std::vector<double> moduli = cell_moduli();
  add_face_contacts(blocks, moduli);
  add_straight_edges(blocks, moduli);
  add_surface_contacts(blocks, moduli);
  symmetric = pressure_edges.empty();
  assembly = AssemblyPattern(constraints, blocks);
}

double ModelImpl::axis_tolerance() const {
  // Model size, for tolerances on coordinates.
  double extent = 0.0;
  for (const Eigen::Vector2d& x : mesh.nodes) {
    extent = std::max(extent, x.cwiseAbs().maxCoeff());
  }
  return 1e-10 * std::max(extent, 1e-300);
}

// Every region has a valid law; the locking cure each one gets; an
// axisymmetric mesh lies at r >= 0.
void ModelImpl::check_regions() {
  const int regions = static_cast<int>(mesh.region_names.size());
  if (static_cast<int>(definition.regions.size()) < regions) {
    throw std::invalid_argument("model: the mesh has " + std::to_string(regions) +
                                " regions but only " + std::to_string(definition.regions.size()) +
                                " have a law");
  }
  for (int r = 0; r < regions; ++r) {
    const RegionDefinition& region = definition.regions[static_cast<std::size_t>(r)];
    const std::string problem = materials::validate(region.law);
    if (!problem.empty()) {
      throw std::invalid_argument("model: region '" + mesh.region_names[static_cast<std::size_t>(r)] +
                                  "': " + problem);
    }
    RegionTreatment t;
    t.bulk_to_shear = materials::initial_bulk_modulus(region.law) /
                      materials::initial_shear_modulus(region.law);
    t.mixed = region.cure == LockingCure::on ||
              (region.cure == LockingCure::automatic && t.bulk_to_shear > definition.locking_threshold);
    treatments.push_back(t);
  }

  if (definition.kinematics == Kinematics::axisymmetric) {
    const double tolerance = axis_tolerance();
    for (int n = 0; n < mesh.node_count(); ++n) {
      if (mesh.nodes[static_cast<std::size_t>(n)].x() < -tolerance) {
        throw std::invalid_argument("model: axisymmetric mesh has node " + std::to_string(n) +
                                    " at r = " + std::to_string(mesh.nodes[static_cast<std::size_t>(n)].x()) +
                                    " < 0");
      }
    }
  }

}

// Per cell: its type, law and whether it takes the mixed form.
void ModelImpl::set_cells() {
  bool tri3_needing_cure = false;
  settings.reserve(mesh.cells.size());
  for (const mesh::Cell& cell : mesh.cells) {
    CellSetting s;
    s.type = cell.type;
    s.kinematics = definition.kinematics;
    s.law = &definition.regions[static_cast<std::size_t>(cell.region)].law;
    const bool wanted = treatments[static_cast<std::size_t>(cell.region)].mixed;
    s.mixed = wanted && pressure_function_count(cell.type) > 0;
    tri3_needing_cure = tri3_needing_cure || (wanted && !s.mixed);
    settings.push_back(s);
  }
  if (tri3_needing_cure) {
    warnings.push_back(
        "3-node triangles in a nearly incompressible region have no locking cure and will lock; "
        "use 6-node triangles or quadrilaterals there");
  }

}

// Prescribed values first, then the axis, rigid faces and multi-point
// constraints (each eliminates a still-free unknown).
void ModelImpl::build_constraints() {
  // Overlapping sets (a corner in two symmetry planes' sets) may prescribe
  // zero twice; any other repetition is an error.
  std::vector<bool> fixed_at_zero(static_cast<std::size_t>(variable_count), false);
  for (const PrescribedDisplacement& p : definition.displacements) {
    const std::string what = "prescribed displacement on '" + p.node_set + "'";
    const int component = require_component(p.component, what);
    const bool zero = !p.field && !p.value.function && p.value.value == 0.0;
    for (const int node : require_node_set(mesh, p.node_set, what)) {
      const int v = variable(node, component);
      if (zero && fixed_at_zero[static_cast<std::size_t>(v)]) {
        continue;
      }
      fixed_at_zero[static_cast<std::size_t>(v)] = zero;
      Signal signal = signal_of(p.value);
      if (p.field) {
        const Eigen::Vector2d X = mesh.nodes[static_cast<std::size_t>(node)];
        signal = [field = p.field, X](double load_factor) { return field(X, load_factor); };
      }
      constraints.prescribe(v, std::move(signal), what);
    }
  }
  if (definition.kinematics == Kinematics::generalized_plane_strain) {
    out_of_plane_variable = 2 * mesh.node_count();
    if (definition.out_of_plane.prescribed_strain) {
      constraints.prescribe(out_of_plane_variable, signal_of(*definition.out_of_plane.prescribed_strain),
                            "prescribed out-of-plane strain");
    }
  }
  if (definition.kinematics == Kinematics::axisymmetric) {
    const double axis_tolerance = this->axis_tolerance();
    // Nodes on the axis cannot move radially (u_r = 0 there); the user may
    // have said so already.
    for (int n = 0; n < mesh.node_count(); ++n) {
      if (std::abs(mesh.nodes[static_cast<std::size_t>(n)].x()) <= axis_tolerance &&
          constraints.is_free(variable(n, 0))) {
        constraints.prescribe(variable(n, 0), [](double) { return 0.0; }, "axis");
      }
    }
  }
  for (std::size_t f = 0; f < definition.rigid_faces.size(); ++f) {
    const RigidFace& face = definition.rigid_faces[f];
    const std::string what = "rigid face '" + face.node_set + "'";
    const int translation = variable_count + 2 * static_cast<int>(f);
    for (int c = 0; c < 2; ++c) {
      if (face.fixed_translation[static_cast<std::size_t>(c)]) {
        constraints.prescribe(translation + c, signal_of(*face.fixed_translation[static_cast<std::size_t>(c)]), what);
      }
    }
    for (const int node : require_node_set(mesh, face.node_set, what)) {
      const Eigen::Vector2d arm = mesh.nodes[static_cast<std::size_t>(node)] - face.reference_point;
      for (int c = 0; c < 2; ++c) {
        const ScaledValue angle = face.angle;
        // The exact rigid rotation: (R(angle) - I) arm, for any angle.
        Signal offset = [angle, arm, c](double load_factor) {
          const double a = angle.at(load_factor);
          const Eigen::Vector2d rotated(std::cos(a) * arm.x() - std::sin(a) * arm.y(),
                                        std::sin(a) * arm.x() + std::cos(a) * arm.y());
          return rotated(c) - arm(c);
        };
        if (constraints.is_free(variable(node, c))) {
          constraints.follow(variable(node, c), translation + c, std::move(offset), what);
        } else {
          // The node's component is already prescribed: that fixes the face's
          // translation instead, z - t = offset (a second such node would be
          // redundant and is refused by add_linear).
          constraints.add_linear({{variable(node, c), 1.0}, {translation + c, -1.0}}, std::move(offset), what);
        }
      }
    }
  }
  for (std::size_t k = 0; k < definition.linear_constraints.size(); ++k) {
    const LinearConstraint& lc = definition.linear_constraints[k];
    const std::string what = "linear constraint " + std::to_string(k);
    std::vector<AffineTerm> terms;
    for (const LinearConstraintTerm& t : lc.terms) {
      if (t.node < 0 || t.node >= mesh.node_count()) {
        throw std::invalid_argument(what + ": node " + std::to_string(t.node) + " does not exist");
      }
      terms.push_back({variable(t.node, require_component(t.component, what)), t.coefficient});
    }
    constraints.add_linear(terms, signal_of(lc.value), what);
  }
  constraints.finish();

}

std::vector<int> ModelImpl::edge_variables(const mesh::Edge& edge) const {
  std::vector<int> vars;
  for (int a = 0; a < edge.node_count; ++a) {
    vars.push_back(variable(edge.nodes[static_cast<std::size_t>(a)], 0));
    vars.push_back(variable(edge.nodes[static_cast<std::size_t>(a)], 1));
  }
  if (out_of_plane_variable >= 0) {
    vars.push_back(out_of_plane_variable);
  }
  return vars;
}

// Assembly blocks: the cells, then follower-pressure edges (they carry load
// stiffness); dead-traction edges add forces only.
std::vector<std::vector<int>> ModelImpl::cell_and_load_blocks() {
  std::vector<std::vector<int>> blocks;
  blocks.reserve(mesh.cells.size() + 16);
  const bool gps = out_of_plane_variable >= 0;
  for (const mesh::Cell& cell : mesh.cells) {
    std::vector<int> vars;
    for (int a = 0; a < cell.size(); ++a) {
      vars.push_back(variable(cell.nodes[static_cast<std::size_t>(a)], 0));
      vars.push_back(variable(cell.nodes[static_cast<std::size_t>(a)], 1));
    }
    if (gps) {
      vars.push_back(out_of_plane_variable);
    }
    blocks.push_back(std::move(vars));
  }
  for (std::size_t k = 0; k < definition.pressures.size(); ++k) {
    const FollowerPressure& p = definition.pressures[k];
    for (const mesh::Edge& edge : require_edge_set(mesh, p.edge_set, "follower pressure")) {
      pressure_edges.push_back({edge, static_cast<int>(k)});
      blocks.push_back(edge_variables(edge));
    }
  }
  for (std::size_t k = 0; k < definition.tractions.size(); ++k) {
    const DeadTraction& t = definition.tractions[k];
    if (!t.traction) {
      throw std::invalid_argument("traction on '" + t.edge_set + "': no traction function");
    }
    for (const mesh::Edge& edge : require_edge_set(mesh, t.edge_set, "traction")) {
      traction_edges.push_back({edge, static_cast<int>(k)});
      traction_variables.push_back(edge_variables(edge));
    }
  }
  return blocks;
}

// The Young's modulus of each cell's law, which the penalty stiffnesses
// scale with (empty when nothing needs it).
std::vector<double> ModelImpl::cell_moduli() const {
  std::vector<double> youngs_modulus_of_cell;
  if (!definition.contacts.empty() || !definition.surface_contacts.empty() ||
      !definition.straight_edges.empty()) {
    youngs_modulus_of_cell.reserve(mesh.cells.size());
    for (const mesh::Cell& cell : mesh.cells) {
      youngs_modulus_of_cell.push_back(
          materials::initial_youngs_modulus(definition.regions[static_cast<std::size_t>(cell.region)].law));
    }
  }
  return youngs_modulus_of_cell;
}

void ModelImpl::add_face_contacts(std::vector<std::vector<int>>& blocks, const std::vector<double>& youngs_modulus_of_cell) {
  const bool axisymmetric = definition.kinematics == Kinematics::axisymmetric;
  if (!definition.contacts.empty()) {
    for (const FaceContact& contact : definition.contacts) {
      const std::string what =
          "contact between '" + contact.lower_edge_set + "' and '" + contact.upper_edge_set + "'";
      const std::vector<ContactNodePair> pairs = pair_contact_nodes(
          mesh, require_edge_set(mesh, contact.lower_edge_set, what), require_edge_set(mesh, contact.upper_edge_set, what),
          contact.penalty_factor, axisymmetric, youngs_modulus_of_cell, what);
      contact_pairs.insert(contact_pairs.end(), pairs.begin(), pairs.end());
    }
    // The faces start touching: every pair closed, so the first increments
    // see the stack as it is rather than a loose film over a gap (which has
    // almost no bending stiffness).
    contact_closed.assign(contact_pairs.size(), 1);
    accepted_contact_closed = contact_closed;
    contact_block_begin = static_cast<int>(blocks.size());
    for (const ContactNodePair& pair : contact_pairs) {
      const std::array<int, 4> vars = contact_variables(pair);
      blocks.emplace_back(vars.begin(), vars.end());
    }
  }
}

void ModelImpl::add_straight_edges(std::vector<std::vector<int>>& blocks, const std::vector<double>& youngs_modulus_of_cell) {
  const bool axisymmetric = definition.kinematics == Kinematics::axisymmetric;
  edge_line_block_begin = static_cast<int>(blocks.size());
  for (std::size_t k = 0; k < definition.straight_edges.size(); ++k) {
    const StraightEdge& line = definition.straight_edges[k];
    const std::string what = "straight edge '" + line.edge_set + "'";
    if (!(line.penalty_factor > 0.0)) {
      throw std::invalid_argument(what + ": the penalty factor must be positive");
    }
    const std::map<int, FaceNodeShare> shares = face_node_shares(
        mesh, require_edge_set(mesh, line.edge_set, what), axisymmetric, youngs_modulus_of_cell);
    if (shares.size() < 2) {
      throw std::invalid_argument(what + ": needs at least two nodes");
    }
    int base = shares.begin()->first;
    for (const auto& [node, share] : shares) {
      if (mesh.nodes[static_cast<std::size_t>(node)].y() <
          mesh.nodes[static_cast<std::size_t>(base)].y()) {
        base = node;
      }
    }
    for (const auto& [node, share] : shares) {
      if (node == base) {
        continue;
      }
      EdgeLineTie tie;
      tie.edge = static_cast<int>(k);
      tie.base = base;
      tie.node = node;
      tie.stiffness = line.penalty_factor * share.modulus / share.spacing * share.area;
      edge_line_ties.push_back(tie);
      blocks.push_back(
          {variable(base, 0), variable(base, 1), variable(node, 0), variable(node, 1)});
    }
  }
}

void ModelImpl::add_surface_contacts(std::vector<std::vector<int>>& blocks, const std::vector<double>& youngs_modulus_of_cell) {
  const bool axisymmetric = definition.kinematics == Kinematics::axisymmetric;
  for (std::size_t k = 0; k < definition.surface_contacts.size(); ++k) {
    const SurfaceContact& contact = definition.surface_contacts[k];
    const std::string what = "contact of '" + contact.edge_set + "' with a rigid surface";
    if (!(contact.penalty_factor > 0.0)) {
      throw std::invalid_argument(what + ": the penalty factor must be positive");
    }
    const std::vector<mesh::Edge>& edges = require_edge_set(mesh, contact.edge_set, what);
    const std::map<int, FaceNodeShare> shares = face_node_shares(mesh, edges, axisymmetric, youngs_modulus_of_cell);
    // The length scale of the penalty is the length of the edges a node
    // lies on (not its share of them, which differs between corner and
    // mid-side nodes): a uniform pressure then gives a uniform penetration
    // p h / (penalty_factor E).
    std::map<int, double> edge_length;
    for (const mesh::Edge& edge : edges) {
      const Eigen::Vector2d first = mesh.nodes[static_cast<std::size_t>(edge.nodes[0])];
      const Eigen::Vector2d second = mesh.nodes[static_cast<std::size_t>(edge.nodes[1])];
      const double length = (second - first).norm();
      for (int a = 0; a < edge.node_count; ++a) {
        double& longest = edge_length[edge.nodes[static_cast<std::size_t>(a)]];
        longest = std::max(longest, length);
      }
    }
    for (const auto& [node, share] : shares) {
      SurfaceContactNode entry;
      entry.node = node;
      entry.contact = static_cast<int>(k);
      entry.area = share.area;
      entry.spacing = std::max(edge_length[node], 1e-300);
      entry.stiffness = contact.penalty_factor * share.modulus / entry.spacing * share.area;
      surface_nodes.push_back(entry);
    }
  }
  // Unilateral faces start open: the surface comes to them.
  surface_states.assign(surface_nodes.size(), SurfaceNodeState{});
  accepted_surface_states = surface_states;
  surface_block_begin = static_cast<int>(blocks.size());
  for (const SurfaceContactNode& node : surface_nodes) {
    blocks.push_back({variable(node.node, 0), variable(node.node, 1)});
  }

}

int ModelImpl::threads() const {
  return definition.threads > 0 ? definition.threads : omp_get_max_threads();
}

void ModelImpl::gather_cell(int cell, const Eigen::VectorXd& z, CellCoordinates& X,
                            CellVector& dofs) const {
  const mesh::Cell& c = mesh.cells[static_cast<std::size_t>(cell)];
  const int n = c.size();
  X.resize(n, 2);
  for (int a = 0; a < n; ++a) {
    X.row(a) = mesh.nodes[static_cast<std::size_t>(c.nodes[static_cast<std::size_t>(a)])].transpose();
  }
  const std::span<const int> vars = assembly.block_variables(cell);
  dofs.resize(static_cast<Eigen::Index>(vars.size()));
  for (std::size_t i = 0; i < vars.size(); ++i) {
    dofs(static_cast<Eigen::Index>(i)) = z(vars[i]);
  }
}

// The cells' internal forces and tangents, assembled in parallel; the first
// cell whose kernel fails (in cell order) ends the evaluation.
Evaluation ModelImpl::cell_forces(const Eigen::VectorXd& z, Eigen::VectorXd& forces, double* values,
                                  Eigen::Index value_count, bool with_tangent) const {
  const int cells = mesh.cell_count();
  std::vector<CellVector> residuals(static_cast<std::size_t>(std::min(chunk_size, cells)));
  std::vector<CellMatrix> matrices(with_tangent ? residuals.size() : 0);
  std::vector<KernelOutcome> outcomes(residuals.size());
  int failed_cell = -1;
  ThreadExceptions exceptions;
#pragma omp parallel num_threads(threads())
  {
    const ScatterShare share{omp_get_thread_num(), omp_get_num_threads()};
    // Zeroing in parallel too: at 200k unknowns the values are 50 MB.
#pragma omp for schedule(static) nowait
    for (Eigen::Index i = 0; i < value_count; ++i) {
      values[i] = 0.0;
    }
#pragma omp for schedule(static)
    for (Eigen::Index i = 0; i < forces.size(); ++i) {
      forces(i) = 0.0;
    }
    for (int start = 0; start < cells; start += chunk_size) {
      const int end = std::min(cells, start + chunk_size);
      // Dynamic: cells differ in cost (mixed or not, failing early), and a
      // virtual machine's cores do not run at an even pace.
#pragma omp for schedule(dynamic, 16)
      for (int c = start; c < end; ++c) {
        const std::size_t slot = static_cast<std::size_t>(c - start);
        const bool done = exceptions.capture([&] {
          CellCoordinates X;
          CellVector dofs;
          gather_cell(c, z, X, dofs);
          outcomes[slot] =
              cell_internal_forces(settings[static_cast<std::size_t>(c)], X, dofs, residuals[slot],
                                   with_tangent ? &matrices[slot] : nullptr);
        });
        if (!done) {
          // Every thread then leaves at this chunk; the exception is raised below.
          outcomes[slot].status = KernelStatus::non_finite;
        }
      }
      // Every thread reads the same outcomes after the barrier above, so all
      // leave the loop at the same chunk.
      int failure_in_chunk = -1;
      for (int c = start; c < end && failure_in_chunk < 0; ++c) {
        if (outcomes[static_cast<std::size_t>(c - start)].status != KernelStatus::ok) {
          failure_in_chunk = c;
        }
      }
      if (failure_in_chunk >= 0) {
#pragma omp master
        failed_cell = failure_in_chunk;
        break;
      }
      for (int c = start; c < end; ++c) {
        const std::size_t slot = static_cast<std::size_t>(c - start);
        const int n = static_cast<int>(residuals[slot].size());
        assembly.scatter_vector(c, residuals[slot].data(), n, forces, share);
        if (with_tangent) {
          assembly.scatter_matrix(c, matrices[slot].data(), n, values, share);
        }
      }
#pragma omp barrier
    }
  }
  exceptions.rethrow_first();
  if (failed_cell >= 0) {
    return cell_failure(failed_cell, outcomes[static_cast<std::size_t>(failed_cell % chunk_size)]);
  }

  return {};
}

void ModelImpl::pressure_forces(const Eigen::VectorXd& z, double load_factor, Eigen::VectorXd& forces, double* values) const {
  // Follower pressures: f_ext enters the residual with a minus sign, its
  // stiffness likewise.
  for (std::size_t e = 0; e < pressure_edges.size(); ++e) {
    const LoadedEdge& le = pressure_edges[e];
    const int block = mesh.cell_count() + static_cast<int>(e);
    EdgeSetting s{le.edge.node_count, definition.kinematics};
    EdgeCoordinates X(s.node_count, 2);
    for (int a = 0; a < s.node_count; ++a) {
      X.row(a) = mesh.nodes[static_cast<std::size_t>(le.edge.nodes[static_cast<std::size_t>(a)])].transpose();
    }
    const std::span<const int> vars = assembly.block_variables(block);
    EdgeVector dofs(static_cast<Eigen::Index>(vars.size()));
    for (std::size_t i = 0; i < vars.size(); ++i) {
      dofs(static_cast<Eigen::Index>(i)) = z(vars[i]);
    }
    const double p = definition.pressures[static_cast<std::size_t>(le.load)].pressure.at(load_factor);
    EdgeVector f;
    EdgeMatrix k;
    follower_pressure_forces(s, X, dofs, p, f, values != nullptr ? &k : nullptr);
    const int n = static_cast<int>(f.size());
    f = -f;
    assembly.scatter_vector(block, f.data(), n, forces);
    if (values != nullptr) {
      k = -k;
      assembly.scatter_matrix(block, k.data(), n, values);
    }
  }
}

void ModelImpl::traction_forces(double load_factor, Eigen::VectorXd& forces) const {
  for (std::size_t e = 0; e < traction_edges.size(); ++e) {
    const LoadedEdge& le = traction_edges[e];
    EdgeSetting s{le.edge.node_count, definition.kinematics};
    EdgeCoordinates X(s.node_count, 2);
    for (int a = 0; a < s.node_count; ++a) {
      X.row(a) = mesh.nodes[static_cast<std::size_t>(le.edge.nodes[static_cast<std::size_t>(a)])].transpose();
    }
    EdgeVector f;
    dead_traction_forces(s, X, definition.tractions[static_cast<std::size_t>(le.load)].traction,
                         load_factor, f);
    const std::vector<int>& vars = traction_variables[e];
    for (int a = 0; a < 2 * s.node_count; ++a) {
      forces(vars[static_cast<std::size_t>(a)]) -= f(a);
    }
  }
}

void ModelImpl::face_contact_forces(const Eigen::VectorXd& z, Eigen::VectorXd& forces, double* values) const {
  for (std::size_t k = 0; k < contact_pairs.size(); ++k) {
    Eigen::Matrix<double, 4, 1> f;
    Eigen::Matrix<double, 4, 4> stiffness;
    if (contact_pair_forces(contact_pairs[k], contact_closed[k] != 0, z, f, stiffness)) {
      const int block = contact_block_begin + static_cast<int>(k);
      assembly.scatter_vector(block, f.data(), 4, forces);
      if (values != nullptr) {
        assembly.scatter_matrix(block, stiffness.data(), 4, values);
      }
    }
  }
}

void ModelImpl::straight_edge_forces(const Eigen::VectorXd& z, double load_factor, Eigen::VectorXd& forces, double* values) const {
  for (std::size_t k = 0; k < edge_line_ties.size(); ++k) {
    const EdgeLineTie& tie = edge_line_ties[k];
    const double angle =
        definition.straight_edges[static_cast<std::size_t>(tie.edge)].angle.at(load_factor);
    Eigen::Matrix<double, 4, 1> a;
    a << -std::cos(angle), std::sin(angle), std::cos(angle), -std::sin(angle);
    const double gap =
        a.tail<2>().dot(current_position(tie.node, z) - current_position(tie.base, z));
    Eigen::Matrix<double, 4, 1> f = tie.stiffness * gap * a;
    const int block = edge_line_block_begin + static_cast<int>(k);
    assembly.scatter_vector(block, f.data(), 4, forces);
    if (values != nullptr) {
      Eigen::Matrix<double, 4, 4> stiffness = tie.stiffness * a * a.transpose();
      assembly.scatter_matrix(block, stiffness.data(), 4, values);
    }
  }
}

void ModelImpl::surface_contact_forces(const Eigen::VectorXd& z, double load_factor, Eigen::VectorXd& forces, double* values) const {
  for (std::size_t k = 0; k < surface_nodes.size(); ++k) {
    const SurfaceContactNode& node = surface_nodes[k];
    const SurfaceContact& contact = definition.surface_contacts[static_cast<std::size_t>(node.contact)];
    const Eigen::Vector2d x = current_position(node.node, z);
    Eigen::Vector2d f;
    Eigen::Matrix2d stiffness;
    const FrictionlessTouch touch = held_touch.empty() ? FrictionlessTouch::by_gap : held_touch[k];
    if (surface_node_forces(contact, node, surface_states[k], placement_at(contact, load_factor), x, f, stiffness,
                            touch)) {
      const int block = surface_block_begin + static_cast<int>(k);
      assembly.scatter_vector(block, f.data(), 2, forces);
      if (values != nullptr) {
        assembly.scatter_matrix(block, stiffness.data(), 2, values);
      }
    }
  }
}

Evaluation ModelImpl::variable_forces(const Eigen::VectorXd& z, double load_factor,
                                      Eigen::VectorXd& forces, SparseMatrix* tangent) const {
  forces.resize(variable_count);
  double* values = nullptr;
  Eigen::Index value_count = 0;
  if (tangent) {
    assembly.adopt_pattern(*tangent);
    values = tangent->valuePtr();
    value_count = tangent->nonZeros();
  }
  if (const Evaluation cells = cell_forces(z, forces, values, value_count, tangent != nullptr); !cells.ok()) {
    return cells;
  }
  pressure_forces(z, load_factor, forces, values);
  traction_forces(load_factor, forces);
  face_contact_forces(z, forces, values);
  straight_edge_forces(z, load_factor, forces, values);
  surface_contact_forces(z, load_factor, forces, values);
  if (out_of_plane_variable >= 0) {
    forces(out_of_plane_variable) -= definition.out_of_plane.resultant.at(load_factor);
  }
  if (!forces.allFinite()) {
    return Evaluation{EvaluationStatus::non_finite, "non-finite residual"};
  }
  return {};
}

Evaluation ModelImpl::evaluate(const Eigen::VectorXd& q, double load_factor,
                               Eigen::VectorXd* residual, SparseMatrix* tangent) const {
  if (q.size() != constraints.reduced_count()) {
    throw std::invalid_argument("model: q has " + std::to_string(q.size()) + " entries, expected " +
                                std::to_string(constraints.reduced_count()));
  }
  const Eigen::VectorXd z = constraints.expand(q, load_factor);
  Eigen::VectorXd forces;
  Evaluation result = variable_forces(z, load_factor, forces, tangent);
  if (residual) {
    *residual = result.ok() ? constraints.reduce(forces) : Eigen::VectorXd::Zero(q.size());
  }
  return result;
}

// ---------------------------------------------------------------- Model

Model::Model(mesh::Mesh mesh, ModelDefinition definition)
    : impl_(std::make_unique<ModelImpl>(std::move(mesh), std::move(definition))) {}
Model::~Model() = default;
Model::Model(Model&&) noexcept = default;
Model& Model::operator=(Model&&) noexcept = default;

int Model::size() const { return impl_->constraints.reduced_count(); }

Evaluation Model::evaluate(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& residual,
                           SparseMatrix* tangent) {
  return impl_->evaluate(q, load_factor, &residual, tangent);
}

bool Model::tangent_is_symmetric() const { return impl_->symmetric; }
const mesh::Mesh& Model::mesh() const { return impl_->mesh; }
const ModelDefinition& Model::definition() const { return impl_->definition; }
const std::vector<RegionTreatment>& Model::region_treatments() const { return impl_->treatments; }
const std::vector<std::string>& Model::warnings() const { return impl_->warnings; }

bool Model::update_active_set(const Eigen::VectorXd& q, double load_factor) {
  ModelImpl& impl = *impl_;
  if (impl.contact_pairs.empty() && impl.surface_nodes.empty()) {
    return false;
  }
  // Past this many changes in one attempt the set is left as it is (and
  // contact_state says so): a pair that flips back and forth carries almost
  // nothing either way, and the increment is better kept than lost.
  constexpr int most_updates = 8;
  if (impl.contact_updates >= most_updates) {
    impl.contact_unsettled = true;
    return false;
  }
  const Eigen::VectorXd z = impl.variables(q, load_factor);
  // The gap tolerance is relative to the size of the deformation: far above
  // round-off, so that pairs the load does not touch (a uniform stretch
  // puts no traction on the faces) keep their state, and far below the
  // penalty's own closing under load, p h / (1e3 E), so that a pair pulled
  // apart opens.
  double displacement_scale = 0.0;
  for (Eigen::Index i = 0; i < 2 * static_cast<Eigen::Index>(impl.mesh.node_count()); ++i) {
    displacement_scale = std::max(displacement_scale, std::abs(z(i)));
  }
  const double tolerance = 1e-8 * displacement_scale;
  bool changed = false;
  for (std::size_t k = 0; k < impl.contact_pairs.size(); ++k) {
    const ContactNodePair& pair = impl.contact_pairs[k];
    const double gap = contact_gap(pair, z);
    const bool closed = impl.contact_closed[k] != 0;
    if (closed && gap > tolerance) {
      impl.contact_closed[k] = 0;  // pulled apart: the pair would carry tension
      changed = true;
    } else if (!closed && gap < -tolerance) {
      impl.contact_closed[k] = 1;  // pushed through
      changed = true;
    }
  }
  for (std::size_t k = 0; k < impl.surface_nodes.size(); ++k) {
    const SurfaceContactNode& node = impl.surface_nodes[k];
    const SurfaceContact& contact = impl.definition.surface_contacts[static_cast<std::size_t>(node.contact)];
    if (contact.kind != SurfaceContactKind::bonded) {
      continue;  // held on, or frictionless: decided at every evaluation
    }
    SurfaceNodeState& state = impl.surface_states[k];
    if (contact.kind == SurfaceContactKind::bonded && state.closed) {
      continue;  // stuck for good
    }
    const Eigen::Vector2d x = impl.current_position(node.node, z);
    const SurfacePoint nearest = nearest_surface_point(contact, placement_at(contact, load_factor), x);
    if (state.closed && nearest.gap > tolerance) {
      state.closed = false;  // lifted off: the surface would pull
      changed = true;
    } else if (!state.closed && nearest.gap < -tolerance) {
      state.closed = true;
      // Where it touched: the surface point under the node now, which lies
      // within the increment's own travel of the first touch.
      state.stick_parameter = nearest.parameter;
      changed = true;
    }
  }
  impl.contact_updates += changed ? 1 : 0;
  return changed;
}

namespace {

// The touching set of the frictionless surface-contact nodes at the state z.
std::vector<FrictionlessTouch> touching_set(const ModelImpl& impl, const Eigen::VectorXd& z, double load_factor) {
  std::vector<FrictionlessTouch> touch(impl.surface_nodes.size(), FrictionlessTouch::by_gap);
  for (std::size_t k = 0; k < impl.surface_nodes.size(); ++k) {
    const SurfaceContactNode& node = impl.surface_nodes[k];
    const SurfaceContact& contact = impl.definition.surface_contacts[static_cast<std::size_t>(node.contact)];
    if (contact.kind == SurfaceContactKind::frictionless) {
      const SurfacePoint nearest =
          nearest_surface_point(contact, placement_at(contact, load_factor), impl.current_position(node.node, z));
      touch[k] = nearest.gap < 0.0 ? FrictionlessTouch::held_closed : FrictionlessTouch::held_open;
    }
  }
  return touch;
}

}  // namespace

Evaluation Model::load_derivative(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& derivative) {
  ModelImpl& impl = *impl_;
  if (impl.surface_nodes.empty() || !impl.held_touch.empty()) {
    // No contact, or a set held by hold_touch_at: the derivative of the
    // equations with that set.
    return NonlinearSystem::load_derivative(q, load_factor, derivative);
  }
  // The difference step moves a rigid surface by step * d(lift)/d(lambda),
  // which can exceed the penalty's own penetration (nanometres under a light
  // press): a node that touches at lambda would drop out at lambda - step and
  // its whole force would enter the derivative. Held at lambda's touching
  // set, the derivative is the one of the equations Newton linearises.
  impl.held_touch = touching_set(impl, impl.variables(q, load_factor), load_factor);
  const Evaluation result = NonlinearSystem::load_derivative(q, load_factor, derivative);
  impl.held_touch.clear();
  return result;
}

bool Model::hold_touch_at(const Eigen::VectorXd& q, double load_factor) {
  ModelImpl& impl = *impl_;
  if (impl.surface_nodes.empty()) {
    return false;
  }
  std::vector<FrictionlessTouch> touch = touching_set(impl, impl.variables(q, load_factor), load_factor);
  const bool changed = touch != impl.held_touch;
  impl.held_touch = std::move(touch);
  return changed;
}

void Model::release_touch() { impl_->held_touch.clear(); }

void Model::accept_increment(const Eigen::VectorXd&, double) {
  impl_->accepted_contact_closed = impl_->contact_closed;
  impl_->accepted_surface_states = impl_->surface_states;
}

void Model::begin_attempt() {
  impl_->contact_closed = impl_->accepted_contact_closed;
  impl_->surface_states = impl_->accepted_surface_states;
  impl_->contact_updates = 0;
  impl_->contact_unsettled = false;
}

SurfaceContactState Model::surface_contact_state(const Eigen::VectorXd& q, double load_factor) const {
  const ModelImpl& impl = *impl_;
  SurfaceContactState state;
  state.nodes = static_cast<int>(impl.surface_nodes.size());
  state.unsettled = impl.contact_unsettled;
  if (impl.surface_nodes.empty()) {
    return state;
  }
  const Eigen::VectorXd z = impl.variables(q, load_factor);
  double total_area = 0.0;
  double touching_area = 0.0;
  double pulling_area = 0.0;
  for (std::size_t k = 0; k < impl.surface_nodes.size(); ++k) {
    const SurfaceContactNode& node = impl.surface_nodes[k];
    const SurfaceContact& contact = impl.definition.surface_contacts[static_cast<std::size_t>(node.contact)];
    const Eigen::Vector2d x = impl.current_position(node.node, z);
    if (!(node.area > 0.0)) {
      continue;  // on the axis: no ring, no share of the face
    }
    const SurfacePlacement at = placement_at(contact, load_factor);
    total_area += node.area;
    Eigen::Vector2d force;
    Eigen::Matrix2d stiffness;
    if (!surface_node_forces(contact, node, impl.surface_states[k], at, x, force, stiffness)) {
      continue;
    }
    const SurfacePoint nearest = nearest_surface_point(contact, at, x);
    // The force on the node is -force (the residual holds the node's
    // internal reaction); pushing means along the outward normal.
    const double normal_force = -force.dot(nearest.normal);
    if (normal_force >= 0.0) {
      ++state.touching;
      touching_area += node.area;
      state.max_pressure = std::max(state.max_pressure, normal_force / std::max(node.area, 1e-300));
    } else {
      ++state.pulling;
      pulling_area += node.area;
    }
    const double penetration = std::max(0.0, -nearest.gap);
    state.max_penetration = std::max(state.max_penetration, penetration);
    state.max_penetration_to_spacing =
        std::max(state.max_penetration_to_spacing, penetration / std::max(node.spacing, 1e-300));
  }
  state.touching_fraction = touching_area / std::max(total_area, 1e-300);
  state.pulling_fraction = pulling_area / std::max(total_area, 1e-300);
  return state;
}

ContactState Model::contact_state(const Eigen::VectorXd& q, double load_factor) const {
  ContactState state;
  const std::vector<ContactNodePair>& pairs = impl_->contact_pairs;
  state.pairs = static_cast<int>(pairs.size());
  state.unsettled = impl_->contact_unsettled;
  if (pairs.empty()) {
    return state;
  }
  const Eigen::VectorXd z = impl_->variables(q, load_factor);
  for (std::size_t k = 0; k < pairs.size(); ++k) {
    const ContactNodePair& pair = pairs[k];
    const double gap = contact_gap(pair, z);
    const Eigen::Vector2d relative(z(2 * pair.upper) - z(2 * pair.lower), z(2 * pair.upper + 1) - z(2 * pair.lower + 1));
    const double slip = std::abs(relative.x() * pair.normal.y() - relative.y() * pair.normal.x());
    state.max_slip = std::max(state.max_slip, slip);
    state.max_slip_to_spacing = std::max(state.max_slip_to_spacing, slip / std::max(pair.spacing, 1e-300));
    if (impl_->contact_closed[k] != 0) {
      ++state.closed;
      state.max_penetration = std::max(state.max_penetration, -gap);
      state.max_pressure = std::max(state.max_pressure, pair.stiffness * -gap / std::max(pair.area, 1e-300));
    } else {
      state.max_opening = std::max(state.max_opening, gap);
    }
  }
  return state;
}

CellFormulation Model::cell_formulation(int cell) const {
  const CellSetting& s = impl_->settings.at(static_cast<std::size_t>(cell));
  return {s.mixed, s.mixed ? pressure_function_count(s.type) : 0};
}

Eigen::MatrixX2d Model::displacements(const Eigen::VectorXd& q, double load_factor) const {
  const Eigen::VectorXd z = impl_->variables(q, load_factor);
  Eigen::MatrixX2d u(impl_->mesh.node_count(), 2);
  for (int n = 0; n < impl_->mesh.node_count(); ++n) {
    u(n, 0) = z(2 * n);
    u(n, 1) = z(2 * n + 1);
  }
  return u;
}

double Model::out_of_plane_strain(const Eigen::VectorXd& q, double load_factor) const {
  if (impl_->out_of_plane_variable < 0) {
    return 0.0;
  }
  return impl_->variables(q, load_factor)(impl_->out_of_plane_variable);
}

Eigen::MatrixX2d Model::nodal_forces(const Eigen::VectorXd& q, double load_factor) const {
  const Eigen::VectorXd z = impl_->variables(q, load_factor);
  Eigen::VectorXd forces;
  const Evaluation result = impl_->variable_forces(z, load_factor, forces, nullptr);
  if (!result.ok()) {
    throw std::runtime_error("nodal forces: " + result.detail);
  }
  Eigen::MatrixX2d f(impl_->mesh.node_count(), 2);
  for (int n = 0; n < impl_->mesh.node_count(); ++n) {
    f(n, 0) = forces(2 * n);
    f(n, 1) = forces(2 * n + 1);
  }
  return f;
}

double Model::out_of_plane_resultant(const Eigen::VectorXd& q, double load_factor) const {
  const Eigen::VectorXd z = impl_->variables(q, load_factor);
  double total = 0.0;
  std::array<PointState, max_cell_points> states;
  for (int c = 0; c < impl_->mesh.cell_count(); ++c) {
    CellCoordinates X;
    CellVector dofs;
    impl_->gather_cell(c, z, X, dofs);
    KernelOutcome outcome;
    const int points = cell_point_states(impl_->settings[static_cast<std::size_t>(c)], X, dofs, states, outcome);
    if (outcome.status != KernelStatus::ok) {
      throw std::runtime_error("out-of-plane resultant: " + cell_where(c, outcome.point) + " failed");
    }
    for (int p = 0; p < points; ++p) {
      total += states[static_cast<std::size_t>(p)].first_piola(2, 2) * states[static_cast<std::size_t>(p)].volume_weight;
    }
  }
  return total;
}

}  // namespace plystrain::solver
