#include "plystrain/mesh/structured.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <functional>
#include <limits>
#include <numbers>
#include <stdexcept>
#include <string>
#include <unordered_map>
#include <utility>
#include <vector>

namespace plystrain::mesh {
namespace {

using Point = Eigen::Vector2d;
using Mapping = std::function<Point(double u, double v)>;

// Parameters 0 = t_0 < t_1 < ... < t_n = 1 of cell boundaries with sizes in
// geometric progression, last size / first size = ratio.
std::vector<double> graded_parameters(int cells, double ratio) {
  if (cells < 1) {
    throw std::invalid_argument("structured mesh: a patch needs at least one cell per direction");
  }
  if (!(ratio > 0.0)) {
    throw std::invalid_argument("structured mesh: grading ratio must be > 0");
  }
  const double growth = cells > 1 ? std::pow(ratio, 1.0 / (cells - 1)) : 1.0;
  std::vector<double> t(static_cast<std::size_t>(cells) + 1, 0.0);
  double size = 1.0;
  for (int k = 0; k < cells; ++k) {
    t[static_cast<std::size_t>(k) + 1] = t[static_cast<std::size_t>(k)] + size;
    size *= growth;
  }
  for (double& value : t) {
    value /= t.back();
  }
  return t;
}

// Deterministic value in [-1, 1] from a few integers (no global state).
double hashed_unit(std::uint64_t a, std::uint64_t b, std::uint64_t c) {
  std::uint64_t x = a * 0x9E3779B97F4A7C15ULL ^ (b + 0x632BE59BD9B4E019ULL) * 0xBF58476D1CE4E5B9ULL ^
                    (c + 0x85157AF5ULL) * 0x94D049BB133111EBULL;
  x ^= x >> 31;
  x *= 0xD6E8FEB86659FD93ULL;
  x ^= x >> 29;
  return static_cast<double>(x >> 11) / static_cast<double>(1ULL << 52) - 1.0;
}

// Merges nodes that coincide within a tolerance (patch seams).
class NodeMerger {
 public:
  NodeMerger(std::vector<Point>& nodes, double tolerance) : nodes_(nodes), tolerance_(tolerance) {}

  int add(const Point& p) {
    const std::int64_t bx = std::llround(p.x() / tolerance_);
    const std::int64_t by = std::llround(p.y() / tolerance_);
    for (std::int64_t dx = -1; dx <= 1; ++dx) {
      for (std::int64_t dy = -1; dy <= 1; ++dy) {
        const auto found = bins_.find(key(bx + dx, by + dy));
        if (found == bins_.end()) {
          continue;
        }
        for (const int candidate : found->second) {
          if ((nodes_[static_cast<std::size_t>(candidate)] - p).norm() <= tolerance_) {
            return candidate;
          }
        }
      }
    }
    const int index = static_cast<int>(nodes_.size());
    nodes_.push_back(p);
    bins_[key(bx, by)].push_back(index);
    return index;
  }

 private:
  static std::uint64_t key(std::int64_t bx, std::int64_t by) {
    return static_cast<std::uint64_t>(bx) * 0x9E3779B97F4A7C15ULL ^ static_cast<std::uint64_t>(by);
  }

  std::vector<Point>& nodes_;
  double tolerance_;
  std::unordered_map<std::uint64_t, std::vector<int>> bins_;
};

struct PatchSpec {
  Mapping map;
  int cells_u = 1;
  int cells_v = 1;
  double grading_u = 1.0;
  double grading_v = 1.0;
  int region = 0;
  CellType type = CellType::quad9;
  double jitter = 0.0;     // > 0: straight edges, jittered interior vertices
  std::string side_names[4];  // v = 0, u = 1, v = 1, u = 0 ("" = not a named set)
  int seed = 0;
};

struct PendingEdge {
  std::string set;
  std::array<int, 3> nodes;
  int node_count;
  int region;
};

class Builder {
 public:
  explicit Builder(double tolerance) : merger_(mesh_nodes_, tolerance) {}

