// Hand-built structured meshes (no Gmsh) for tests, verification and
// benchmarks: a layered rectangle, an annulus sector, Cook's membrane and a
// quarter of a strip with a central hole.
//
// Every generator maps one or more logically rectangular patches; nodes that
// coincide on patch seams (layer interfaces) are merged, so layers are bonded.
// Quadrilateral cells of a patch may be split into two triangles each (tri3,
// tri6), and cells are always counter-clockwise in the reference frame.
//
// Named sets (edge sets oriented as mesh.hpp requires; node sets hold the
// nodes of the edge set of the same name, ascending):
//   layered rectangle: "bottom", "top", "left", "right", "interface-<i>"
//     (the top face of layer i, i.e. between regions i and i + 1, its edges
//     belonging to the cells of region i), node sets also "corner-bottom-left",
//     "corner-bottom-right", "corner-top-left", "corner-top-right".
//   annulus sector: "inner", "outer", "start" (the radial edge at the start
//     angle), "end" (the radial edge at the end angle).
//   Cook's membrane: "left" (clamped), "right" (loaded), "bottom", "top";
//     node sets also "corner-top-right" (the node at (48, 60)) and
//     "mid-right" (the node at (48, 52)).
//   strip with hole (quarter, symmetry planes x = 0 and z = 0): "hole",
//     "bottom" (z = 0, the net section), "left" (x = 0), "right" (x = W/2,
//     the free side), "top" (z = L/2, the loaded end).
#pragma once

#include "plystrain/mesh/mesh.hpp"

#include <string>
#include <vector>

namespace plystrain::mesh {

struct StructuredLayer {
  std::string name;
  double thickness = 1.0;
  int cells_through = 1;
  // Ratio of the top cell's height to the bottom cell's height within this
  // layer (geometric progression); 1 = uniform.
  double grading = 1.0;
};

struct LayeredRectangleSpec {
  double x_start = 0.0;
  double width = 1.0;
  int cells_along = 1;
  // Ratio of the last (right) cell's width to the first (left) one's.
  double grading_along = 1.0;
  std::vector<StructuredLayer> layers;  // bottom to top; z = 0 at the bottom
  CellType cell_type = CellType::quad9;
  // Moves every interior vertex by up to this fraction of the local cell size
  // (deterministic pseudo-random), keeping edges straight and mid-nodes at
  // edge midpoints, for distorted-mesh patch tests. 0 = regular grid.
  double interior_jitter = 0.0;
};

[[nodiscard]] Mesh layered_rectangle(const LayeredRectangleSpec& spec);

struct AnnulusSectorSpec {
  double inner_radius = 1.0;
  double outer_radius = 2.0;
  double start_angle = 0.0;                  // radians, from the x axis
  double end_angle = 1.5707963267948966;     // a quarter annulus by default
  int cells_radial = 4;
  int cells_angular = 8;
  // Ratio of the outermost cell's radial size to the innermost one's.
  double radial_grading = 1.0;
  CellType cell_type = CellType::quad9;
  std::string region_name = "annulus";
};

// Mid-nodes lie on the arcs (isoparametric curved edges).
[[nodiscard]] Mesh annulus_sector(const AnnulusSectorSpec& spec);

struct CooksMembraneSpec {
  int cells_per_side = 8;
  CellType cell_type = CellType::quad9;
};

// Corners (0,0), (48,44), (48,60), (0,44) (Cook 1974).
[[nodiscard]] Mesh cooks_membrane(const CooksMembraneSpec& spec);

struct StripWithHoleSpec {
  double width = 10.0;          // full width W of the strip
  double length = 40.0;         // full length L (>= 2 W recommended)
  double hole_diameter = 2.0;   // d < W
  int cells_around = 8;         // cells along each eighth of the hole
  int cells_radial = 8;         // cells from the hole to the square around it
  int cells_beyond = 8;         // cells along z from z = W/2 to L/2
  double radial_grading = 4.0;  // outer radial cell size / inner
  CellType cell_type = CellType::quad9;
};

// The quarter x >= 0, z >= 0 of a strip |x| <= W/2, |z| <= L/2 with a central
// hole of diameter d.
[[nodiscard]] Mesh strip_with_hole(const StripWithHoleSpec& spec);

}  // namespace plystrain::mesh
