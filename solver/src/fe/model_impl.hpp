// The model's internals, shared by model.cpp and post.cpp.
#pragma once

#include "face_contact.hpp"
#include "surface_contact.hpp"
#include "plystrain/solver/assembly.hpp"
#include "plystrain/solver/constraints.hpp"
#include "plystrain/solver/elements.hpp"
#include "plystrain/solver/model.hpp"

#include <string>
#include <vector>

namespace plystrain::solver {

struct LoadedEdge {
  mesh::Edge edge;
  int load = 0;  // index into the definition's pressures or tractions
};

class ModelImpl {
 public:
  ModelImpl(mesh::Mesh mesh, ModelDefinition definition);

  Evaluation evaluate(const Eigen::VectorXd& q, double load_factor, Eigen::VectorXd* residual,
                      SparseMatrix* tangent) const;
  // Internal minus external forces over the variables z.
  Evaluation variable_forces(const Eigen::VectorXd& z, double load_factor, Eigen::VectorXd& forces,
                             SparseMatrix* tangent) const;

  [[nodiscard]] Eigen::VectorXd variables(const Eigen::VectorXd& q, double load_factor) const {
    return constraints.expand(q, load_factor);
  }
  void gather_cell(int cell, const Eigen::VectorXd& z, CellCoordinates& X, CellVector& dofs) const;
  // Reference position plus displacement of a node.
  [[nodiscard]] Eigen::Vector2d current_position(int node, const Eigen::VectorXd& z) const {
    return mesh.nodes[static_cast<std::size_t>(node)] + Eigen::Vector2d(z(2 * node), z(2 * node + 1));
  }

  [[nodiscard]] int threads() const;

  // The variable of a node's displacement component.
  [[nodiscard]] static int variable(int node, int component) { return 2 * node + component; }

  mesh::Mesh mesh;
  ModelDefinition definition;
  std::vector<RegionTreatment> treatments;
  std::vector<CellSetting> settings;  // per cell
  std::vector<LoadedEdge> pressure_edges;
  std::vector<LoadedEdge> traction_edges;
  std::vector<std::vector<int>> traction_variables;
  std::vector<ContactNodePair> contact_pairs;
  std::vector<char> contact_closed;           // the active set used by evaluate
  std::vector<char> accepted_contact_closed;  // as accepted with the last increment
  int contact_updates = 0;         // changes of the set in the current attempt
  bool contact_unsettled = false;  // the set was still changing when the updates stopped
  int contact_block_begin = 0;  // assembly block of the first contact pair
  // One node of a straight edge tied to the edge's lowest node.
  struct EdgeLineTie {
    int edge = 0;   // index into definition.straight_edges
    int base = -1;  // the lowest node of the edge
    int node = -1;
    double stiffness = 0.0;  // k w
  };
  std::vector<EdgeLineTie> edge_line_ties;
  int edge_line_block_begin = 0;
  std::vector<SurfaceContactNode> surface_nodes;
  std::vector<SurfaceNodeState> surface_states;           // used by evaluate
  std::vector<SurfaceNodeState> accepted_surface_states;  // as accepted with the last increment
  // Empty except while a touching set is held: within Model::load_derivative,
  // and between Model::hold_touch_at and release_touch (see FrictionlessTouch).
  std::vector<FrictionlessTouch> held_touch;
  int surface_block_begin = 0;
  int variable_count = 0;
  int out_of_plane_variable = -1;  // e3 (generalized plane strain)
  ConstraintSet constraints;
  AssemblyPattern assembly;
  bool symmetric = true;
  std::vector<std::string> warnings;

 private:
  // The parts of variable_forces; `values` is the tangent's value array
  // (null without a tangent).
  Evaluation cell_forces(const Eigen::VectorXd& z, Eigen::VectorXd& forces, double* values, Eigen::Index value_count,
                         bool with_tangent) const;
  void pressure_forces(const Eigen::VectorXd& z, double load_factor, Eigen::VectorXd& forces, double* values) const;
  void traction_forces(double load_factor, Eigen::VectorXd& forces) const;
  void face_contact_forces(const Eigen::VectorXd& z, Eigen::VectorXd& forces, double* values) const;
  void straight_edge_forces(const Eigen::VectorXd& z, double load_factor, Eigen::VectorXd& forces,
                            double* values) const;
  void surface_contact_forces(const Eigen::VectorXd& z, double load_factor, Eigen::VectorXd& forces,
                              double* values) const;

  // The construction, step by step.
  [[nodiscard]] double axis_tolerance() const;
  void check_regions();
  void set_cells();
  void build_constraints();
  [[nodiscard]] std::vector<int> edge_variables(const mesh::Edge& edge) const;
  std::vector<std::vector<int>> cell_and_load_blocks();
  [[nodiscard]] std::vector<double> cell_moduli() const;
  void add_face_contacts(std::vector<std::vector<int>>& blocks, const std::vector<double>& youngs_modulus_of_cell);
  void add_straight_edges(std::vector<std::vector<int>>& blocks, const std::vector<double>& youngs_modulus_of_cell);
  void add_surface_contacts(std::vector<std::vector<int>>& blocks, const std::vector<double>& youngs_modulus_of_cell);
};

}  // namespace plystrain::solver
