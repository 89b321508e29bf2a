// The mesh of a 2D cross-section: the one value type shared by the mesher
// (Gmsh), hand-built test meshes and the solver.
//
// Coordinates are (x, z) for strips and (r, z) for disks, in the case's
// length unit converted to the solver's internal unit (micrometres).
#pragma once

#include <Eigen/Core>

#include <array>
#include <cstdint>
#include <map>
#include <string>
#include <vector>

namespace plystrain::mesh {

// Node order of every type follows Gmsh (which equals VTK's order for these
// types): corners counter-clockwise first, then edge mid-nodes starting with
// the edge from corner 0 to corner 1, then the face centre (quad9).
enum class CellType : std::uint8_t { tri3, tri6, quad4, quad8, quad9 };

[[nodiscard]] constexpr int node_count(CellType type) {
  switch (type) {
    case CellType::tri3: return 3;
    case CellType::tri6: return 6;
    case CellType::quad4: return 4;
    case CellType::quad8: return 8;
    case CellType::quad9: return 9;
  }
  return 0;
}

[[nodiscard]] constexpr int corner_count(CellType type) {
  return (type == CellType::tri3 || type == CellType::tri6) ? 3 : 4;
}

[[nodiscard]] constexpr int polynomial_order(CellType type) {
  return (type == CellType::tri3 || type == CellType::quad4) ? 1 : 2;
}

[[nodiscard]] const char* cell_type_name(CellType type);

inline constexpr int max_nodes_per_cell = 9;

struct Cell {
  CellType type = CellType::tri3;
  std::array<int, max_nodes_per_cell> nodes{};  // first node_count(type) are used
  int region = 0;                               // layer index, bottom layer = 0

  [[nodiscard]] int size() const { return node_count(type); }
};

// A boundary or interface edge: 2 nodes (linear) or 3 nodes (end, end, mid).
// Edges of a boundary set are oriented so that the material of `cell` lies to
// the left when walking from nodes[0] to nodes[1]; the outward normal of the
// reference configuration is then (dz, -dx) normalised.
struct Edge {
  std::array<int, 3> nodes{};
  int node_count = 2;
  int cell = -1;        // the cell this edge bounds (-1 if unknown)
  int local_edge = -1;  // edge index within that cell (corner i to corner i+1)
};

// Two faces of an unbonded interface span. `lower` lies on the top face of
// the layer below, `upper` on the bottom face of the layer above; the faces
// start with coincident but separate nodes.
struct ContactPair {
  std::string name;
  std::string lower_edge_set;
  std::string upper_edge_set;
};

struct Mesh {
  std::vector<Eigen::Vector2d> nodes;
  std::vector<Cell> cells;
  std::vector<std::string> region_names;  // index = Cell::region
  std::map<std::string, std::vector<int>> node_sets;
  std::map<std::string, std::vector<Edge>> edge_sets;
  std::vector<ContactPair> contact_pairs;

  [[nodiscard]] int node_count() const { return static_cast<int>(nodes.size()); }
  [[nodiscard]] int cell_count() const { return static_cast<int>(cells.size()); }
};

// Structural checks shared by every producer of meshes: node indices in
// range, regions in range, edge sets referring to existing nodes. Returns an
// empty string when the mesh is consistent, otherwise what is wrong.
[[nodiscard]] std::string check_consistency(const Mesh& mesh);

// Nodes of all edges of an edge set, each once, in ascending order.
[[nodiscard]] std::vector<int> nodes_of_edge_set(const Mesh& mesh, const std::string& name);

}  // namespace plystrain::mesh
