#include "plystrain/solver/rigid_surface.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <sstream>
#include <stdexcept>

namespace plystrain::solver {

namespace {

std::string number(double value) {
  std::ostringstream text;
  text << value;
  return text.str();
}

// Second derivatives of the cubic spline through (r, z), with zero slope at
// the apex (the surface of revolution is smooth on its axis) and, at the last
// point, the slope of the parabola through the last three points (a natural
// end, with no curvature, would bend the meridian wrongly over the last
// interval of a curved mould). Beyond the last point the meridian continues
// straight with that slope.
std::vector<double> spline_second_derivatives(const std::vector<double>& r, const std::vector<double>& z) {
  const std::size_t n = r.size();
  std::vector<double> diagonal(n, 0.0), upper(n, 0.0), lower(n, 0.0), rhs(n, 0.0);
  const double h0 = r[1] - r[0];
  diagonal[0] = 2.0 * h0;
  upper[0] = h0;
  rhs[0] = 6.0 * (z[1] - z[0]) / h0;
  for (std::size_t i = 1; i + 1 < n; ++i) {
    const double left = r[i] - r[i - 1];
    const double right = r[i + 1] - r[i];
    lower[i] = left;
    diagonal[i] = 2.0 * (left + right);
    upper[i] = right;
    rhs[i] = 6.0 * ((z[i + 1] - z[i]) / right - (z[i] - z[i - 1]) / left);
  }
  const double last = r[n - 1] - r[n - 2];
  double end_slope = (z[n - 1] - z[n - 2]) / last;
  if (n >= 3) {
    const double before = r[n - 2] - r[n - 3];
    const double slope_before = (z[n - 2] - z[n - 3]) / before;
    // Derivative at the last point of the parabola through the last three.
    end_slope += (end_slope - slope_before) * last / (last + before);
  }
  lower[n - 1] = last;
  diagonal[n - 1] = 2.0 * last;
  rhs[n - 1] = 6.0 * (end_slope - (z[n - 1] - z[n - 2]) / last);
  // Thomas algorithm: the system is diagonally dominant.
  for (std::size_t i = 1; i < n; ++i) {
    const double factor = lower[i] / diagonal[i - 1];
    diagonal[i] -= factor * upper[i - 1];
    rhs[i] -= factor * rhs[i - 1];
  }
  std::vector<double> second(n, 0.0);
  second[n - 1] = rhs[n - 1] / diagonal[n - 1];
  for (std::size_t i = n - 1; i-- > 0;) {
    second[i] = (rhs[i] - upper[i] * second[i + 1]) / diagonal[i];
  }
  return second;
}

struct SplineValue {
  double z = 0.0, dz = 0.0, ddz = 0.0;
};

SplineValue spline_at(const std::vector<double>& r, const std::vector<double>& z, const std::vector<double>& m,
                      double at) {
  // Even in r: the meridian continued through the axis.
  const double x = std::abs(at);
  const double sign = at < 0.0 ? -1.0 : 1.0;
  const std::size_t n = r.size();
  if (x >= r[n - 1]) {
    const double h = r[n - 1] - r[n - 2];
    const double end_slope = (z[n - 1] - z[n - 2]) / h + h * (2.0 * m[n - 1] + m[n - 2]) / 6.0;
    return {z[n - 1] + end_slope * (x - r[n - 1]), sign * end_slope, 0.0};
  }
  const std::size_t i =
      static_cast<std::size_t>(std::upper_bound(r.begin(), r.end(), x) - r.begin()) - 1;
  const double h = r[i + 1] - r[i];
  const double b = x - r[i];
  const double a = r[i + 1] - x;
  SplineValue v;
  v.z = m[i] * a * a * a / (6.0 * h) + m[i + 1] * b * b * b / (6.0 * h) + (z[i] / h - m[i] * h / 6.0) * a +
        (z[i + 1] / h - m[i + 1] * h / 6.0) * b;
  v.dz = sign * (-m[i] * a * a / (2.0 * h) + m[i + 1] * b * b / (2.0 * h) + (z[i + 1] - z[i]) / h -
                 (m[i + 1] - m[i]) * h / 6.0);
  v.ddz = (m[i] * a + m[i + 1] * b) / h;
  return v;
}

}  // namespace

RigidSurface RigidSurface::ellipse(double in_plane_semi_axis, double height_semi_axis) {
  if (!(in_plane_semi_axis > 0.0) || !(height_semi_axis > 0.0)) {
    throw std::invalid_argument("rigid surface: the semi-axes must be positive, found " +
                                number(in_plane_semi_axis) + " and " + number(height_semi_axis));
  }
  RigidSurface surface;
  surface.kind_ = Kind::ellipse;
  surface.a_ = in_plane_semi_axis;
  surface.c_ = height_semi_axis;
  return surface;
}

std::optional<std::string> RigidSurface::profile_problem(const std::vector<std::array<double, 2>>& points) {
  if (points.size() < 2) {
    return "expected at least two [r, z] points, found " + std::to_string(points.size());
  }
  if (points.front()[0] != 0.0) {
    return "expected the first point on the axis (r = 0), found r = " + number(points.front()[0]);
  }
  for (std::size_t k = 1; k < points.size(); ++k) {
    if (!(points[k][0] > points[k - 1][0])) {
      return "expected r to increase (a surface with one height per radius), found point " +
             std::to_string(k + 1) + " at r = " + number(points[k][0]) + " after r = " + number(points[k - 1][0]);
    }
    if (points[k][1] > points[k - 1][1]) {
      return "expected z not to increase away from the apex, found point " + std::to_string(k + 1) +
             " at z = " + number(points[k][1]) + " above z = " + number(points[k - 1][1]);
    }
  }
  // A corner would put a point load into the device that a smooth mould
  // does not have, and the nearest-point projection is not unique behind it.
  // 30 degrees between successive segments is far more than a smooth shape
  // sampled at a sensible density turns (a hemisphere in 10 points turns 9).
  constexpr double largest_turn_degrees = 30.0;
  for (std::size_t k = 1; k + 1 < points.size(); ++k) {
    const double before = std::atan2(points[k][1] - points[k - 1][1], points[k][0] - points[k - 1][0]);
    const double after = std::atan2(points[k + 1][1] - points[k][1], points[k + 1][0] - points[k][0]);
    const double turn = std::abs(after - before) * 180.0 / std::numbers::pi;
    if (turn > largest_turn_degrees) {
      return "expected a smooth profile, found a kink of " + number(std::round(turn)) + " degrees at point " +
             std::to_string(k + 1) + " (r = " + number(points[k][0]) +
             "): round the corner with more points (at most 30 degrees between successive segments)";
    }
  }
  // The interpolation itself must not rise where the points do not.
  std::vector<double> r, z;
  for (const auto& point : points) {
    r.push_back(point[0]);
    z.push_back(point[1]);
  }
  const std::vector<double> m = spline_second_derivatives(r, z);
  const double scale = std::max(r.back(), std::abs(z.back() - z.front()));
  for (std::size_t k = 0; k + 1 < r.size(); ++k) {
    constexpr int samples = 16;
    for (int s = 1; s < samples; ++s) {
      const double at = r[k] + (r[k + 1] - r[k]) * s / samples;
      if (spline_at(r, z, m, at).dz > 1e-9 * scale / std::max(r.back(), 1e-300)) {
        return "expected a smooth interpolation that does not rise, found it rising between points " +
               std::to_string(k + 1) + " and " + std::to_string(k + 2) + " (r = " + number(r[k]) + " to " +
               number(r[k + 1]) + "): add points there";
      }
    }
  }
  return std::nullopt;
}

RigidSurface RigidSurface::profile(const std::vector<std::array<double, 2>>& points) {
  if (const std::optional<std::string> problem = profile_problem(points)) {
    throw std::invalid_argument("rigid surface profile: " + *problem);
  }
  RigidSurface surface;
  surface.kind_ = Kind::profile;
  // Heights relative to the apex: the surface's frame has the apex at the origin.
  for (const auto& point : points) {
    surface.r_.push_back(point[0]);
    surface.z_.push_back(point[1] - points.front()[1]);
  }
  surface.second_ = spline_second_derivatives(surface.r_, surface.z_);
  return surface;
}

double RigidSurface::reach() const { return kind_ == Kind::ellipse ? a_ : r_.back(); }

RigidSurface::Derivatives RigidSurface::meridian(double parameter, double height_scale) const {
  Derivatives d;
  if (kind_ == Kind::ellipse) {
    const double c = height_scale * c_;
    const double s = std::sin(parameter);
    const double k = std::cos(parameter);
    d.p = {a_ * s, c * (k - 1.0)};
    d.dp = {a_ * k, -c * s};
    d.ddp = {-a_ * s, -c * k};
    return d;
  }
  const SplineValue v = spline_at(r_, z_, second_, parameter);
  d.p = {parameter, height_scale * v.z};
  d.dp = {1.0, height_scale * v.dz};
  d.ddp = {0.0, height_scale * v.ddz};
  return d;
}

Eigen::Vector2d RigidSurface::point_at(double parameter, double height_scale) const {
  return meridian(parameter, height_scale).p;
}

double RigidSurface::height_at(double r, double height_scale) const {
  if (kind_ == Kind::ellipse) {
    const double ratio = std::min(std::abs(r) / a_, 1.0);
    return height_scale * c_ * (std::sqrt(1.0 - ratio * ratio) - 1.0);
  }
  return height_scale * spline_at(r_, z_, second_, r).z;
}

double RigidSurface::initial_parameter(const Eigen::Vector2d& x, double height_scale) const {
  if (kind_ == Kind::profile) {
    return x.x();
  }
  // The angle in the coordinates that turn the ellipse into a unit circle
  // about its centre (0, -c): exact for a sphere, close for an ellipse.
  const double c = height_scale * c_;
  if (c <= 0.0) {
    return std::asin(std::clamp(x.x() / a_, -1.0, 1.0));
  }
  return std::atan2(x.x() / a_, (x.y() + c) / c);
}

SurfacePoint RigidSurface::nearest(const Eigen::Vector2d& x, double height_scale) const {
  // A negative height scale (a load factor just below zero, as a
  // difference quotient in the load factor asks for) turns the dome into a
  // shallow bowl: still a smooth meridian.
  SurfacePoint result;
  double t = 0.0;
  if (height_scale == 0.0) {
    // Flat: the plane z = 0, met straight below.
    t = kind_ == Kind::ellipse ? std::asin(std::clamp(x.x() / a_, -1.0, 1.0)) : x.x();
    result.parameter = t;
    result.point = {x.x(), 0.0};
    result.normal = Eigen::Vector2d::UnitY();
    result.tangent = Eigen::Vector2d::UnitX();
    result.curvature = 0.0;
    result.gap = x.y();
    return result;
  }
  // Newton on d/dt |p(t) - x|^2 / 2 = (p - x) . p' = 0, with halving while
  // the distance grows (the second derivative can be negative far from the
  // meridian, where the nearest point is on the other side of a centre of
  // curvature).
  t = initial_parameter(x, height_scale);
  const auto distance2 = [&](double at) { return (meridian(at, height_scale).p - x).squaredNorm(); };
  const double length_scale =
      kind_ == Kind::ellipse ? std::max(a_, std::abs(height_scale) * c_) : std::max(r_.back(), 1.0);
  for (int iteration = 0; iteration < 60; ++iteration) {
    const Derivatives d = meridian(t, height_scale);
    const Eigen::Vector2d offset = d.p - x;
    const double slope = offset.dot(d.dp);
    const double second = d.dp.squaredNorm() + offset.dot(d.ddp);
    if (std::abs(slope) <= 1e-15 * d.dp.squaredNorm() * length_scale) {
      break;
    }
    double step = second > 0.0 ? -slope / second : -std::copysign(0.1 * length_scale / d.dp.norm(), slope);
    const double before = offset.squaredNorm();
    for (int halving = 0; halving < 40 && distance2(t + step) > before * (1.0 + 1e-14); ++halving) {
      step *= 0.5;
    }
    t += step;
    if (std::abs(step) <= 1e-15 * (1.0 + std::abs(t))) {
      break;
    }
  }
  const Derivatives d = meridian(t, height_scale);
  const double speed = d.dp.norm();
  result.parameter = t;
  result.point = d.p;
  result.tangent = d.dp / speed;
  result.normal = {-result.tangent.y(), result.tangent.x()};
  result.curvature = -(d.dp.x() * d.ddp.y() - d.dp.y() * d.ddp.x()) / (speed * speed * speed);
  result.gap = (x - d.p).dot(result.normal);
  return result;
}

}  // namespace plystrain::solver
