// Node-to-node penalty contact between two coincident faces (see FaceContact
// in model.hpp for the model and its limits). Internal to the solver library.
#pragma once

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/model.hpp"

#include <Eigen/Core>

#include <array>
#include <map>
#include <string>
#include <vector>

namespace plystrain::solver {

// What a node of a face carries: its share of the face's area (the
// integral of its shape function over the face; times 2 pi r when
// axisymmetric), its share of the length, the outward normal of the face's
// material there and the largest Young's modulus of the cells it touches.
struct FaceNodeShare {
  Eigen::Vector2d normal = Eigen::Vector2d::Zero();
  double area = 0.0;
  double spacing = 0.0;
  double modulus = 0.0;
};

// Per node of the face made by `edges` (edges have their material on the left).
[[nodiscard]] std::map<int, FaceNodeShare> face_node_shares(const mesh::Mesh& mesh,
                                                            const std::vector<mesh::Edge>& edges, bool axisymmetric,
                                                            const std::vector<double>& youngs_modulus_of_cell);

// One upper-face node facing one lower-face node.
struct ContactNodePair {
  int lower = -1;
  int upper = -1;
  Eigen::Vector2d normal = Eigen::Vector2d::UnitY();  // unit, out of the lower material
  double stiffness = 0.0;  // k w: normal force per unit closing displacement
  double area = 0.0;       // w: the node's share of the face
  double spacing = 0.0;    // the node's tributary length along the face
};

// Pairs the nodes of one contact's two faces. `youngs_modulus_of_cell` gives
// the small-strain Young's modulus of a cell's material. Throws
// std::invalid_argument starting with `what` when a node of the upper face
// has no partner at the same position on the lower one.
[[nodiscard]] std::vector<ContactNodePair> pair_contact_nodes(
    const mesh::Mesh& mesh, const std::vector<mesh::Edge>& lower_edges, const std::vector<mesh::Edge>& upper_edges,
    double penalty_factor, bool axisymmetric, const std::vector<double>& youngs_modulus_of_cell,
    const std::string& what);

// The four variables of a pair, in the order the kernel uses:
// (lower x, lower z, upper x, upper z).
[[nodiscard]] std::array<int, 4> contact_variables(const ContactNodePair& pair);

// Gap along the normal, g = (u_upper - u_lower) . n, from the displacements z.
[[nodiscard]] double contact_gap(const ContactNodePair& pair, const Eigen::VectorXd& z);

// Residual (4) and tangent (4 x 4, column-major) of one pair's penalty
// energy k/2 g^2 at the displacements z while the pair is in the closed set.
// Returns false (and zeros) for an open pair, which contributes nothing.
bool contact_pair_forces(const ContactNodePair& pair, bool closed, const Eigen::VectorXd& z,
                         Eigen::Matrix<double, 4, 1>& force, Eigen::Matrix<double, 4, 4>& stiffness);

}  // namespace plystrain::solver
