// Stack meshing: a StackDescription becomes a Mesh of structured,
// recombined quadrilateral bands, one set of bands per layer.
//
// The stack is cut into vertical columns at every defect edge, every taper
// end and every grading breakpoint, so that inside a column every layer is
// a quadrilateral patch whose faces are straight lines. Each patch is meshed
// as a transfinite, recombined patch: at least `elements_through` elements
// across every layer everywhere (under and over defects too), and in-plane
// spacing graded geometrically from size_near at each defect edge to
// size_far over grade_over.
//
// Edge sets (material on the left, see mesh.hpp) and node sets of the same
// names:
//   "bottom"                      z = 0
//   "top"                         the top face of the top layer
//   "symmetry" (symmetric strip) or "axis" (disk)   x = 0
//   "outer"                       x = width;  full strips also "outer-left" at x = -width
//   "interface-<lower layer>"     bonded top face of that layer (cells of the lower layer)
//   "<pair>-lower", "<pair>-upper"  the two faces of each delamination (pair name from
//                                 delamination_name()); the end nodes of the span are shared
// Cavity walls, floors and roofs are free faces and belong to no set.
#pragma once

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/mesh/stack.hpp"

namespace plystrain::mesh {

class GmshSession;

// Checks the description (ranges, defects inside the width, tapers, overlaps)
// and throws MeshError naming the defect or layer at fault.
void validate_stack(const StackDescription& stack);

// Builds the geometry in `session` (replacing its model), meshes it and
// returns the mesh. The model stays in the session, so that it can be
// written as .msh afterwards. Throws MeshError for a defect that cannot be
// built, a Gmsh failure, or an inverted cell.
[[nodiscard]] Mesh build_stack_mesh(GmshSession& session, const StackDescription& stack);

// The same with a session of its own.
[[nodiscard]] Mesh build_stack_mesh(const StackDescription& stack);

}  // namespace plystrain::mesh
