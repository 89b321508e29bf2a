#include "plystrain/mesh/quality.hpp"

#include "plystrain/mesh/mesh_error.hpp"

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>
#include <limits>

namespace plystrain::mesh {

namespace {

// Derivatives (d/dxi, d/deta) of the shape functions of a cell type at a
// point of the reference element, in Gmsh's node order.
using Derivatives = std::array<Eigen::Vector2d, max_nodes_per_cell>;

// 1D quadratic Lagrange polynomials on nodes -1, 0, 1 and their derivatives.
double lagrange(int node, double s) {
  switch (node) {
    case -1: return 0.5 * s * (s - 1.0);
    case 0: return 1.0 - s * s;
    default: return 0.5 * s * (s + 1.0);
  }
}
double lagrange_slope(int node, double s) {
  switch (node) {
    case -1: return s - 0.5;
    case 0: return -2.0 * s;
    default: return s + 0.5;
  }
}

constexpr std::array<std::array<int, 2>, 9> quad_nodes{
    {{-1, -1}, {1, -1}, {1, 1}, {-1, 1}, {0, -1}, {1, 0}, {0, 1}, {-1, 0}, {0, 0}}};

Derivatives shape_derivatives(CellType type, double xi, double eta) {
  Derivatives d{};
  switch (type) {
    case CellType::quad4:
      for (int i = 0; i < 4; ++i) {
        const double a = quad_nodes[static_cast<std::size_t>(i)][0];
        const double b = quad_nodes[static_cast<std::size_t>(i)][1];
        d[static_cast<std::size_t>(i)] = {0.25 * a * (1.0 + b * eta), 0.25 * b * (1.0 + a * xi)};
      }
      break;
    case CellType::quad8:
      for (int i = 0; i < 8; ++i) {
        const double a = quad_nodes[static_cast<std::size_t>(i)][0];
        const double b = quad_nodes[static_cast<std::size_t>(i)][1];
        if (i < 4) {
          d[static_cast<std::size_t>(i)] = {
              0.25 * a * (1.0 + b * eta) * (2.0 * a * xi + b * eta),
              0.25 * b * (1.0 + a * xi) * (a * xi + 2.0 * b * eta)};
        } else if (a == 0.0) {
          d[static_cast<std::size_t>(i)] = {-xi * (1.0 + b * eta),
                                            0.5 * b * (1.0 - xi * xi)};
        } else {
          d[static_cast<std::size_t>(i)] = {0.5 * a * (1.0 - eta * eta),
                                            -eta * (1.0 + a * xi)};
        }
      }
      break;
    case CellType::quad9:
      for (int i = 0; i < 9; ++i) {
        const int a = quad_nodes[static_cast<std::size_t>(i)][0];
        const int b = quad_nodes[static_cast<std::size_t>(i)][1];
        d[static_cast<std::size_t>(i)] = {lagrange_slope(a, xi) * lagrange(b, eta),
                                          lagrange(a, xi) * lagrange_slope(b, eta)};
      }
      break;
    case CellType::tri3:
      d[0] = {-1.0, -1.0};
      d[1] = {1.0, 0.0};
      d[2] = {0.0, 1.0};
      break;
    case CellType::tri6: {
      const double l1 = 1.0 - xi - eta;
      d[0] = {1.0 - 4.0 * l1, 1.0 - 4.0 * l1};
      d[1] = {4.0 * xi - 1.0, 0.0};
      d[2] = {0.0, 4.0 * eta - 1.0};
      d[3] = {4.0 * (l1 - xi), -4.0 * xi};
      d[4] = {4.0 * eta, 4.0 * xi};
      d[5] = {-4.0 * eta, 4.0 * (l1 - eta)};
      break;
    }
  }
  return d;
}

Eigen::Matrix2d jacobian(const Mesh& mesh, const Cell& cell, double xi, double eta) {
  const Derivatives d = shape_derivatives(cell.type, xi, eta);
  Eigen::Matrix2d j = Eigen::Matrix2d::Zero();
  for (int i = 0; i < cell.size(); ++i) {
    const Eigen::Vector2d& x =
        mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])];
    j.noalias() += x * d[static_cast<std::size_t>(i)].transpose();
  }
  return j;
}

double scaled(const Eigen::Matrix2d& j) {
  const double lengths = j.col(0).norm() * j.col(1).norm();
  return lengths > 0.0 ? j.determinant() / lengths : 0.0;
}

const Eigen::Vector2d& corner(const Mesh& mesh, const Cell& cell, int i) {
  return mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])];
}

}  // namespace

