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
                         Eigen::Matrix2d& stiffness, FrictionlessTouch touch) {
  force.setZero();
  stiffness.setZero();
  // A frictionless node carries a force exactly while it penetrates, decided
  // afresh at every evaluation: the energy k/2 min(g, 0)^2 is continuously
  // differentiable, so Newton settles the touching set together with the
  // displacements instead of restarting once per change of the set.
  const bool frictionless = contact.kind == SurfaceContactKind::frictionless;
  const bool active = contact.kind == SurfaceContactKind::held_on || state.closed ||
                      (frictionless && touch != FrictionlessTouch::held_open);
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
  if (frictionless && touch == FrictionlessTouch::by_gap && g >= 0.0) {
    return false;
  }
  force = k * g * nearest.normal;
  const double bend = nearest.curvature / (1.0 + nearest.curvature * g);
  stiffness = k * (nearest.normal * nearest.normal.transpose() + g * bend * nearest.tangent * nearest.tangent.transpose());
  return true;
}

}  // namespace plystrain::solver
