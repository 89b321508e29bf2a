// Gauss rules on the reference cells. Every point lies strictly inside its
// cell, so no axisymmetric integration point ever sits on the axis r = 0.
//
//   tri3  : 3 points, degree 2 (interior rule; the hoop term N/R needs more
//           than the 1-point rule)
//   tri6  : 6 points, degree 4 (Strang & Fix 1973; Dunavant 1985)
//   quad4 : 2 x 2 Gauss
//   quad8, quad9 : 3 x 3 Gauss
//   edges : 2 points (linear), 3 points (quadratic)
//
// Reference cells: triangles (0,0), (1,0), (0,1); quadrilaterals [-1, 1]^2;
// edges [-1, 1].
#pragma once

#include "plystrain/mesh/mesh.hpp"

#include <Eigen/Core>

#include <span>

namespace plystrain::solver {

struct QuadraturePoint {
  Eigen::Vector2d xi;
  double weight;
};

struct LinePoint {
  double xi;
  double weight;
};

inline constexpr int max_cell_points = 9;
inline constexpr int max_line_points = 3;

// The rule this project uses for a cell type (see above).
[[nodiscard]] std::span<const QuadraturePoint> cell_rule(mesh::CellType type);

// The rule for an edge with node_count nodes (2 or 3).
[[nodiscard]] std::span<const LinePoint> line_rule(int node_count);

}  // namespace plystrain::solver
