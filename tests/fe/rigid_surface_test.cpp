// Rigid surfaces of revolution: nearest points against the closed forms of
// the circle and the ellipse, the spline profile against the sphere it
// samples, the gap's derivatives against finite differences, and the
// refusal of profiles that are not smooth, single-valued surfaces.
#include "plystrain/solver/rigid_surface.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

using plystrain::solver::RigidSurface;
using plystrain::solver::SurfacePoint;

namespace {

std::vector<std::array<double, 2>> sampled_sphere(double radius, int points, double reach) {
  std::vector<std::array<double, 2>> samples;
  for (int k = 0; k < points; ++k) {
    const double r = reach * k / (points - 1);
    samples.push_back({r, std::sqrt(radius * radius - r * r) - radius});
  }
  return samples;
}

}  // namespace

TEST_CASE("rigid surface: the nearest point of a sphere is along the line to its centre", "[fe][surface]") {
  // Closed form: centre (0, -R); nearest point c + R (x - c)/|x - c|, gap
  // |x - c| - R, curvature 1/R.
  const double R = 3.0;
  const RigidSurface sphere = RigidSurface::ellipse(R, R);
  const Eigen::Vector2d centre(0.0, -R);
  for (const Eigen::Vector2d& x : {Eigen::Vector2d(0.0, 0.2), Eigen::Vector2d(1.0, 0.5), Eigen::Vector2d(2.5, -1.0),
                                  Eigen::Vector2d(0.7, -0.3), Eigen::Vector2d(2.9, -2.95)}) {
    const SurfacePoint p = sphere.nearest(x);
    const Eigen::Vector2d expected = centre + R * (x - centre).normalized();
    CHECK((p.point - expected).norm() < 1e-12 * R);
    CHECK(p.gap == Approx((x - centre).norm() - R).margin(1e-12 * R));
    CHECK(p.curvature == Approx(1.0 / R).epsilon(1e-12));
    CHECK((p.normal - (x - centre).normalized()).norm() < 1e-12);
  }
}

TEST_CASE("rigid surface: an ellipse's nearest point is the global minimum and its curvature the closed form",
          "[fe][surface]") {
  // Curvature of the ellipse r = a sin t, z = c (cos t - 1): c/a^2 at the
  // apex (t = 0) and a/c^2 at the equator (t = pi/2), the textbook values of
  // the curvature at the ends of the semi-axes.
  const double a = 2.0;
  const double c = 0.8;
  const RigidSurface ellipse = RigidSurface::ellipse(a, c);
  CHECK(ellipse.nearest({0.0, 0.3}).curvature == Approx(c / (a * a)).epsilon(1e-12));
  CHECK(ellipse.nearest({a + 0.1, -c}).curvature == Approx(a / (c * c)).epsilon(1e-10));
  for (const Eigen::Vector2d& x : {Eigen::Vector2d(0.4, 0.2), Eigen::Vector2d(1.5, -0.1), Eigen::Vector2d(1.9, -0.6),
                                  Eigen::Vector2d(1.0, -0.25)}) {
    const SurfacePoint p = ellipse.nearest(x);
    double best = 1e300;
    constexpr int samples = 200000;
    for (int k = 0; k <= samples; ++k) {
      best = std::min(best, (ellipse.point_at(std::numbers::pi * k / samples) - x).norm());
    }
    CHECK(std::abs(p.gap) == Approx(best).margin(1e-9));
    CHECK(std::abs((x - p.point).dot(p.tangent)) < 1e-12);
  }
}

TEST_CASE("rigid surface: a profile sampled from a sphere follows the sphere", "[fe][surface]") {
  const double R = 1000.0;
  const RigidSurface profile = RigidSurface::profile(sampled_sphere(R, 41, 600.0));
  const RigidSurface sphere = RigidSurface::ellipse(R, R);
  for (double r = 0.0; r <= 580.0; r += 29.0) {
    CHECK(profile.height_at(r) == Approx(sphere.height_at(r)).margin(1e-5 * R));
    const Eigen::Vector2d above(r, sphere.height_at(r) + 1.0);
    CHECK(profile.nearest(above).curvature == Approx(1.0 / R).epsilon(0.02));
    CHECK(profile.nearest(above).gap == Approx(sphere.nearest(above).gap).margin(1e-6 * R));
  }
}

