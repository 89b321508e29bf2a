// A rigid target surface of revolution for conform analyses, described by
// its meridian in the (r, z) plane with the apex at the origin and the
// surface falling away from it: a sphere or an ellipsoid (an elliptic
// meridian), or a profile through given points (a cubic spline, clamped
// level at the apex).
//
// Contact needs, for a point x, the nearest point of the meridian, the signed
// gap along the outward normal and the curvature there: with a closest-point
// projection the gap's gradient is the unit normal n and its second
// derivative is k t t^T / (1 + k g) (t the unit tangent, k the curvature,
// positive for a convex dome), which gives a consistent contact tangent.
//
// The meridian can be flattened in height by a factor s in (0, 1]: z -> s z.
// Wrap analyses grow s from ~0 to 1, so the device is laid onto ever more
// strongly curved versions of the same surface (continuation from flat).
#pragma once

#include <Eigen/Core>

#include <array>
#include <optional>
#include <string>
#include <vector>

namespace plystrain::solver {

struct SurfacePoint {
  double parameter = 0.0;  // meridian parameter: the angle for an ellipse, r for a profile
  Eigen::Vector2d point = Eigen::Vector2d::Zero();
  Eigen::Vector2d normal = Eigen::Vector2d::UnitY();   // unit, out of the solid surface
  Eigen::Vector2d tangent = Eigen::Vector2d::UnitX();  // unit, away from the apex
  double curvature = 0.0;  // of the meridian, positive where it bends away from the normal
  double gap = 0.0;        // (x - point) . normal: negative when x is inside the surface
};

class RigidSurface {
 public:
  // An elliptic meridian r = a sin(t), z = c (cos(t) - 1); a sphere of radius R
  // is a = c = R. Throws std::invalid_argument unless both are positive.
  static RigidSurface ellipse(double in_plane_semi_axis, double height_semi_axis);

  // A profile through `points` ([r, z], r increasing from 0, z not
  // increasing). Throws std::invalid_argument with profile_problem()'s text.
  static RigidSurface profile(const std::vector<std::array<double, 2>>& points);

  // Why points cannot make a profile surface (fewer than two points, the first
  // not on the axis, r not increasing, z rising, a kink, or an interpolation
  // that rises between points), or nothing when they can.
  [[nodiscard]] static std::optional<std::string> profile_problem(
      const std::vector<std::array<double, 2>>& points);

  // The nearest point of the meridian, flattened by height_scale, to x (both
  // in the surface's frame: apex at the origin).
  [[nodiscard]] SurfacePoint nearest(const Eigen::Vector2d& x, double height_scale = 1.0) const;

  // The meridian point at a parameter (flattened by height_scale).
  [[nodiscard]] Eigen::Vector2d point_at(double parameter, double height_scale = 1.0) const;

  // z of the meridian at radius r (flattened by height_scale); r beyond the
  // surface's reach continues the meridian smoothly (ellipse: not defined
  // past the equator, where it returns the equator's height).
  [[nodiscard]] double height_at(double r, double height_scale = 1.0) const;

  // The largest r the surface covers (the equator, or the last profile point).
  [[nodiscard]] double reach() const;

 private:
  enum class Kind { ellipse, profile };
  struct Derivatives {
    Eigen::Vector2d p, dp, ddp;
  };
  [[nodiscard]] Derivatives meridian(double parameter, double height_scale) const;
  [[nodiscard]] double initial_parameter(const Eigen::Vector2d& x, double height_scale) const;

  Kind kind_ = Kind::ellipse;
  double a_ = 1.0;  // ellipse semi-axes
  double c_ = 1.0;
  // Profile: knots and the spline's second derivatives at them.
  std::vector<double> r_;
  std::vector<double> z_;
  std::vector<double> second_;
};

}  // namespace plystrain::solver
