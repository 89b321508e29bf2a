// The discretised model: a mesh, a law per region, a kinematic kind,
// constraints and loads, as one NonlinearSystem in the reduced unknowns q.
//
// Unknowns. The physical variables are the nodal displacements u (two per
// node: x or r, then z) and, for generalized plane strain, the out-of-plane
// strain e3 = F33 - 1. Every constraint is eliminated:
//     [u; e3] = T q + g(lambda),
// with q the free displacements, the free translations of rigid faces and a
// free e3. The tangent is T^T K T; its sparsity pattern is built once.
//
// Loads and prescribed values scale with the load factor lambda through
// ScaledValue (value * lambda by default, or any function of lambda).
#pragma once

#include "plystrain/materials/law.hpp"
#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/nonlinear_contract.hpp"
#include "plystrain/solver/rigid_surface.hpp"

#include <Eigen/Core>

#include <array>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace plystrain::solver {

enum class Kinematics {
  plane_strain,              // F33 = 1, per unit depth
  generalized_plane_strain,  // F33 = 1 + e3, e3 one global unknown or prescribed, per unit depth
  axisymmetric,              // x = r >= 0, F33 = 1 + u_r / R, full 2 pi R ring
};

[[nodiscard]] const char* kinematics_name(Kinematics kinematics);

// A scalar that depends on the load factor: `function(lambda)` when set,
// otherwise `value * lambda`.
struct ScaledValue {
  double value = 0.0;
  std::function<double(double)> function;

  [[nodiscard]] double at(double load_factor) const {
    return function ? function(load_factor) : value * load_factor;
  }
};

enum class LockingCure {
  automatic,  // mixed displacement-pressure when kappa/mu exceeds the threshold
  on,
  off,
};

struct RegionDefinition {
  materials::LawParameters law;
  LockingCure cure = LockingCure::automatic;
};

// u_component(node) = value(lambda) for every node of the set. component 0 is
// x (or r), 1 is z. A symmetry condition is a PrescribedDisplacement with
// value 0 (see symmetry()).
struct PrescribedDisplacement {
  std::string node_set;
  int component = 0;
  ScaledValue value;
  // When set, overrides value: u_component(node) = field(X_node, lambda), for
  // displacement fields that vary along the set.
  std::function<double(const Eigen::Vector2d& reference_position, double load_factor)> field;
};

[[nodiscard]] PrescribedDisplacement symmetry(std::string node_set, int component);

// The nodes of the set move as one rigid body: rotated exactly by
// angle(lambda) (radians, counter-clockwise) about reference_point, plus a
// translation (two unknowns unless fixed):
//     u_i = t + (R(angle) - I)(X_i - reference_point).
// The rotation is imposed exactly at every angle (no linearisation).
struct RigidFace {
  std::string node_set;
  Eigen::Vector2d reference_point = Eigen::Vector2d::Zero();
  ScaledValue angle;
  std::array<std::optional<ScaledValue>, 2> fixed_translation;  // empty = free
};

// sum_i coefficient_i * u(node_i, component_i) = value(lambda).
struct LinearConstraintTerm {
  int node = 0;
  int component = 0;
  double coefficient = 1.0;
};
struct LinearConstraint {
  std::vector<LinearConstraintTerm> terms;
  ScaledValue value;
};

// The nodes of an edge set stay on one straight line, free to translate and
// free to slide along it, turned by angle(lambda) (radians, clockwise: for a
// positive angle the line leans towards +x going up) from the vertical. This
// is the loaded end of a laminate in pure bending: plane sections stay plane
// and radial, and each layer contracts or swells through its thickness
// freely along the line (Timoshenko & Goodier, Theory of Elasticity, 1970,
// pure bending of a bar; exact at finite rotation for a bonded laminate,
// whose sections stay plane).
//
// Method: a penalty on each node's distance from the line through the set's
// lowest node, g = a . (x_node - x_lowest), a = (cos angle, -sin angle), with
// stiffness k w per node (k = penalty_factor E / h, w and h the node's share
// of the set's area and length, E the stiffest material it touches), so the
// line holds exactly at any rotation; the offset g is about
// sigma h / (penalty_factor E).
struct StraightEdge {
  std::string edge_set;
  ScaledValue angle;
  double penalty_factor = 1e3;
};

// Pressure on the deformed face of an edge set (follower load), positive
// pushing into the material. Its load stiffness is not symmetric; the model
// then reports tangent_is_symmetric() == false.
struct FollowerPressure {
  std::string edge_set;
  ScaledValue pressure;
};

