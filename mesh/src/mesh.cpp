#include "plystrain/mesh/mesh.hpp"

#include <algorithm>
#include <sstream>

namespace plystrain::mesh {

const char* cell_type_name(CellType type) {
  switch (type) {
    case CellType::tri3: return "3-node triangle";
    case CellType::tri6: return "6-node triangle";
    case CellType::quad4: return "4-node quad";
    case CellType::quad8: return "8-node quad";
    case CellType::quad9: return "9-node quad";
  }
  return "unknown cell";
}

std::string check_consistency(const Mesh& mesh) {
  std::ostringstream problem;
  const int nodes = mesh.node_count();
  const int regions = static_cast<int>(mesh.region_names.size());
  for (int c = 0; c < mesh.cell_count(); ++c) {
    const Cell& cell = mesh.cells[static_cast<std::size_t>(c)];
    for (int i = 0; i < cell.size(); ++i) {
      const int n = cell.nodes[static_cast<std::size_t>(i)];
      if (n < 0 || n >= nodes) {
        problem << "cell " << c << " refers to node " << n << " of " << nodes << "\n";
        return problem.str();
      }
    }
    if (cell.region < 0 || cell.region >= regions) {
      problem << "cell " << c << " has region " << cell.region << " but the mesh names "
              << regions << " regions\n";
      return problem.str();
    }
  }
  for (const auto& [name, set] : mesh.node_sets) {
    for (const int n : set) {
      if (n < 0 || n >= nodes) {
        problem << "node set '" << name << "' refers to node " << n << "\n";
        return problem.str();
      }
    }
  }
  for (const auto& [name, edges] : mesh.edge_sets) {
    for (const Edge& edge : edges) {
      if (edge.node_count != 2 && edge.node_count != 3) {
        problem << "edge set '" << name << "' has an edge with " << edge.node_count << " nodes\n";
        return problem.str();
      }
      for (int i = 0; i < edge.node_count; ++i) {
        const int n = edge.nodes[static_cast<std::size_t>(i)];
        if (n < 0 || n >= nodes) {
          problem << "edge set '" << name << "' refers to node " << n << "\n";
          return problem.str();
        }
      }
    }
  }
  for (const ContactPair& pair : mesh.contact_pairs) {
    if (!mesh.edge_sets.contains(pair.lower_edge_set) ||
        !mesh.edge_sets.contains(pair.upper_edge_set)) {
      problem << "contact pair '" << pair.name << "' names a missing edge set\n";
      return problem.str();
    }
  }
  return {};
}

std::vector<int> nodes_of_edge_set(const Mesh& mesh, const std::string& name) {
  std::vector<int> result;
  const auto found = mesh.edge_sets.find(name);
  if (found == mesh.edge_sets.end()) {
    return result;
  }
  for (const Edge& edge : found->second) {
    for (int i = 0; i < edge.node_count; ++i) {
      result.push_back(edge.nodes[static_cast<std::size_t>(i)]);
    }
  }
  std::sort(result.begin(), result.end());
  result.erase(std::unique(result.begin(), result.end()), result.end());
  return result;
}

}  // namespace plystrain::mesh
