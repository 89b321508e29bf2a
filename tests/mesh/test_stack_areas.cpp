// Layer areas (strips) and volumes of revolution (disks) of stack meshes
// against the exact geometry of each defect, derived here from the
// definitions in the case format (cavities cut out, fillings added).
#include "stack_fixtures.hpp"

#include "plystrain/mesh/stack_mesher.hpp"

#include <catch2/catch.hpp>

#include <numbers>

using namespace plystrain::mesh;
using namespace plystrain::mesh::testing;

namespace {

constexpr double relative = 1e-9;
constexpr double pi = std::numbers::pi;

void require_areas(const Mesh& mesh, const std::vector<double>& exact) {
  const RegionMeasures m = measure_regions(mesh);
  REQUIRE(m.area.size() == exact.size());
  for (std::size_t l = 0; l < exact.size(); ++l) {
    INFO("layer " << mesh.region_names[l]);
    CHECK(m.area[l] == Approx(exact[l]).epsilon(relative));
  }
}

void require_volumes(const Mesh& mesh, const std::vector<double>& exact) {
  const RegionMeasures m = measure_regions(mesh);
  REQUIRE(m.area.size() == exact.size());
  for (std::size_t l = 0; l < exact.size(); ++l) {
    INFO("layer " << mesh.region_names[l]);
    CHECK(volume(m, static_cast<int>(l)) == Approx(exact[l]).epsilon(relative));
  }
}

// Thicknesses of four_layer_stack().
constexpr double t0 = 10.0, t1 = 0.2, t2 = 0.1, t3 = 2.0, W = 20.0;

}  // namespace

TEST_CASE("defect-free strip: each layer is thickness times width", "[stack]") {
  const Mesh mesh = build_stack_mesh(four_layer_stack(StackShape::strip));
  require_areas(mesh, {t0 * W, t1 * W, t2 * W, t3 * W});
}

TEST_CASE("pinhole on a symmetric strip", "[stack][pinhole]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  SECTION("filled from above: the cap takes the cavity") {
    stack.defects = {pinhole(2, 0.0, 2.0, CavityFill::above)};
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W, t2 * (W - 1.0), t3 * W + t2 * 1.0});
  }
  SECTION("void: the cap bridges it") {
    stack.defects = {pinhole(2, 0.0, 2.0, CavityFill::empty)};
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W, t2 * (W - 1.0), t3 * W});
  }
  SECTION("off the symmetry plane, filled, in the electrode") {
    stack.defects = {pinhole(1, 6.0, 2.0, CavityFill::above)};
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * (W - 2.0), t2 * W + t1 * 2.0, t3 * W});
  }
  SECTION("in the bottom layer, filled down to z = 0") {
    stack.defects = {pinhole(0, 0.0, 4.0, CavityFill::above)};
    require_areas(build_stack_mesh(stack), {t0 * (W - 2.0), t1 * W + t0 * 2.0, t2 * W, t3 * W});
  }
  SECTION("in the top layer: nothing above, it stays open") {
    stack.defects = {pinhole(3, 0.0, 2.0, CavityFill::above)};
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W, t2 * W, t3 * (W - 1.0)});
  }
  SECTION("two stacked pinholes, both filled: the cap fills both") {
    stack.defects = {pinhole(1, 0.0, 2.0, CavityFill::above, 1),
                     pinhole(2, 0.0, 2.0, CavityFill::above, 2)};
    require_areas(build_stack_mesh(stack),
                  {t0 * W, t1 * (W - 1.0), t2 * (W - 1.0), t3 * W + (t1 + t2) * 1.0});
  }
}

TEST_CASE("pinholes on a full-width strip, off centre on both sides", "[stack][pinhole]") {
  StackDescription stack = four_layer_stack(StackShape::strip, false);
  stack.defects = {pinhole(2, -7.0, 2.0, CavityFill::above, 1),
                   pinhole(1, 4.0, 1.0, CavityFill::empty, 2)};
  require_areas(build_stack_mesh(stack),
                {t0 * 2 * W, t1 * (2 * W - 1.0), t2 * (2 * W - 2.0), t3 * 2 * W + t2 * 2.0});
}

TEST_CASE("pinholes on a disk: circular and ring", "[stack][pinhole][disk]") {
  StackDescription stack = four_layer_stack(StackShape::disk);
  SECTION("circular, filled") {
    const double a = 1.5;
    stack.defects = {pinhole(2, 0.0, 2 * a, CavityFill::above)};
    require_volumes(build_stack_mesh(stack), {pi * W * W * t0, pi * W * W * t1,
                                              pi * (W * W - a * a) * t2,
                                              pi * W * W * t3 + pi * a * a * t2});
  }
  SECTION("ring, void") {
    const double r1 = 5.0, r2 = 6.5;
    stack.defects = {pinhole(1, 0.5 * (r1 + r2), r2 - r1, CavityFill::empty)};
    require_volumes(build_stack_mesh(stack), {pi * W * W * t0, pi * (W * W - (r2 * r2 - r1 * r1)) * t1,
                                              pi * W * W * t2, pi * W * W * t3});
  }
}