// A dead load: nominal traction (force per reference length, per unit depth;
// per reference area for axisymmetric models) on an edge set, a function of
// the reference position and the load factor.
struct DeadTraction {
  std::string edge_set;
  std::function<Eigen::Vector2d(const Eigen::Vector2d& reference_position, double load_factor)>
      traction;
};

// Frictionless contact between two faces that start coincident, with
// separate nodes (an unbonded interface: the mesher's `<name>-lower` and
// `<name>-upper` edge sets). The faces may separate and slide without
// friction but not pass through each other.
//
// Method: node-to-node penalty. Each upper-face node is paired with the
// lower-face node at the same reference position; the gap is the relative
// displacement along the lower face's reference normal,
//     g = (u_upper - u_lower) . n,
// and a closed pair carries the normal force k w (-g), w the node's
// share of the face (integral of its shape function over the edge; times
// 2 pi r when axisymmetric) and k the penalty stiffness per unit area. This is
// a small-sliding, small-rotation model: it is exact for faces that stay
// parallel and slide less than a cell along each other, which is what an
// unbonded span in a stretched or gently bent stack does; Model::contact_state
// reports the largest slip so a run can say when that no longer holds.
struct FaceContact {
  std::string lower_edge_set;  // top face of the material below
  std::string upper_edge_set;  // bottom face of the material above
  // k = penalty_factor * E / h, with E the larger small-strain Young's
  // modulus of the two materials and h the node's tributary length along
  // the face: the penetration under a contact pressure p is about
  // p h / (penalty_factor E), a small fraction of the cell size.
  double penalty_factor = 1e3;
};

// Contact of a face with a rigid surface of revolution (axisymmetric
// models). The surface's apex sits at (0, lift(lambda)) and its meridian is
// flattened in height by height_scale(lambda) (1 = the surface as given).
//
//   held_on       the face stays on the surface and slides on it without
//                 friction (the device is laid onto it and held there; the
//                 surface may pull as well as push: contact_state reports
//                 where it pulls);
//   frictionless  unilateral: the face may touch and slide, or lift off;
//   bonded        unilateral, and a node that touches sticks to the surface
//                 point it touched, for good.
//
// Method: node-to-surface penalty on the face's nodes, with the nearest
// point of the meridian (a closest-point projection, so the normal and the
// consistent tangent follow the curved surface exactly). The stiffness per
// node is k w with k = penalty_factor E / h, h the length of the face's
// edges at the node: a contact pressure p sinks the face by p h / (penalty_factor E).
enum class SurfaceContactKind { held_on, frictionless, bonded };

struct SurfaceContact {
  std::string edge_set;
  RigidSurface surface;
  ScaledValue height_scale;
  ScaledValue lift;
  SurfaceContactKind kind = SurfaceContactKind::frictionless;
  double penalty_factor = 1e3;
};

// Generalized plane strain only: with no prescribed strain, e3 is a free
// unknown fixed by the out-of-plane resultant (the integral of P33 over the
// section, per unit depth) equalling `resultant` (0 = free contraction).
struct OutOfPlane {
  std::optional<ScaledValue> prescribed_strain;  // e3 = F33 - 1 as a function of lambda
  ScaledValue resultant;
};

struct ModelDefinition {
  Kinematics kinematics = Kinematics::plane_strain;
  std::vector<RegionDefinition> regions;  // index = mesh region
  // kappa/mu above which `automatic` turns the cure on. 10 is nu of about
  // 0.45: plain quadratic elements at nu = 0.49 (kappa/mu = 49.7) still gave
  // Kirsch hole stresses 11 % off, and the mixed form costs little and is
  // exact for compressible laws as well.
  double locking_threshold = 10.0;
  OutOfPlane out_of_plane;
  std::vector<PrescribedDisplacement> displacements;
  std::vector<RigidFace> rigid_faces;
  std::vector<LinearConstraint> linear_constraints;
  std::vector<StraightEdge> straight_edges;
  std::vector<FollowerPressure> pressures;
  std::vector<DeadTraction> tractions;
  std::vector<FaceContact> contacts;
  std::vector<SurfaceContact> surface_contacts;
  int threads = 0;  // OpenMP threads for the element loop; 0 = the OpenMP default
};

// How the model treats one region (after the automatic choice).
struct RegionTreatment {
  bool mixed = false;  // displacement-pressure with condensed element pressure
  double bulk_to_shear = 0.0;
};

