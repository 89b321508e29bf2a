#include "face_contact.hpp"

#include "plystrain/solver/elements.hpp"
#include "plystrain/solver/quadrature.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <numbers>
#include <stdexcept>

namespace plystrain::solver {
// Per node of a face: the integral of its shape function over the face (its
// share of the area), its share of the length and the outward normal of the
// face's material. Edges have that material on their left (mesh.hpp), so the
// outward normal is the tangent turned clockwise.
std::map<int, FaceNodeShare> face_node_shares(const mesh::Mesh& mesh, const std::vector<mesh::Edge>& edges,
                                   bool axisymmetric, const std::vector<double>& youngs_modulus_of_cell) {
  std::map<int, FaceNodeShare> nodes;
  for (const mesh::Edge& edge : edges) {
    const int n = edge.node_count;
    const double modulus =
        edge.cell >= 0 ? youngs_modulus_of_cell[static_cast<std::size_t>(edge.cell)] : 0.0;
    for (const LinePoint& lp : line_rule(n)) {
      Eigen::Vector3d N, dN;
      line_shape_functions(n, lp.xi, N, dN);
      Eigen::Vector2d position = Eigen::Vector2d::Zero();
      Eigen::Vector2d tangent = Eigen::Vector2d::Zero();
      for (int a = 0; a < n; ++a) {
        const Eigen::Vector2d X = mesh.nodes[static_cast<std::size_t>(edge.nodes[static_cast<std::size_t>(a)])];
        position += N(a) * X;
        tangent += dN(a) * X;
      }
      const double length = lp.weight * tangent.norm();
      const double ring = axisymmetric ? 2.0 * std::numbers::pi * position.x() : 1.0;
      const Eigen::Vector2d outward(tangent.y(), -tangent.x());
      for (int a = 0; a < n; ++a) {
        FaceNodeShare& node = nodes[edge.nodes[static_cast<std::size_t>(a)]];
        node.area += N(a) * length * ring;
        node.spacing += N(a) * length;
        node.normal += N(a) * lp.weight * outward;
        node.modulus = std::max(node.modulus, modulus);
      }
    }
  }
  for (auto& [index, node] : nodes) {
    const double norm = node.normal.norm();
    if (norm > 0.0) {
      node.normal /= norm;
    }
  }
  return nodes;
}


std::vector<ContactNodePair> pair_contact_nodes(const mesh::Mesh& mesh, const std::vector<mesh::Edge>& lower_edges,
                                                const std::vector<mesh::Edge>& upper_edges, double penalty_factor,
                                                bool axisymmetric, const std::vector<double>& youngs_modulus_of_cell,
                                                const std::string& what) {
  if (!(penalty_factor > 0.0)) {
    throw std::invalid_argument(what + ": the penalty factor must be positive");
  }
  double extent = 0.0;
  for (const Eigen::Vector2d& x : mesh.nodes) {
    extent = std::max(extent, x.cwiseAbs().maxCoeff());
  }
  const double tolerance = 1e-9 * std::max(extent, 1e-300);
  const std::map<int, FaceNodeShare> lower = face_node_shares(mesh, lower_edges, axisymmetric, youngs_modulus_of_cell);
  const std::map<int, FaceNodeShare> upper = face_node_shares(mesh, upper_edges, axisymmetric, youngs_modulus_of_cell);
  // Partners by position: sort the lower nodes along x (the faces are
  // interface spans, one value of z per x).
  std::vector<std::pair<double, int>> by_x;
  by_x.reserve(lower.size());
  for (const auto& [index, node] : lower) {
    by_x.emplace_back(mesh.nodes[static_cast<std::size_t>(index)].x(), index);
  }
  std::sort(by_x.begin(), by_x.end());
  std::vector<ContactNodePair> pairs;
  for (const auto& [upper_index, upper_node] : upper) {
    const Eigen::Vector2d X = mesh.nodes[static_cast<std::size_t>(upper_index)];
    auto candidate = std::lower_bound(by_x.begin(), by_x.end(), std::make_pair(X.x() - tolerance, -1));
    int partner = -1;
    for (; candidate != by_x.end() && candidate->first <= X.x() + tolerance; ++candidate) {
      if ((mesh.nodes[static_cast<std::size_t>(candidate->second)] - X).norm() <= tolerance) {
        partner = candidate->second;
        break;
      }
    }
    if (partner < 0) {
      throw std::invalid_argument(what + ": node " + std::to_string(upper_index) + " at (" + std::to_string(X.x()) +
                                  ", " + std::to_string(X.y()) +
                                  ") has no partner at the same position on the lower face");
    }
    if (partner == upper_index) {
      continue;  // a node shared by both faces (the bonded end of the span) cannot open
    }
    const FaceNodeShare& lower_node = lower.at(partner);
    ContactNodePair pair;
    pair.lower = partner;
    pair.upper = upper_index;
    pair.normal = lower_node.normal;
    pair.area = lower_node.area;
    pair.spacing = lower_node.spacing;
    const double modulus = std::max(lower_node.modulus, upper_node.modulus);
    pair.stiffness = penalty_factor * modulus / std::max(pair.spacing, 1e-300) * pair.area;
    pairs.push_back(pair);
  }
  return pairs;
}

std::array<int, 4> contact_variables(const ContactNodePair& pair) {
  return {2 * pair.lower, 2 * pair.lower + 1, 2 * pair.upper, 2 * pair.upper + 1};
}

double contact_gap(const ContactNodePair& pair, const Eigen::VectorXd& z) {
  const Eigen::Vector2d relative(z(2 * pair.upper) - z(2 * pair.lower), z(2 * pair.upper + 1) - z(2 * pair.lower + 1));
  return relative.dot(pair.normal);
}

bool contact_pair_forces(const ContactNodePair& pair, bool closed, const Eigen::VectorXd& z,
                         Eigen::Matrix<double, 4, 1>& force, Eigen::Matrix<double, 4, 4>& stiffness) {
  force.setZero();
  stiffness.setZero();
  if (!closed) {
    return false;
  }
  const double gap = contact_gap(pair, z);
  // dg/dz = (-n, n) over (lower, upper); energy k/2 g^2 while closed.
  Eigen::Matrix<double, 4, 1> dg;
  dg << -pair.normal.x(), -pair.normal.y(), pair.normal.x(), pair.normal.y();
  force = pair.stiffness * gap * dg;
  stiffness = pair.stiffness * (dg * dg.transpose());
  return true;
}

}  // namespace plystrain::solver
