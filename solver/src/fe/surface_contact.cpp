#include "surface_contact.hpp"

namespace plystrain::solver {

SurfacePlacement placement_at(const SurfaceContact& contact, double load_factor) {
  return {contact.height_scale.at(load_factor), contact.lift.at(load_factor)};
}

SurfacePoint nearest_surface_point(const SurfaceContact& contact, const SurfacePlacement& at,
                                   const Eigen::Vector2d& x) {
  return contact.surface.nearest(x - Eigen::Vector2d(0.0, at.lift), at.height_scale);
}

bool surface_node_forces(const SurfaceContact& contact, const SurfaceContactNode& node,
                         const SurfaceNodeState& state, const SurfacePlacement& at,
                         const Eigen::Vector2d& x, Eigen::Vector2d& force,
                         Eigen::Matrix2d& stiffness) {
  force.setZero();
  stiffness.setZero();
  if (contact.kind == SurfaceContactKind::frictionless) {
    // The touching set follows the iterate: a node carries force exactly
    // where it is inside the surface, so Newton sees the contact front move
    // within one solve instead of converging once per change of the set.
    // The energy k/2 g^2 (g < 0) is rounded over -w < g < 0 so that its
    // slope and curvature are continuous (see contact_energy_slope).
    const SurfacePoint nearest = nearest_surface_point(contact, at, x);
    const double g = nearest.gap;
    if (!(g < 0.0)) {
      return false;
    }
    const ContactEnergySlope slope = contact_energy_slope(g, node.stiffness, node.rounding);
    force = slope.slope * nearest.normal;
    const double bend = nearest.curvature / (1.0 + nearest.curvature * g);
    stiffness = slope.curvature * nearest.normal * nearest.normal.transpose() +
                slope.slope * bend * nearest.tangent * nearest.tangent.transpose();
    return true;
  }
  const bool active = contact.kind == SurfaceContactKind::held_on || state.closed;
  if (!active) {
    return false;
  }
  const double k = node.stiffness;
  if (contact.kind == SurfaceContactKind::bonded) {
    // Energy k/2 |x - P|^2 with P the stuck point carried by the surface.
    const Eigen::Vector2d stuck = contact.surface.point_at(state.stick_parameter, at.height_scale) +
                                  Eigen::Vector2d(0.0, at.lift);
    force = k * (x - stuck);
    stiffness = k * Eigen::Matrix2d::Identity();
    return true;
  }
  // Energy k/2 g^2 with g the signed distance to the surface: dg/dx = n and
  // d2g/dx2 = kappa t t^T / (1 + kappa g) for the closest-point projection.
  const SurfacePoint nearest = nearest_surface_point(contact, at, x);
  const double g = nearest.gap;
  force = k * g * nearest.normal;
  const double bend = nearest.curvature / (1.0 + nearest.curvature * g);
  stiffness = k * (nearest.normal * nearest.normal.transpose() +
                   g * bend * nearest.tangent * nearest.tangent.transpose());
  return true;
}

ContactEnergySlope contact_energy_slope(double gap, double stiffness, double rounding) {
  if (!(gap < 0.0)) {
    return {0.0, 0.0};
  }
  if (gap <= -rounding) {
    return {stiffness * (gap + 0.5 * rounding), stiffness};
  }
  return {-stiffness * gap * gap / (2.0 * rounding), -stiffness * gap / rounding};
}

}  // namespace plystrain::solver
