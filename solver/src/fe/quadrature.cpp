#include "plystrain/solver/quadrature.hpp"

#include <array>
#include <cmath>

namespace plystrain::solver {
namespace {

constexpr double gauss2 = 0.57735026918962576451;  // 1/sqrt(3)
constexpr double gauss3 = 0.77459666924148337704;  // sqrt(3/5)
constexpr double w3_outer = 5.0 / 9.0;
constexpr double w3_centre = 8.0 / 9.0;

// Interior 3-point rule, degree 2 (Strang & Fix, An Analysis of the Finite
// Element Method, 1973, Table 4.1). Weights sum to the area 1/2.
const std::array<QuadraturePoint, 3> tri3_rule = {{
    {{1.0 / 6.0, 1.0 / 6.0}, 1.0 / 6.0},
    {{2.0 / 3.0, 1.0 / 6.0}, 1.0 / 6.0},
    {{1.0 / 6.0, 2.0 / 3.0}, 1.0 / 6.0},
}};

// 6-point rule, degree 4 (Dunavant, IJNME 21, 1129, 1985; Strang & Fix 1973).
constexpr double a1 = 0.445948490915965, w1 = 0.223381589678011 / 2.0;
constexpr double a2 = 0.091576213509771, w2 = 0.109951743655322 / 2.0;
const std::array<QuadraturePoint, 6> tri6_rule = {{
    {{a1, a1}, w1},
    {{1.0 - 2.0 * a1, a1}, w1},
    {{a1, 1.0 - 2.0 * a1}, w1},
    {{a2, a2}, w2},
    {{1.0 - 2.0 * a2, a2}, w2},
    {{a2, 1.0 - 2.0 * a2}, w2},
}};

const std::array<QuadraturePoint, 4> quad2x2_rule = {{
    {{-gauss2, -gauss2}, 1.0},
    {{gauss2, -gauss2}, 1.0},
    {{gauss2, gauss2}, 1.0},
    {{-gauss2, gauss2}, 1.0},
}};

std::array<QuadraturePoint, 9> make_quad3x3() {
  const std::array<double, 3> x = {-gauss3, 0.0, gauss3};
  const std::array<double, 3> w = {w3_outer, w3_centre, w3_outer};
  std::array<QuadraturePoint, 9> rule{};
  for (int j = 0; j < 3; ++j) {
    for (int i = 0; i < 3; ++i) {
      rule[static_cast<std::size_t>(3 * j + i)] = {{x[static_cast<std::size_t>(i)], x[static_cast<std::size_t>(j)]},
                                                   w[static_cast<std::size_t>(i)] * w[static_cast<std::size_t>(j)]};
    }
  }
  return rule;
}
const std::array<QuadraturePoint, 9> quad3x3_rule = make_quad3x3();

const std::array<LinePoint, 2> line2_rule = {{{-gauss2, 1.0}, {gauss2, 1.0}}};
const std::array<LinePoint, 3> line3_rule = {{{-gauss3, w3_outer}, {0.0, w3_centre}, {gauss3, w3_outer}}};

}  // namespace

std::span<const QuadraturePoint> cell_rule(mesh::CellType type) {
  switch (type) {
    case mesh::CellType::tri3: return tri3_rule;
    case mesh::CellType::tri6: return tri6_rule;
    case mesh::CellType::quad4: return quad2x2_rule;
    case mesh::CellType::quad8:
    case mesh::CellType::quad9: return quad3x3_rule;
  }
  return {};
}

std::span<const LinePoint> line_rule(int node_count) {
  if (node_count == 3) {
    return line3_rule;
  }
  return line2_rule;
}

}  // namespace plystrain::solver
