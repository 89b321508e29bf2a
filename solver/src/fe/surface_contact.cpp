#include "surface_contact.hpp"

namespace plystrain::solver {

SurfacePlacement placement_at(const SurfaceContact& contact, double load_factor) {
  return {contact.height_scale.at(load_factor), contact.lift.at(load_factor)};
}

SurfacePoint nearest_surface_point(const SurfaceContact& contact, const SurfacePlacement& at,
                                   const Eigen::Vector2d& x) {
  return contact.surface.nearest(x - Eigen::Vector2d(0.0, at.lift), at.height_scale);
}

bool surface_node_forces(const SurfaceContact& contact, const SurfaceContactNode& node, const SurfaceNodeState& state,
                         const SurfacePlacement& at, const Eigen::Vector2d& x, Eigen::Vector2d& force,
                         Eigen::Matrix2d& stiffness) {
  force.setZero();
  stiffness.setZero();
  const bool active = contact.kind == SurfaceContactKind::held_on || state.closed;
  if (!active) {
    return false;
  }
  const double k = node.stiffness;
  if (contact.kind == SurfaceContactKind::bonded) {
    // Energy k/2 |x - P|^2 with P the stuck point carried by the surface.
    const Eigen::Vector2d stuck =
        contact.surface.point_at(state.stick_parameter, at.height_scale) + Eigen::Vector2d(0.0, at.lift);
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
  stiffness = k * (nearest.normal * nearest.normal.transpose() + g * bend * nearest.tangent * nearest.tangent.transpose());
  return true;
}

}  // namespace plystrain::solver
