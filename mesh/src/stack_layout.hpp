// Internal to the mesher: the column decomposition of a stack. Every column
// is an x-interval inside which each layer is a quadrilateral band with
// straight bottom and top faces; columns break at every defect edge, taper
// end and grading breakpoint.
#pragma once

#include "plystrain/mesh/stack.hpp"

#include <array>
#include <vector>

namespace plystrain::mesh::detail {

// Interval of a pinhole, thin spot or delamination along x (or r). Defects
// centred on a symmetry plane or axis extend to -size/2 (outside the model).
struct DefectExtent {
  double lo = 0.0;
  double hi = 0.0;
  double inner_lo = 0.0;  // thin spot: end of the left slope (lo + taper)
  double inner_hi = 0.0;  // thin spot: start of the right slope (hi - taper)
};

[[nodiscard]] double domain_start(const StackDescription& stack);
[[nodiscard]] DefectExtent extent_of(const StackDefect& defect);

struct Column {
  double x0 = 0.0;
  double x1 = 0.0;
  int elements = 1;          // along x
  double progression = 1.0;  // ratio of neighbouring element lengths, >= 1
  bool fine_at_left = true;  // the smallest element sits at x0
};

// What a layer's band rests on in a column.
inline constexpr int rests_on_ground = -1;
inline constexpr int rests_on_nothing = -2;  // bridges a void cavity: a free bottom face

struct Band {
  bool present = false;
  std::array<double, 2> bottom{};  // z at x0 and x1
  std::array<double, 2> top{};
  int rests_on = rests_on_ground;  // layer whose top face carries this band, or the above
  int elements = 1;                // through the thickness
  // A band that fills cavities is split at the nominal faces of what it
  // fills (a step wall, the layers of filled pinholes), so that its nodes
  // line up with those of the layers beside the cavity: `levels` are the
  // inner split heights at x0 and x1 (bottom to top), `sub_elements` the
  // elements of each of the levels.size() + 1 sub-bands (summing to elements).
  std::vector<std::array<double, 2>> levels;
  std::vector<int> sub_elements;
};

struct Layout {
  std::vector<double> lines;            // column boundaries, ascending
  std::vector<Column> columns;          // columns[c] spans lines[c]..lines[c+1]
  std::vector<std::vector<Band>> bands; // bands[c][layer]
};

// Assumes validate_stack() passed.
[[nodiscard]] Layout make_layout(const StackDescription& stack);

}  // namespace plystrain::mesh::detail