double scaled_jacobian(const Mesh& mesh, const Cell& cell) {
  double worst = std::numeric_limits<double>::infinity();
  if (corner_count(cell.type) == 4) {
    // Corners and the 3 x 3 Gauss points.
    const double g = std::sqrt(0.6);
    for (const double xi : {-1.0, -g, 0.0, g, 1.0}) {
      for (const double eta : {-1.0, -g, 0.0, g, 1.0}) {
        const bool is_corner = std::abs(xi) == 1.0 && std::abs(eta) == 1.0;
        const bool is_gauss = std::abs(xi) < 1.0 && std::abs(eta) < 1.0;
        if (is_corner || is_gauss) {
          worst = std::min(worst, scaled(jacobian(mesh, cell, xi, eta)));
        }
      }
    }
    return worst;
  }
  // Triangles: the corner angles, scaled so that 60 degrees gives 1; and the
  // sign of det J at the corners and the 3-point Gauss points.
  const double to_unit = 2.0 / std::sqrt(3.0);
  for (int i = 0; i < 3; ++i) {
    const Eigen::Vector2d a = corner(mesh, cell, (i + 1) % 3) - corner(mesh, cell, i);
    const Eigen::Vector2d b = corner(mesh, cell, (i + 2) % 3) - corner(mesh, cell, i);
    const double lengths = a.norm() * b.norm();
    const double sine = lengths > 0.0 ? (a.x() * b.y() - a.y() * b.x()) / lengths : 0.0;
    worst = std::min(worst, std::min(1.0, sine * to_unit));
  }
  const std::array<std::array<double, 2>, 6> points{
      {{0.0, 0.0}, {1.0, 0.0}, {0.0, 1.0}, {1.0 / 6, 1.0 / 6}, {2.0 / 3, 1.0 / 6}, {1.0 / 6, 2.0 / 3}}};
  for (const auto& p : points) {
    const double s = scaled(jacobian(mesh, cell, p[0], p[1]));
    if (s <= 0.0) {
      worst = std::min(worst, s);
    }
  }
  return worst;
}

double aspect_ratio(const Mesh& mesh, const Cell& cell) {
  const int corners = corner_count(cell.type);
  double longest = 0.0;
  double shortest = std::numeric_limits<double>::infinity();
  for (int i = 0; i < corners; ++i) {
    const double length = (corner(mesh, cell, (i + 1) % corners) - corner(mesh, cell, i)).norm();
    longest = std::max(longest, length);
    shortest = std::min(shortest, length);
  }
  return shortest > 0.0 ? longest / shortest : std::numeric_limits<double>::infinity();
}

int MeshQuality::inverted_cells() const {
  int total = 0;
  for (const LayerQuality& layer : layers) {
    total += layer.inverted_cells;
  }
  return total;
}

double MeshQuality::min_scaled_jacobian() const {
  double worst = 1.0;
  for (const LayerQuality& layer : layers) {
    if (layer.cells > 0) {
      worst = std::min(worst, layer.min_scaled_jacobian);
    }
  }
  return worst;
}

MeshQuality measure_quality(const Mesh& mesh) {
  MeshQuality quality;
  for (const std::string& name : mesh.region_names) {
    LayerQuality layer;
    layer.layer = name;
    quality.layers.push_back(layer);
  }
  for (const Cell& cell : mesh.cells) {
    if (cell.region < 0 || cell.region >= static_cast<int>(quality.layers.size())) {
      continue;
    }
    LayerQuality& layer = quality.layers[static_cast<std::size_t>(cell.region)];
    const double sj = scaled_jacobian(mesh, cell);
    ++layer.cells;
    layer.min_scaled_jacobian = std::min(layer.min_scaled_jacobian, sj);
    layer.max_aspect_ratio = std::max(layer.max_aspect_ratio, aspect_ratio(mesh, cell));
    if (!(sj > 0.0)) {
      ++layer.inverted_cells;
    }
  }
  return quality;
}

void require_no_inverted_cells(const Mesh& mesh, const MeshQuality& quality) {
  for (std::size_t l = 0; l < quality.layers.size(); ++l) {
    const LayerQuality& layer = quality.layers[l];
    if (layer.inverted_cells > 0) {
      throw MeshError::for_layer(
          static_cast<int>(l), "layer '" + layer.layer + "' has " +
                                   std::to_string(layer.inverted_cells) +
                                   " inverted or degenerate cells (minimum scaled Jacobian " +
                                   std::to_string(layer.min_scaled_jacobian) + ") of " +
                                   std::to_string(mesh.cell_count()) + " in the mesh");
    }
  }
}

}  // namespace plystrain::mesh