TEST_CASE("rigid surface: the gap's gradient is the normal and its Hessian k t t^T / (1 + k g)", "[fe][surface]") {
  // Central differences of the gap over the position (common practice).
  const RigidSurface ellipse = RigidSurface::ellipse(2.0, 1.2);
  const RigidSurface profile = RigidSurface::profile(sampled_sphere(5.0, 21, 3.0));
  for (const RigidSurface* surface : {&ellipse, &profile}) {
    for (const Eigen::Vector2d& x : {Eigen::Vector2d(0.5, 0.05), Eigen::Vector2d(1.3, -0.5), Eigen::Vector2d(0.9, -0.4)}) {
      const SurfacePoint p = surface->nearest(x, 0.7);
      const double h = 1e-5;
      Eigen::Vector2d gradient;
      Eigen::Matrix2d hessian;
      for (int j = 0; j < 2; ++j) {
        Eigen::Vector2d plus = x, minus = x;
        plus(j) += h;
        minus(j) -= h;
        const SurfacePoint pp = surface->nearest(plus, 0.7);
        const SurfacePoint pm = surface->nearest(minus, 0.7);
        gradient(j) = (pp.gap - pm.gap) / (2 * h);
        hessian.col(j) = (pp.normal - pm.normal) / (2 * h);
      }
      CHECK((gradient - p.normal).norm() < 1e-8);
      const Eigen::Matrix2d expected =
          p.curvature / (1.0 + p.curvature * p.gap) * p.tangent * p.tangent.transpose();
      CHECK((hessian - expected).norm() < 1e-6 * (1.0 + expected.norm()));
    }
  }
}

TEST_CASE("rigid surface: flattening scales the heights", "[fe][surface]") {
  const RigidSurface sphere = RigidSurface::ellipse(10.0, 10.0);
  CHECK(sphere.height_at(6.0, 0.25) == Approx(0.25 * sphere.height_at(6.0)).epsilon(1e-14));
  const SurfacePoint flat = sphere.nearest({4.0, 0.3}, 0.0);
  CHECK(flat.gap == Approx(0.3));
  CHECK(flat.curvature == 0.0);
}

TEST_CASE("rigid surface: profiles that are not smooth single-valued surfaces are refused", "[fe][surface]") {
  using Points = std::vector<std::array<double, 2>>;
  CHECK_FALSE(RigidSurface::profile_problem(sampled_sphere(10.0, 12, 9.0)));
  const auto problem = [](const Points& points) { return RigidSurface::profile_problem(points).value_or(""); };
  CHECK_THAT(problem({{0.0, 0.0}}), Catch::Contains("at least two"));
  CHECK_THAT(problem({{1.0, 0.0}, {2.0, -1.0}}), Catch::Contains("on the axis"));
  CHECK_THAT(problem({{0.0, 0.0}, {2.0, -1.0}, {1.5, -2.0}}), Catch::Contains("expected r to increase"));
  CHECK_THAT(problem({{0.0, 0.0}, {2.0, -1.0}, {3.0, -0.5}}), Catch::Contains("not to increase"));
  CHECK_THAT(problem({{0.0, 0.0}, {1.0, 0.0}, {2.0, 0.0}, {3.0, -1.0}, {4.0, -2.0}}), Catch::Contains("kink of 45"));
  // Gentle turns, but a long flat run after a drop makes the spline
  // overshoot upwards between the points.
  CHECK_THAT(problem({{0.0, 0.0}, {1.0, -0.05}, {2.0, -0.4}, {3.0, -0.85}, {4.0, -1.1}, {5.0, -1.15}, {6.0, -1.15}, {7.0, -1.15}}),
             Catch::Contains("rising between points"));
  CHECK_THROWS_AS(RigidSurface::profile({{0.0, 0.0}, {1.0, 0.5}}), std::invalid_argument);
  CHECK_THROWS_AS(RigidSurface::ellipse(1.0, 0.0), std::invalid_argument);
}
