// Thin neo-Hookean spherical balloon inflated past its pressure maximum.
//
// Reference (published): Ogden, Non-linear Elastic Deformations, 1984, the
// inflation of a thin spherical membrane of an incompressible neo-Hookean
// solid: p R / (mu H) = 2 (lambda^-1 - lambda^-7), with R and H the
// undeformed mid-surface radius and thickness and lambda the mid-surface
// stretch; the pressure is largest at lambda = 7^(1/6) = 1.3831, where
// p R / (mu H) = 1.2395. The membrane formula differs from the exact thick
// solution by about 2e-5 relative at H/R = 0.02 when lambda is taken as
// (a + b) / (A + B) (evaluated from the thick-sphere closed form of the same
// book; derived).
#include "nonlinear/inflation_support.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>

namespace {

double membrane_pressure(double stretch) {  // p R / (mu H)
  return 2.0 * (1.0 / stretch - std::pow(stretch, -7.0));
}

}  // namespace

TEST_CASE("thin neo-Hookean balloon follows Ogden's curve past the pressure maximum",
          "[verification][balloon]") {
  plystrain::test::InflationSpec spec;
  spec.inner_radius = 0.99;
  spec.outer_radius = 1.01;
  spec.cells_radial = 2;
  spec.cells_angular = 6;
  const double mid_radius = 1.0;
  const double thickness = 0.02;
  // Load factor 1 is the theoretical maximum pressure.
  const double peak = membrane_pressure(std::pow(7.0, 1.0 / 6.0));
  spec.reference_pressure = peak * spec.shear_modulus * thickness / mid_radius;
  spec.stop_inner_stretch = 1.7;
  spec.steps = 10;
  spec.max_increment = 0.1;
  const plystrain::test::InflationRun run = plystrain::test::inflate_sphere(spec);
  INFO(run.path.reason);
  REQUIRE(run.path.status == plystrain::nonlinear::PathStatus::stopped_by_caller);
  REQUIRE(run.points.size() > 10);

  double worst = 0.0;
  size_t peak_index = 0;
  for (size_t i = 0; i < run.points.size(); ++i) {
    const auto& point = run.points[i];
    const double stretch = (spec.inner_radius * point.inner_stretch + spec.outer_radius * point.outer_stretch) /
                           (spec.inner_radius + spec.outer_radius);
    const double computed = point.pressure * mid_radius / (spec.shear_modulus * thickness);
    worst = std::max(worst, std::abs(computed - membrane_pressure(stretch)) / peak);
    if (point.pressure > run.points[peak_index].pressure) {
      peak_index = i;
    }
  }
  // Within 0.1 % of the peak pressure all along the path (verification.md
  // asks 0.5 %; compressibility 3 mu / kappa = 3e-4, membrane error 2e-5,
  // discretisation the rest).
  CHECK(worst < 1e-3);
  // The path went past the maximum: the pressure fell afterwards.
  REQUIRE(peak_index > 0);
  REQUIRE(peak_index + 1 < run.points.size());
  CHECK(run.points.back().pressure < 0.95 * run.points[peak_index].pressure);
  CHECK(run.points[peak_index].pressure / spec.reference_pressure == Approx(1.0).epsilon(1e-3));
  // Location of the maximum from a parabola through the three increments
  // around the largest sampled pressure.
  auto mid_stretch = [&](size_t i) {
    const auto& point = run.points[i];
    return (spec.inner_radius * point.inner_stretch + spec.outer_radius * point.outer_stretch) /
           (spec.inner_radius + spec.outer_radius);
  };
  const double x0 = mid_stretch(peak_index - 1), x1 = mid_stretch(peak_index), x2 = mid_stretch(peak_index + 1);
  const double y0 = run.points[peak_index - 1].pressure, y1 = run.points[peak_index].pressure,
               y2 = run.points[peak_index + 1].pressure;
  const double numerator = (x1 - x0) * (x1 - x0) * (y1 - y2) - (x1 - x2) * (x1 - x2) * (y1 - y0);
  const double denominator = (x1 - x0) * (y1 - y2) - (x1 - x2) * (y1 - y0);
  const double peak_stretch = x1 - 0.5 * numerator / denominator;
  CHECK(peak_stretch == Approx(std::pow(7.0, 1.0 / 6.0)).epsilon(2e-3));
}
