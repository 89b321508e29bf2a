// Node-to-surface penalty contact of a face with a rigid surface of
// revolution (see SurfaceContact in model.hpp). Internal to the solver library.
#pragma once

#include "plystrain/solver/model.hpp"
#include "plystrain/solver/rigid_surface.hpp"

#include <Eigen/Core>

namespace plystrain::solver {

struct SurfaceContactNode {
  int node = -1;
  int contact = 0;         // index into the definition's surface_contacts
  double stiffness = 0.0;  // k w: force per unit penetration
  double area = 0.0;       // w: the node's share of the face
  double spacing = 0.0;    // length of the longest face edge it lies on
};

// Where the surface is at a load factor.
struct SurfacePlacement {
  double height_scale = 1.0;
  double lift = 0.0;
};

[[nodiscard]] SurfacePlacement placement_at(const SurfaceContact& contact, double load_factor);

// The nearest surface point to the current position x of a node.
[[nodiscard]] SurfacePoint nearest_surface_point(const SurfaceContact& contact, const SurfacePlacement& at,
                                                 const Eigen::Vector2d& x);

// The state of one node within a Newton solve: closed or not, and for a
// bonded node the meridian parameter of the point it sticks to.
struct SurfaceNodeState {
  bool closed = false;
  double stick_parameter = 0.0;
};

// Whether a frictionless node touches: decided by its gap at the point of
// evaluation, or held as it was at another point (a derivative with respect
// to the load factor must not see nodes flip within its difference step).
enum class FrictionlessTouch : signed char { by_gap, held_open, held_closed };

// Force (2) and tangent (2 x 2) on a node at current position x. Returns
// false (and zeros) when the node carries nothing.
bool surface_node_forces(const SurfaceContact& contact, const SurfaceContactNode& node, const SurfaceNodeState& state,
                         const SurfacePlacement& at, const Eigen::Vector2d& x, Eigen::Vector2d& force,
                         Eigen::Matrix2d& stiffness, FrictionlessTouch touch = FrictionlessTouch::by_gap);

}  // namespace plystrain::solver