  void add_patch(const PatchSpec& patch) {
    const int order = polynomial_order(patch.type);
    const std::vector<double> tu = graded_parameters(patch.cells_u, patch.grading_u);
    const std::vector<double> tv = graded_parameters(patch.cells_v, patch.grading_v);
    const int nu = patch.cells_u;
    const int nv = patch.cells_v;

    // Vertex positions (possibly jittered), then every grid point.
    std::vector<Point> vertex(static_cast<std::size_t>((nu + 1) * (nv + 1)));
    auto vid = [nu](int i, int j) { return static_cast<std::size_t>(j * (nu + 1) + i); };
    for (int j = 0; j <= nv; ++j) {
      for (int i = 0; i <= nu; ++i) {
        double u = tu[static_cast<std::size_t>(i)];
        double v = tv[static_cast<std::size_t>(j)];
        if (patch.jitter > 0.0 && i > 0 && i < nu && j > 0 && j < nv) {
          const double du = 0.5 * (tu[static_cast<std::size_t>(i) + 1] - tu[static_cast<std::size_t>(i) - 1]);
          const double dv = 0.5 * (tv[static_cast<std::size_t>(j) + 1] - tv[static_cast<std::size_t>(j) - 1]);
          u += patch.jitter * du * hashed_unit(static_cast<std::uint64_t>(patch.seed), static_cast<std::uint64_t>(i), static_cast<std::uint64_t>(2 * j));
          v += patch.jitter * dv * hashed_unit(static_cast<std::uint64_t>(patch.seed), static_cast<std::uint64_t>(i), static_cast<std::uint64_t>(2 * j + 1));
        }
        vertex[vid(i, j)] = patch.map(u, v);
      }
    }
    const bool straight = patch.jitter > 0.0;
    const int gu = order * nu + 1;
    const int gv = order * nv + 1;
    std::vector<int> grid(static_cast<std::size_t>(gu * gv), -1);
    auto gid = [gu](int i, int j) { return static_cast<std::size_t>(j * gu + i); };
    auto param = [order](const std::vector<double>& t, int g) {
      if (g % order == 0) {
        return t[static_cast<std::size_t>(g / order)];
      }
      return 0.5 * (t[static_cast<std::size_t>(g / order)] + t[static_cast<std::size_t>(g / order) + 1]);
    };
    for (int j = 0; j < gv; ++j) {
      for (int i = 0; i < gu; ++i) {
        // The face-centre point of a linear grid is never needed; quadratic
        // triangles without a centre node still use it as the diagonal mid-node.
        Point p;
        if (i % order == 0 && j % order == 0) {
          p = vertex[vid(i / order, j / order)];
        } else if (straight) {
          const int i0 = i / order, j0 = j / order;
          const int i1 = (i % order == 0) ? i0 : i0 + 1;
          const int j1 = (j % order == 0) ? j0 : j0 + 1;
          if (i % order != 0 && j % order != 0) {
            p = 0.25 * (vertex[vid(i0, j0)] + vertex[vid(i1, j0)] + vertex[vid(i1, j1)] +
                        vertex[vid(i0, j1)]);
          } else {
            p = 0.5 * (vertex[vid(i0, j0)] + vertex[vid(i1, j1)]);
          }
        } else {
          p = patch.map(param(tu, i), param(tv, j));
        }
        grid[gid(i, j)] = merger_.add(p);
      }
    }

    for (int cj = 0; cj < nv; ++cj) {
      for (int ci = 0; ci < nu; ++ci) {
        add_cells(patch, grid, gu, ci, cj, straight);
      }
    }

    // Sides: v = 0 (u increasing), u = 1, v = 1, u = 0. Orientation is fixed
    // afterwards against the owning cell.
    for (int side = 0; side < 4; ++side) {
      if (patch.side_names[side].empty()) {
        continue;
      }
      const int n = (side % 2 == 0) ? nu : nv;
      for (int k = 0; k < n; ++k) {
        int a0 = 0, a1 = 0, b0 = 0, b1 = 0;  // grid indices of the two ends
        const int g0 = order * k, g1 = order * (k + 1);
        switch (side) {
          case 0: a0 = g0; b0 = 0; a1 = g1; b1 = 0; break;
          case 1: a0 = gu - 1; b0 = g0; a1 = gu - 1; b1 = g1; break;
          case 2: a0 = g0; b0 = gv - 1; a1 = g1; b1 = gv - 1; break;
          default: a0 = 0; b0 = g0; a1 = 0; b1 = g1; break;
        }
        PendingEdge edge;
        edge.set = patch.side_names[side];
        edge.region = patch.region;
        edge.nodes = {grid[gid(a0, b0)], grid[gid(a1, b1)], -1};
        edge.node_count = order == 2 ? 3 : 2;
        if (order == 2) {
          edge.nodes[2] = grid[gid((a0 + a1) / 2, (b0 + b1) / 2)];
        }
        pending_.push_back(edge);
      }
    }
  }

