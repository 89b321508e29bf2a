// Shape functions of the five cell types and of boundary edges, in the node
// order of mesh.hpp (Gmsh/VTK order), and the element kernels: residual and
// tangent of one cell for given nodal displacements.
#pragma once

#include "plystrain/materials/law.hpp"
#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/model.hpp"

#include <Eigen/Core>

#include <functional>
#include <span>

namespace plystrain::solver {

inline constexpr int max_cell_dofs = 2 * mesh::max_nodes_per_cell + 1;  // + e3 (generalized plane strain)
inline constexpr int max_pressure_functions = 3;

using ShapeValues = Eigen::Matrix<double, Eigen::Dynamic, 1, 0, mesh::max_nodes_per_cell, 1>;
using ShapeGradients = Eigen::Matrix<double, Eigen::Dynamic, 2, 0, mesh::max_nodes_per_cell, 2>;
using CellVector = Eigen::Matrix<double, Eigen::Dynamic, 1, 0, max_cell_dofs, 1>;
using CellMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, 0, max_cell_dofs, max_cell_dofs>;
using CellCoordinates = Eigen::Matrix<double, Eigen::Dynamic, 2, 0, mesh::max_nodes_per_cell, 2>;

// N(xi) and dN/dxi for a cell type at a reference point.
void shape_functions(mesh::CellType type, const Eigen::Vector2d& xi, ShapeValues& values,
                     ShapeGradients& gradients);

// N(xi) and dN/dxi of a 2- or 3-node edge (end, end, mid) on [-1, 1].
void line_shape_functions(int node_count, double xi, Eigen::Vector3d& values,
                          Eigen::Vector3d& derivatives);

// The pressure space of the mixed formulation for a cell type:
// quad8, quad9 -> 3 (P1: 1, x, z; Q2/P1), tri6 -> 1 (P2/P0), quad4 -> 1
// (Q1/P0, mean dilatation), tri3 -> 0 (no cure: a constant-strain triangle
// with one volume constraint per cell still locks, so tri3 stays a plain
// displacement element and the model warns).
[[nodiscard]] int pressure_function_count(mesh::CellType type);

// What the kernel needs to know about a cell besides its geometry.
struct CellSetting {
  mesh::CellType type = mesh::CellType::quad9;
  Kinematics kinematics = Kinematics::plane_strain;
  bool mixed = false;
  const materials::LawParameters* law = nullptr;
};

// The cell's local unknowns: nodal displacements (x, z per node, node-major),
// followed by e3 = F33 - 1 for generalized plane strain.
[[nodiscard]] int cell_dof_count(const CellSetting& setting);

enum class KernelStatus { ok, inverted, non_finite, material_failure };

struct KernelOutcome {
  KernelStatus status = KernelStatus::ok;
  int point = -1;       // where it failed
  double jacobian = 0;  // det F (or the projected dilatation) there
};

// Residual r = dPi/du (internal forces) and, when tangent is not null,
// K = dr/du of one cell. coordinates: reference positions (node_count x 2);
// dofs: the cell's local unknowns (cell_dof_count). No heap allocation.
KernelOutcome cell_internal_forces(const CellSetting& setting, const CellCoordinates& coordinates,
                                   const CellVector& dofs, CellVector& residual,
                                   CellMatrix* tangent);

// The state at every integration point of a cell, for post-processing.
struct PointState {
  Eigen::Vector2d position = Eigen::Vector2d::Zero();  // reference
  double area_weight = 0.0;    // w * det(dX/dxi): reference area, no 2 pi R
  double volume_weight = 0.0;  // as integrated (2 pi R included for axisymmetric)
  Eigen::Matrix3d deformation_gradient = Eigen::Matrix3d::Identity();
  Eigen::Matrix3d first_piola = Eigen::Matrix3d::Zero();  // with the element pressure when mixed
  double pressure = 0.0;  // the hydrostatic part used (mixed: the element field; plain: U'(J))
};

// Returns the number of points written (the cell rule's size).
int cell_point_states(const CellSetting& setting, const CellCoordinates& coordinates,
                      const CellVector& dofs, std::span<PointState> states,
                      KernelOutcome& outcome);

// Boundary edge loads. The edge's local unknowns are its nodal displacements
// (node-major) followed by e3 for generalized plane strain.
struct EdgeSetting {
  int node_count = 2;
  Kinematics kinematics = Kinematics::plane_strain;
};

using EdgeVector = Eigen::Matrix<double, Eigen::Dynamic, 1, 0, 7, 1>;
using EdgeMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, 0, 7, 7>;
using EdgeCoordinates = Eigen::Matrix<double, Eigen::Dynamic, 2, 0, 3, 2>;

[[nodiscard]] int edge_dof_count(const EdgeSetting& setting);

// External force of a follower pressure p (positive pushing into the
// material, on the deformed face) and, when tangent is not null, its
// derivative d(f_ext)/du (not symmetric).
void follower_pressure_forces(const EdgeSetting& setting, const EdgeCoordinates& coordinates,
                              const EdgeVector& dofs, double pressure, EdgeVector& force,
                              EdgeMatrix* tangent);

// External force of a dead nominal traction t(X) on the reference edge
// (independent of the displacements).
void dead_traction_forces(const EdgeSetting& setting, const EdgeCoordinates& coordinates,
                          const std::function<Eigen::Vector2d(const Eigen::Vector2d&, double)>& traction,
                          double load_factor, EdgeVector& force);

}  // namespace plystrain::solver
