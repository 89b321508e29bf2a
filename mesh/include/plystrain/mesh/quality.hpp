// Element quality per layer: the minimum scaled Jacobian and the maximum
// aspect ratio. Inverted (or degenerate) cells are counted and make
// require_no_inverted_cells() throw.
#pragma once

#include "plystrain/mesh/mesh.hpp"

#include <string>
#include <vector>

namespace plystrain::mesh {

struct LayerQuality {
  std::string layer;
  int cells = 0;
  // min over cells and over their corners and Gauss points of
  // det J / (|dx/dxi| |dx/deta|) (triangles scaled so that an equilateral
  // triangle gives 1); 1 for a rectangle, <= 0 for an inverted cell.
  double min_scaled_jacobian = 1.0;
  // max over cells of the longest corner-to-corner edge over the shortest.
  double max_aspect_ratio = 1.0;
  int inverted_cells = 0;
};

struct MeshQuality {
  std::vector<LayerQuality> layers;  // index = region
  [[nodiscard]] int inverted_cells() const;
  [[nodiscard]] double min_scaled_jacobian() const;
};

[[nodiscard]] double scaled_jacobian(const Mesh& mesh, const Cell& cell);
[[nodiscard]] double aspect_ratio(const Mesh& mesh, const Cell& cell);
[[nodiscard]] MeshQuality measure_quality(const Mesh& mesh);

// Throws MeshError (subject: the layer of the first inverted cell) when any
// cell is inverted.
void require_no_inverted_cells(const Mesh& mesh, const MeshQuality& quality);

}  // namespace plystrain::mesh