  Mesh finish(std::vector<std::string> region_names) {
    Mesh mesh;
    mesh.cells = std::move(cells_);
    mesh.region_names = std::move(region_names);
    // Keep only nodes that cells use (linear patches never create unused
    // nodes, but keep the mesh clean regardless), renumbered in order.
    std::vector<int> renumber(mesh_nodes_.size(), -1);
    for (const Cell& cell : mesh.cells) {
      for (int i = 0; i < cell.size(); ++i) {
        renumber[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])] = 0;
      }
    }
    int next = 0;
    for (std::size_t n = 0; n < renumber.size(); ++n) {
      if (renumber[n] == 0) {
        renumber[n] = next++;
        mesh.nodes.push_back(mesh_nodes_[n]);
      }
    }
    for (Cell& cell : mesh.cells) {
      for (int i = 0; i < cell.size(); ++i) {
        int& node = cell.nodes[static_cast<std::size_t>(i)];
        node = renumber[static_cast<std::size_t>(node)];
      }
    }

    std::vector<std::vector<int>> cells_of_node(mesh.nodes.size());
    for (int c = 0; c < mesh.cell_count(); ++c) {
      const Cell& cell = mesh.cells[static_cast<std::size_t>(c)];
      for (int i = 0; i < corner_count(cell.type); ++i) {
        cells_of_node[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])].push_back(c);
      }
    }
    for (PendingEdge pending : pending_) {
      for (int i = 0; i < pending.node_count; ++i) {
        int& node = pending.nodes[static_cast<std::size_t>(i)];
        node = renumber[static_cast<std::size_t>(node)];
      }
      Edge edge;
      edge.node_count = pending.node_count;
      edge.nodes = pending.nodes;
      const int n0 = edge.nodes[0];
      const int n1 = edge.nodes[1];
      for (const int c : cells_of_node[static_cast<std::size_t>(n0)]) {
        const Cell& cell = mesh.cells[static_cast<std::size_t>(c)];
        if (cell.region != pending.region) {
          continue;
        }
        const int corners = corner_count(cell.type);
        for (int i = 0; i < corners; ++i) {
          const int c0 = cell.nodes[static_cast<std::size_t>(i)];
          const int c1 = cell.nodes[static_cast<std::size_t>((i + 1) % corners)];
          if ((c0 == n0 && c1 == n1) || (c0 == n1 && c1 == n0)) {
            edge.cell = c;
            edge.local_edge = i;
            edge.nodes[0] = c0;
            edge.nodes[1] = c1;
          }
        }
        if (edge.cell >= 0) {
          break;
        }
      }
      if (edge.cell < 0) {
        throw std::logic_error("structured mesh: edge of set '" + pending.set +
                               "' has no owning cell");
      }
      mesh.edge_sets[pending.set].push_back(edge);
    }
    for (const auto& entry : mesh.edge_sets) {
      mesh.node_sets[entry.first] = nodes_of_edge_set(mesh, entry.first);
    }
    return mesh;
  }

 private:
  void add_cells(const PatchSpec& patch, const std::vector<int>& grid, int gu, int ci, int cj,
                 bool straight) {
    const int order = polynomial_order(patch.type);
    auto at = [&](int di, int dj) {
      return grid[static_cast<std::size_t>((order * cj + dj) * gu + order * ci + di)];
    };
    const int o = order;
    const int a = at(0, 0), b = at(o, 0), c = at(o, o), d = at(0, o);
    Cell cell;
    cell.region = patch.region;
    cell.type = patch.type;
    switch (patch.type) {
      case CellType::quad4:
        cell.nodes = {a, b, c, d};
        cells_.push_back(cell);
        return;
      case CellType::quad8:
        cell.nodes = {a, b, c, d, at(1, 0), at(2, 1), at(1, 2), at(0, 1)};
        cells_.push_back(cell);
        return;
      case CellType::quad9:
        cell.nodes = {a, b, c, d, at(1, 0), at(2, 1), at(1, 2), at(0, 1), at(1, 1)};
        cells_.push_back(cell);
        return;
      case CellType::tri3:
      case CellType::tri6:
        break;
    }
    // Alternate the diagonal so that the triangulation has no global bias.
    const bool diagonal_ac = (ci + cj) % 2 == 0;
    if (patch.type == CellType::tri3) {
      if (diagonal_ac) {
        push_triangle({a, b, c}, patch.region, CellType::tri3);
        push_triangle({a, c, d}, patch.region, CellType::tri3);
      } else {
        push_triangle({a, b, d}, patch.region, CellType::tri3);
        push_triangle({b, c, d}, patch.region, CellType::tri3);
      }
      return;
    }
    // Quadratic triangles: the centre grid point is the diagonal mid-node. On
    // straight-sided (jittered) patches move it onto the diagonal's midpoint.
    const int centre = at(1, 1);
    if (straight) {
      const Point& p0 = mesh_nodes_[static_cast<std::size_t>(diagonal_ac ? a : b)];
      const Point& p1 = mesh_nodes_[static_cast<std::size_t>(diagonal_ac ? c : d)];
      mesh_nodes_[static_cast<std::size_t>(centre)] = 0.5 * (p0 + p1);
    }
    if (diagonal_ac) {
      push_triangle({a, b, c, at(1, 0), at(2, 1), centre}, patch.region, CellType::tri6);
      push_triangle({a, c, d, centre, at(1, 2), at(0, 1)}, patch.region, CellType::tri6);
    } else {
      push_triangle({a, b, d, at(1, 0), centre, at(0, 1)}, patch.region, CellType::tri6);
      push_triangle({b, c, d, at(2, 1), at(1, 2), centre}, patch.region, CellType::tri6);
    }
  }

  void push_triangle(std::initializer_list<int> nodes, int region, CellType type) {
    Cell cell;
    cell.type = type;
    cell.region = region;
    std::copy(nodes.begin(), nodes.end(), cell.nodes.begin());
    cells_.push_back(cell);
  }

  std::vector<Point> mesh_nodes_;
  NodeMerger merger_;
  std::vector<Cell> cells_;
  std::vector<PendingEdge> pending_;
};

