// Defects that cannot be built are reported as MeshError naming the defect
// (its index in the case) or the layer.
#include "stack_fixtures.hpp"

#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/stack_mesher.hpp"

#include <catch2/catch.hpp>

using namespace plystrain::mesh;
using namespace plystrain::mesh::testing;

namespace {

MeshError error_of(const StackDescription& stack) {
  try {
    validate_stack(stack);
  } catch (const MeshError& error) {
    return error;
  }
  FAIL("validate_stack accepted an impossible stack");
  return MeshError("unreachable");
}

void require_defect_error(const StackDescription& stack, int index, const std::string& words) {
  const MeshError error = error_of(stack);
  CHECK(error.subject() == MeshError::Subject::defect);
  CHECK(error.index() == index);
  CHECK_THAT(error.what(), Catch::Contains(words));
  // The mesher itself refuses it too, before touching Gmsh.
  CHECK_THROWS_AS(build_stack_mesh(stack), MeshError);
}

}  // namespace

TEST_CASE("defects outside the modelled width", "[stack][errors]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.defects = {pinhole(2, 19.5, 2.0, CavityFill::above, 4)};
  require_defect_error(stack, 4, "beyond the width");
  stack.shape = StackShape::disk;
  require_defect_error(stack, 4, "beyond the width");
  stack = four_layer_stack(StackShape::strip, false);
  stack.defects = {thin_spot(1, -19.0, 3.0, 0.5, 0.0, CavityFill::above, 2)};
  require_defect_error(stack, 2, "beyond x = -width");
}

TEST_CASE("defects across the symmetry plane or the axis", "[stack][errors]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.defects = {pinhole(2, 0.5, 2.0, CavityFill::above, 1), delamination(0, 1.0, 3.0, 2)};
  require_defect_error(stack, 1, "symmetry plane");
  stack.shape = StackShape::disk;
  require_defect_error(stack, 1, "axis");
  stack.defects = {delamination(0, -3.0, 1.0, 5)};
  require_defect_error(stack, 5, ">= 0");
}

TEST_CASE("thin spots that cannot be built", "[stack][errors]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.defects = {thin_spot(1, 5.0, 2.0, 0.5, 1.2, CavityFill::above, 3)};
  require_defect_error(stack, 3, "taper");
  stack.defects = {thin_spot(1, 5.0, 2.0, 1.0, 0.0, CavityFill::above, 3)};
  require_defect_error(stack, 3, "depth");
  stack.defects = {thin_spot(1, 5.0, 2.0, 0.5, 0.0, CavityFill::above, 1),
                   thin_spot(1, 12.0, 2.0, 0.3, 0.0, CavityFill::above, 2)};
  require_defect_error(stack, 2, "share one depth");
}

TEST_CASE("delaminations and overlaps that cannot be built", "[stack][errors]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.defects = {delamination(3, 5.0, 2.0, 1)};
  require_defect_error(stack, 1, "layer above");
  stack.defects = {pinhole(2, 5.0, 2.0, CavityFill::above, 1),
                   thin_spot(2, 6.0, 2.0, 0.5, 0.0, CavityFill::above, 2)};
  require_defect_error(stack, 2, "overlaps defect 1");
  stack.defects = {delamination(0, 5.0, 2.0, 1), delamination(0, 7.0, 2.0, 2)};
  require_defect_error(stack, 2, "overlaps");
  // Different kinds may overlap.
  stack.defects = {delamination(1, 5.0, 2.0, 1), pinhole(1, 5.0, 1.0, CavityFill::above, 2)};
  CHECK_NOTHROW(validate_stack(stack));
}

TEST_CASE("bad layers and sizes", "[stack][errors]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  stack.layers[2].thickness = 0.0;
  const MeshError error = error_of(stack);
  CHECK(error.subject() == MeshError::Subject::layer);
  CHECK(error.index() == 2);
  CHECK_THAT(error.what(), Catch::Contains("active"));
  stack = four_layer_stack(StackShape::strip);
  stack.order = 3;
  CHECK_THROWS_AS(validate_stack(stack), MeshError);
  stack = four_layer_stack(StackShape::strip);
  stack.size_near = 0.0;
  CHECK_THROWS_AS(validate_stack(stack), MeshError);
}
