// The mesher's own description of a layered stack and its defects. The case
// reader fills it from a parsed case; the mesher knows nothing of files.
//
// All lengths are in micrometres. z = 0 is the bottom of the lowest layer;
// x (strip) or r (disk) is measured from the symmetry plane or the axis.
#pragma once

#include <string>
#include <vector>

namespace plystrain::mesh {

enum class StackShape {
  strip,  // plane cross-section: 0..width (symmetric) or -width..width
  disk,   // axisymmetric cross-section: 0..width (= radius), axis at r = 0
};

enum class DefectKind { pinhole, thin_spot, delamination };

// What happens to the cavity of a pinhole or thin spot.
enum class CavityFill {
  above,  // the layer above flows in and keeps a flat top
  empty,  // the cavity stays empty; the layers above bridge it
};

struct StackLayer {
  std::string name;
  double thickness = 0.0;
  int elements_through = 3;  // minimum number of elements across the layer
};

struct StackDefect {
  DefectKind kind = DefectKind::pinhole;
  // The layer with the pinhole or thin spot; for a delamination the layer
  // whose top face is unbonded from what lies on it.
  int layer = 0;
  double at = 0.0;     // centre along x or r
  double size = 0.0;   // full width (strip) or diameter (disk, ring width for at > 0)
  double depth = 0.0;  // thin spot: share of the layer's thickness that is missing, in (0, 1)
  double taper = 0.0;  // thin spot: width of the sloped edge (0 = a step), inside `size`
  CavityFill fill = CavityFill::above;
  // Position of the defect in the case, from 1 (as in `defect.<n>`). Carried
  // by MeshError and used to name delamination edge sets.
  int case_index = 0;
};

struct StackDescription {
  StackShape shape = StackShape::strip;
  double width = 0.0;     // half-width of a strip or radius of a disk
  bool symmetric = true;  // strip only: model 0..width with a symmetry plane at x = 0
  std::vector<StackLayer> layers;  // bottom to top
  std::vector<StackDefect> defects;
  double size_near = 0.0;   // in-plane element size at defect edges
  double size_far = 0.0;    // in-plane element size far from defects
  double grade_over = 0.0;  // distance over which the size grows from near to far
  int order = 2;            // 1: linear cells, 2: quadratic cells
};

// Name of the contact pair of a delamination: "delamination-<case_index>";
// its faces are the edge sets "<name>-lower" and "<name>-upper".
[[nodiscard]] std::string delamination_name(const StackDefect& defect);

}  // namespace plystrain::mesh