int nearest_node(const Mesh& mesh, const Point& p) {
  int best = 0;
  double best_distance = std::numeric_limits<double>::infinity();
  for (int n = 0; n < mesh.node_count(); ++n) {
    const double distance = (mesh.nodes[static_cast<std::size_t>(n)] - p).norm();
    if (distance < best_distance) {
      best_distance = distance;
      best = n;
    }
  }
  return best;
}

void require(bool condition, const std::string& message) {
  if (!condition) {
    throw std::invalid_argument("structured mesh: " + message);
  }
}

}  // namespace

Mesh layered_rectangle(const LayeredRectangleSpec& spec) {
  require(!spec.layers.empty(), "a layered rectangle needs at least one layer");
  require(spec.width > 0.0, "width must be > 0");
  double total = 0.0;
  for (const StructuredLayer& layer : spec.layers) {
    require(layer.thickness > 0.0, "layer '" + layer.name + "' thickness must be > 0");
    total += layer.thickness;
  }
  double smallest = spec.width;
  for (const StructuredLayer& layer : spec.layers) {
    smallest = std::min(smallest, layer.thickness);
  }
  Builder builder(1e-9 * smallest);
  std::vector<std::string> names;
  double z0 = 0.0;
  const int count = static_cast<int>(spec.layers.size());
  for (int i = 0; i < count; ++i) {
    const StructuredLayer& layer = spec.layers[static_cast<std::size_t>(i)];
    PatchSpec patch;
    const double x0 = spec.x_start;
    const double width = spec.width;
    const double thickness = layer.thickness;
    const double base = z0;
    patch.map = [x0, width, thickness, base](double u, double v) {
      return Point(x0 + width * u, base + thickness * v);
    };
    patch.cells_u = spec.cells_along;
    patch.cells_v = layer.cells_through;
    patch.grading_u = spec.grading_along;
    patch.grading_v = layer.grading;
    patch.region = i;
    patch.type = spec.cell_type;
    patch.jitter = spec.interior_jitter;
    patch.seed = i;
    patch.side_names[0] = i == 0 ? "bottom" : "";
    patch.side_names[1] = "right";
    patch.side_names[2] = i == count - 1 ? "top" : "interface-" + std::to_string(i);
    patch.side_names[3] = "left";
    builder.add_patch(patch);
    names.push_back(layer.name.empty() ? "layer-" + std::to_string(i) : layer.name);
    z0 += thickness;
  }
  Mesh mesh = builder.finish(std::move(names));
  const double x1 = spec.x_start + spec.width;
  mesh.node_sets["corner-bottom-left"] = {nearest_node(mesh, Point(spec.x_start, 0.0))};
  mesh.node_sets["corner-bottom-right"] = {nearest_node(mesh, Point(x1, 0.0))};
  mesh.node_sets["corner-top-left"] = {nearest_node(mesh, Point(spec.x_start, total))};
  mesh.node_sets["corner-top-right"] = {nearest_node(mesh, Point(x1, total))};
  return mesh;
}