TEST_CASE("thin spots on strips", "[stack][thin-spot]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  const double depth = 0.5;
  SECTION("tapered, filled from above, centred on the symmetry plane") {
    const double size = 3.0, taper = 0.5;
    stack.defects = {thin_spot(1, 0.0, size, depth, taper, CavityFill::above)};
    // Full trapezoidal recess depth * t * (size - taper); the model holds half.
    const double removed = depth * t1 * (size - taper) / 2.0;
    CHECK(removed == Approx(depth * t1 * recess_integral(-1.5, 1.5, taper, 0.0, false)));
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W - removed, t2 * W + removed, t3 * W});
  }
  SECTION("stepped, void: the active layer bridges it") {
    const double size = 2.0;
    stack.defects = {thin_spot(1, 0.0, size, 0.75, 0.0, CavityFill::empty)};
    const double removed = 0.75 * t1 * size / 2.0;
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W - removed, t2 * W, t3 * W});
  }
  SECTION("stepped, filled, off-centre") {
    const double size = 2.0;
    stack.defects = {thin_spot(2, 8.0, size, 0.4, 0.0, CavityFill::above)};
    const double removed = 0.4 * t2 * size;
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W, t2 * W - removed, t3 * W + removed});
  }
  SECTION("tapered, void, on a full-width strip left of centre") {
    stack.symmetric = false;
    stack.defects = {thin_spot(3, -5.0, 4.0, 0.3, 1.0, CavityFill::empty)};
    const double removed = 0.3 * t3 * (4.0 - 1.0);
    require_areas(build_stack_mesh(stack), {t0 * 2 * W, t1 * 2 * W, t2 * 2 * W, t3 * 2 * W - removed});
  }
}

TEST_CASE("thin spots on disks: volume of revolution", "[stack][thin-spot][disk]") {
  StackDescription stack = four_layer_stack(StackShape::disk);
  SECTION("circular, tapered, filled") {
    const double size = 4.0, taper = 0.8, depth = 0.5;
    stack.defects = {thin_spot(1, 0.0, size, depth, taper, CavityFill::above)};
    // Hand derivation: core disc pi (R - T)^2 plus the conical slope
    // 2 pi int_{R-T}^{R} r (R - r) / T dr, R = size / 2.
    const double R = size / 2.0, T = taper, a = R - T;
    const double slope = (R * (R * R - a * a) / 2.0 - (R * R * R - a * a * a) / 3.0) / T;
    const double removed = depth * t1 * (pi * a * a + 2.0 * pi * slope);
    CHECK(removed == Approx(2 * pi * depth * t1 * recess_integral(-R, R, T, 0.0, true)));
    require_volumes(build_stack_mesh(stack), {pi * W * W * t0, pi * W * W * t1 - removed,
                                              pi * W * W * t2 + removed, pi * W * W * t3});
  }
  SECTION("ring, tapered, void") {
    const double at = 10.0, size = 3.0, taper = 1.0, depth = 0.6;
    stack.defects = {thin_spot(2, at, size, depth, taper, CavityFill::empty)};
    const double removed = 2 * pi * depth * t2 * recess_integral(at - 1.5, at + 1.5, taper, 0.0, true);
    // A symmetric ring profile about r = at removes at * (its strip area) times 2 pi.
    CHECK(removed == Approx(2 * pi * at * depth * t2 * (size - taper)));
    require_volumes(build_stack_mesh(stack), {pi * W * W * t0, pi * W * W * t1,
                                              pi * W * W * t2 - removed, pi * W * W * t3});
  }
}

TEST_CASE("delaminations leave every area unchanged", "[stack][delamination]") {
  StackDescription stack = four_layer_stack(StackShape::disk);
  stack.defects = {delamination(0, 0.0, 8.0)};
  require_volumes(build_stack_mesh(stack),
                  {pi * W * W * t0, pi * W * W * t1, pi * W * W * t2, pi * W * W * t3});
}

TEST_CASE("combined defects", "[stack][combination]") {
  StackDescription stack = four_layer_stack(StackShape::strip);
  SECTION("a thin spot over a debonded patch") {
    stack.defects = {delamination(0, 0.0, 6.0, 1),
                     thin_spot(1, 0.0, 3.0, 0.5, 0.5, CavityFill::above, 2)};
    const double removed = 0.5 * t1 * (3.0 - 0.5) / 2.0;
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W - removed, t2 * W + removed, t3 * W});
  }
  SECTION("a pinhole inside a debonded patch") {
    stack.defects = {delamination(1, 0.0, 6.0, 1), pinhole(2, 0.0, 1.0, CavityFill::above, 2)};
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W, t2 * (W - 0.5), t3 * W + t2 * 0.5});
  }
  SECTION("a pinhole over a stepped thin spot, both filled") {
    stack.defects = {thin_spot(1, 0.0, 4.0, 0.5, 0.0, CavityFill::above, 1),
                     pinhole(2, 0.0, 2.0, CavityFill::above, 2)};
    // The recess (depth 0.1 over 0..2) is filled by the active layer over
    // 1..2 and, through the pinhole, by the cap over 0..1.
    const double recess = 0.5 * t1;
    require_areas(build_stack_mesh(stack), {t0 * W, t1 * W - recess * 2.0,
                                            t2 * (W - 1.0) + recess * 1.0,
                                            t3 * W + t2 * 1.0 + recess * 1.0});
  }
}