// The contact faces at a state, for reports.
struct ContactState {
  int pairs = 0;
  int closed = 0;                 // pairs in the closed set
  double max_penetration = 0.0;   // largest -g over the closed pairs (length)
  double max_pressure = 0.0;      // largest normal force per unit face area (stress)
  double max_opening = 0.0;       // largest g over the open pairs (length)
  double max_slip = 0.0;          // largest relative tangential displacement (length)
  double max_slip_to_spacing = 0.0;  // the same over the pair's node spacing along the face
  bool unsettled = false;  // the last attempt stopped updating a set that was still changing
};

// The faces on rigid surfaces at a state, for reports.
struct SurfaceContactState {
  int nodes = 0;
  int touching = 0;              // nodes pressed onto the surface (closed and pushing)
  double touching_fraction = 0.0;  // their share of the face's area
  int pulling = 0;               // held_on only: nodes the surface holds by pulling
  double pulling_fraction = 0.0;
  double max_penetration = 0.0;  // largest penetration of a node into the surface (length)
  double max_penetration_to_spacing = 0.0;  // the same over the length of the face's edges there
  double max_pressure = 0.0;     // largest normal contact force per unit face area (stress)
  bool unsettled = false;
};

// Per-cell record used by post-processing.
struct CellFormulation {
  bool mixed = false;
  int pressure_functions = 0;  // 0 (plain), 1 (P0), 3 (P1)
};

class ModelImpl;

class Model final : public NonlinearSystem {
 public:
  // Throws std::invalid_argument when the definition does not fit the mesh
  // (unknown set names, regions without a law, a dof constrained twice,
  // negative r in an axisymmetric mesh, ...), naming what is wrong.
  Model(mesh::Mesh mesh, ModelDefinition definition);
  ~Model() override;
  Model(Model&&) noexcept;
  Model& operator=(Model&&) noexcept;
  Model(const Model&) = delete;
  Model& operator=(const Model&) = delete;

  [[nodiscard]] int size() const override;
  Evaluation evaluate(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& residual,
                      SparseMatrix* tangent) override;

  // Contact: the set of closed pairs is held fixed through a Newton solve
  // (so the equations are smooth) and updated once it has converged: a
  // closed pair pulled apart opens, an open pair pushed through closes, and
  // Newton iterates again at the same load.
  bool update_active_set(const Eigen::VectorXd& q, double load_factor) override;
  Evaluation load_derivative(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd& derivative) override;
  bool hold_touch_at(const Eigen::VectorXd& q, double load_factor) override;
  void release_touch() override;
  void accept_increment(const Eigen::VectorXd& q, double load_factor) override;
  void begin_attempt() override;

  // False when a follower pressure is present: the linear solver must then
  // use its LU fallback.
  [[nodiscard]] bool tangent_is_symmetric() const;

  [[nodiscard]] const mesh::Mesh& mesh() const;
  [[nodiscard]] const ModelDefinition& definition() const;
  [[nodiscard]] const std::vector<RegionTreatment>& region_treatments() const;
  [[nodiscard]] CellFormulation cell_formulation(int cell) const;

  // Physical variables from q: nodal displacements as (node_count x 2), and
  // F33 - 1 for generalized plane strain (0 otherwise).
  [[nodiscard]] Eigen::MatrixX2d displacements(const Eigen::VectorXd& q, double load_factor) const;
  [[nodiscard]] double out_of_plane_strain(const Eigen::VectorXd& q, double load_factor) const;

  // Internal minus external nodal forces (node_count x 2) at (q, lambda): the
  // reactions at constrained nodes, ~0 at free ones. Axisymmetric forces are
  // totals over the ring (2 pi R included).
  [[nodiscard]] Eigen::MatrixX2d nodal_forces(const Eigen::VectorXd& q, double load_factor) const;

  // The integral of P33 over the section (generalized plane strain: the
  // out-of-plane resultant per unit depth).
  [[nodiscard]] double out_of_plane_resultant(const Eigen::VectorXd& q, double load_factor) const;

  // The state of the contact faces at (q, lambda); all zero without contact.
  [[nodiscard]] ContactState contact_state(const Eigen::VectorXd& q, double load_factor) const;
  [[nodiscard]] SurfaceContactState surface_contact_state(const Eigen::VectorXd& q, double load_factor) const;

  // Warnings found while building (e.g. 3-node triangles in a region that
  // needs the locking cure, which they cannot have).
  [[nodiscard]] const std::vector<std::string>& warnings() const;

  // For post-processing and tests: the implementation.
  [[nodiscard]] const ModelImpl& impl() const { return *impl_; }

 private:
  std::unique_ptr<ModelImpl> impl_;
};

}  // namespace plystrain::solver