Mesh annulus_sector(const AnnulusSectorSpec& spec) {
  require(spec.inner_radius > 0.0 && spec.outer_radius > spec.inner_radius,
          "annulus radii must satisfy 0 < inner < outer");
  require(spec.end_angle > spec.start_angle, "annulus end angle must exceed the start angle");
  Builder builder(1e-9 * spec.inner_radius);
  PatchSpec patch;
  const double a = spec.inner_radius, b = spec.outer_radius;
  const double t0 = spec.start_angle, t1 = spec.end_angle;
  patch.map = [a, b, t0, t1](double u, double v) {
    const double r = a + (b - a) * u;
    const double t = t0 + (t1 - t0) * v;
    return Point(r * std::cos(t), r * std::sin(t));
  };
  patch.cells_u = spec.cells_radial;
  patch.cells_v = spec.cells_angular;
  patch.grading_u = spec.radial_grading;
  patch.type = spec.cell_type;
  patch.side_names[0] = "start";
  patch.side_names[1] = "outer";
  patch.side_names[2] = "end";
  patch.side_names[3] = "inner";
  builder.add_patch(patch);
  return builder.finish({spec.region_name});
}

Mesh cooks_membrane(const CooksMembraneSpec& spec) {
  Builder builder(1e-9);
  PatchSpec patch;
  patch.map = [](double u, double v) {
    const Point p0(0.0, 0.0), p1(48.0, 44.0), p2(48.0, 60.0), p3(0.0, 44.0);
    return Point((1 - u) * (1 - v) * p0 + u * (1 - v) * p1 + u * v * p2 + (1 - u) * v * p3);
  };
  patch.cells_u = spec.cells_per_side;
  patch.cells_v = spec.cells_per_side;
  patch.type = spec.cell_type;
  patch.side_names[0] = "bottom";
  patch.side_names[1] = "right";
  patch.side_names[2] = "top";
  patch.side_names[3] = "left";
  builder.add_patch(patch);
  Mesh mesh = builder.finish({"membrane"});
  mesh.node_sets["corner-top-right"] = {nearest_node(mesh, Point(48.0, 60.0))};
  const int mid = nearest_node(mesh, Point(48.0, 52.0));
  if ((mesh.nodes[static_cast<std::size_t>(mid)] - Point(48.0, 52.0)).norm() < 1e-9) {
    mesh.node_sets["mid-right"] = {mid};
  }
  return mesh;
}

Mesh strip_with_hole(const StripWithHoleSpec& spec) {
  const double half_width = 0.5 * spec.width;
  const double half_length = 0.5 * spec.length;
  const double radius = 0.5 * spec.hole_diameter;
  require(radius > 0.0 && radius < half_width, "hole diameter must be in (0, width)");
  require(half_length > half_width, "strip length must exceed its width");
  Builder builder(1e-9 * radius);
  const double quarter = 0.25 * std::numbers::pi;

  PatchSpec below;  // hole arc 0..45 degrees to the free side x = W/2
  below.map = [radius, half_width, quarter](double u, double v) {
    const double t = quarter * v;
    const Point inner(radius * std::cos(t), radius * std::sin(t));
    const Point outer(half_width, half_width * v);
    return Point(inner + u * (outer - inner));
  };
  below.cells_u = spec.cells_radial;
  below.cells_v = spec.cells_around;
  below.grading_u = spec.radial_grading;
  below.type = spec.cell_type;
  below.side_names[0] = "bottom";
  below.side_names[1] = "right";
  below.side_names[3] = "hole";
  builder.add_patch(below);

  PatchSpec above = below;  // hole arc 45..90 degrees to the line z = W/2
  above.map = [radius, half_width, quarter](double u, double v) {
    const double t = quarter * (1.0 + v);
    const Point inner(radius * std::cos(t), radius * std::sin(t));
    const Point outer(half_width * (1.0 - v), half_width);
    return Point(inner + u * (outer - inner));
  };
  above.side_names[0] = "";
  above.side_names[1] = "";
  above.side_names[2] = "left";
  above.side_names[3] = "hole";
  builder.add_patch(above);

  PatchSpec beyond;  // the rectangle z = W/2 .. L/2
  beyond.map = [half_width, half_length](double u, double v) {
    return Point(half_width * u, half_width + (half_length - half_width) * v);
  };
  beyond.cells_u = spec.cells_around;
  beyond.cells_v = spec.cells_beyond;
  beyond.type = spec.cell_type;
  beyond.side_names[1] = "right";
  beyond.side_names[2] = "top";
  beyond.side_names[3] = "left";
  builder.add_patch(beyond);
  return builder.finish({"strip"});
}

}  // namespace plystrain::mesh
