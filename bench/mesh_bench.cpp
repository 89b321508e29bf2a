// Meshing benchmark: a 1 mm wide strip (full width, no symmetry plane) of
// four layers down to 100 nm with a 2 um pinhole through the active layer,
// meshed with the case-format default sizes (size_near = thinnest / 2,
// size_far = width / 40, grade_over = 10 size_far), quadratic cells.
// Prints wall times and counts; the target is under 5 s and under 200k nodes.
#include "plystrain/mesh/gmsh_session.hpp"
#include "plystrain/mesh/quality.hpp"
#include "plystrain/mesh/stack_mesher.hpp"

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <vector>

using namespace plystrain::mesh;

int main() {
  StackDescription stack;
  stack.shape = StackShape::strip;
  stack.symmetric = false;
  stack.width = 500.0;  // half of 1 mm
  stack.layers = {{"substrate", 100.0, 3}, {"electrode", 0.1, 3}, {"active", 0.1, 3},
                  {"encapsulant", 10.0, 3}};
  StackDefect hole;
  hole.kind = DefectKind::pinhole;
  hole.layer = 2;
  hole.at = 0.0;
  hole.size = 2.0;
  hole.fill = CavityFill::above;
  hole.case_index = 1;
  stack.defects = {hole};
  stack.size_near = 0.05;
  stack.size_far = stack.width / 40.0;
  stack.grade_over = 10.0 * stack.size_far;
  stack.order = 2;

  std::vector<double> seconds;
  Mesh mesh;
  for (int run = 0; run < 5; ++run) {
    const auto start = std::chrono::steady_clock::now();
    mesh = build_stack_mesh(stack);
    const auto end = std::chrono::steady_clock::now();
    seconds.push_back(std::chrono::duration<double>(end - start).count());
  }
  std::sort(seconds.begin(), seconds.end());
  const MeshQuality quality = measure_quality(mesh);
  std::printf("mesh_bench: 1 mm strip, 4 layers (100 um / 100 nm / 100 nm / 10 um), 2 um pinhole\n");
  std::printf("  nodes %d, cells %d (9-node quads)\n", mesh.node_count(), mesh.cell_count());
  std::printf("  build_stack_mesh wall time over 5 runs: best %.3f s, median %.3f s, worst %.3f s\n",
              seconds.front(), seconds[2], seconds.back());
  for (const LayerQuality& layer : quality.layers) {
    std::printf("  %-12s cells %6d  min scaled Jacobian %.4f  max aspect ratio %.1f\n",
                layer.layer.c_str(), layer.cells, layer.min_scaled_jacobian,
                layer.max_aspect_ratio);
  }
  const bool ok = seconds[2] < 5.0 && mesh.node_count() < 200000;
  std::printf("  target (< 5 s, < 200k nodes): %s\n", ok ? "met" : "MISSED");
  return ok ? 0 : 1;
}
