// Helpers shared by the stack-mesher tests: small stacks and exact
// geometric measures of meshes (polygon area and first moment).
#pragma once

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/mesh/stack.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <vector>

namespace plystrain::mesh::testing {

// A thick elastomer substrate, two thin films and a cap, in micrometres.
inline StackDescription four_layer_stack(StackShape shape, bool symmetric = true) {
  StackDescription stack;
  stack.shape = shape;
  stack.width = 20.0;
  stack.symmetric = symmetric;
  stack.layers = {{"substrate", 10.0, 3}, {"electrode", 0.2, 3}, {"active", 0.1, 3}, {"cap", 2.0, 3}};
  stack.size_near = 0.05;
  stack.size_far = 1.0;
  stack.grade_over = 5.0;
  stack.order = 2;
  return stack;
}

inline StackDefect pinhole(int layer, double at, double size, CavityFill fill, int index = 1) {
  StackDefect d;
  d.kind = DefectKind::pinhole;
  d.layer = layer;
  d.at = at;
  d.size = size;
  d.fill = fill;
  d.case_index = index;
  return d;
}

inline StackDefect thin_spot(int layer, double at, double size, double depth, double taper,
                             CavityFill fill, int index = 1) {
  StackDefect d = pinhole(layer, at, size, fill, index);
  d.kind = DefectKind::thin_spot;
  d.depth = depth;
  d.taper = taper;
  return d;
}

inline StackDefect delamination(int below, double at, double size, int index = 1) {
  StackDefect d = pinhole(below, at, size, CavityFill::above, index);
  d.kind = DefectKind::delamination;
  return d;
}

// Straight-sided cells: the polygon through the corners is the exact cell.
// Shoelace area and, for disks, the first moment int x dA (so that the
// volume of revolution is 2 pi int r dA), per region.
struct RegionMeasures {
  std::vector<double> area;
  std::vector<double> moment;
};

inline RegionMeasures measure_regions(const Mesh& mesh) {
  RegionMeasures m;
  m.area.assign(mesh.region_names.size(), 0.0);
  m.moment.assign(mesh.region_names.size(), 0.0);
  for (const Cell& cell : mesh.cells) {
    const int corners = corner_count(cell.type);
    for (int i = 0; i < corners; ++i) {
      const Eigen::Vector2d& a = mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])];
      const Eigen::Vector2d& b =
          mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>((i + 1) % corners)])];
      const double cross = a.x() * b.y() - b.x() * a.y();
      m.area[static_cast<std::size_t>(cell.region)] += 0.5 * cross;
      m.moment[static_cast<std::size_t>(cell.region)] += (a.x() + b.x()) * cross / 6.0;
    }
  }
  return m;
}

inline double volume(const RegionMeasures& m, int region) {
  return 2.0 * std::numbers::pi * m.moment[static_cast<std::size_t>(region)];
}

// int_p^q f g dx for f, g linear on [p, q] (exact: Simpson's rule
// integrates the quadratic product exactly) (common practice).
inline double integral_of_linear_product(double p, double q, double fp, double fq, double gp,
                                         double gq) {
  return (q - p) / 6.0 * (2.0 * fp * gp + fp * gq + fq * gp + 2.0 * fq * gq);
}

// Exact removed area (strip: int g dx) or first moment (disk: int r g dx)
// of a thin-spot profile g (1 in the core, linear slopes of width `taper`)
// over [lo, hi] clipped to [start, inf).
inline double recess_integral(double lo, double hi, double taper, double start, bool moment) {
  struct Piece {
    double p, q, gp, gq;
  };
  const std::vector<Piece> pieces{
      {lo, lo + taper, 0.0, 1.0}, {lo + taper, hi - taper, 1.0, 1.0}, {hi - taper, hi, 1.0, 0.0}};
  double total = 0.0;
  for (Piece piece : pieces) {
    if (piece.q <= start || piece.q <= piece.p) {
      continue;
    }
    if (piece.p < start) {
      piece.gp = piece.gp + (piece.gq - piece.gp) * (start - piece.p) / (piece.q - piece.p);
      piece.p = start;
    }
    const double fp = moment ? piece.p : 1.0;
    const double fq = moment ? piece.q : 1.0;
    total += integral_of_linear_product(piece.p, piece.q, fp, fq, piece.gp, piece.gq);
  }
  return total;
}

// Cells of `region` crossed by the vertical line at x.
inline int cells_across(const Mesh& mesh, int region, double x) {
  int count = 0;
  for (const Cell& cell : mesh.cells) {
    if (cell.region != region) {
      continue;
    }
    double lo = 1e300;
    double hi = -1e300;
    for (int i = 0; i < corner_count(cell.type); ++i) {
      const double cx = mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])].x();
      lo = std::min(lo, cx);
      hi = std::max(hi, cx);
    }
    if (lo < x && x < hi) {
      ++count;
    }
  }
  return count;
}

// Pairs of distinct nodes at the same place.
inline std::vector<std::pair<int, int>> coincident_nodes(const Mesh& mesh, double tolerance) {
  std::vector<int> order(mesh.nodes.size());
  for (std::size_t k = 0; k < order.size(); ++k) {
    order[k] = static_cast<int>(k);
  }
  std::sort(order.begin(), order.end(), [&](int a, int b) {
    return mesh.nodes[static_cast<std::size_t>(a)].x() < mesh.nodes[static_cast<std::size_t>(b)].x();
  });
  std::vector<std::pair<int, int>> pairs;
  for (std::size_t i = 0; i < order.size(); ++i) {
    for (std::size_t j = i + 1; j < order.size(); ++j) {
      const Eigen::Vector2d& a = mesh.nodes[static_cast<std::size_t>(order[i])];
      const Eigen::Vector2d& b = mesh.nodes[static_cast<std::size_t>(order[j])];
      if (b.x() - a.x() > tolerance) {
        break;
      }
      if ((a - b).norm() <= tolerance) {
        pairs.emplace_back(std::min(order[i], order[j]), std::max(order[i], order[j]));
      }
    }
  }
  return pairs;
}

}  // namespace plystrain::mesh::testing
