// Contact of a face with a rigid surface: the model's tangent against
// finite differences for every kind of contact, and a block squeezed by a
// flat surface against the homogeneous solution of its law.
#include "fe/support.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using namespace plystrain;

namespace {

mesh::Mesh disk_section() {
  mesh::LayeredRectangleSpec spec;
  spec.width = 2.0;
  spec.cells_along = 4;
  spec.layers = {{"disk", 0.4, 2, 1.0}};
  return mesh::layered_rectangle(spec);
}

solver::ModelDefinition on_surface(solver::SurfaceContactKind kind) {
  solver::ModelDefinition def;
  def.kinematics = solver::Kinematics::axisymmetric;
  def.regions = {{test::neo_hookean_from_young(1.0, 0.3), solver::LockingCure::off}};
  solver::SurfaceContact contact;
  contact.edge_set = "bottom";
  contact.surface = solver::RigidSurface::ellipse(3.0, 2.0);
  contact.kind = kind;
  contact.height_scale.value = 0.6;  // 0.6 lambda
  contact.lift.value = 0.05;
  def.surface_contacts.push_back(contact);
  return def;
}

}  // namespace

TEST_CASE("surface contact: the global tangent is the derivative of the residual", "[fe][contact][surface]") {
  // Central differences (common practice for consistent tangents), on a
  // curved surface so that the curvature term of the tangent counts.
  for (const solver::SurfaceContactKind kind : {solver::SurfaceContactKind::held_on,
                                                solver::SurfaceContactKind::frictionless,
                                                solver::SurfaceContactKind::bonded}) {
    solver::Model model(disk_section(), on_surface(kind));
    Eigen::VectorXd q(model.size());
    for (int i = 0; i < model.size(); ++i) {
      q(i) = 0.02 * std::sin(0.71 * i + 0.3) - (i % 2 == 1 ? 0.05 : 0.0);
    }
    // Closes the nodes the displacement pushes into the surface.
    model.update_active_set(q, 1.0);
    const solver::SurfaceContactState state = model.surface_contact_state(q, 1.0);
    INFO("kind " << static_cast<int>(kind));
    REQUIRE(state.nodes > 0);
    if (kind != solver::SurfaceContactKind::held_on) {
      REQUIRE(state.touching + state.pulling > 0);
      REQUIRE(state.touching + state.pulling < state.nodes);
    }
    const test::TangentComparison comparison = test::compare_tangent_with_differences(model, q, 1.0, 1e-7);
    CHECK(comparison.worst_difference < 1e-6 * comparison.largest_entry);
  }
}

TEST_CASE("surface contact: a block squeezed by a rising flat surface is in uniform compression",
          "[fe][contact][surface]") {
  // Plane strain, frictionless bottom on a flat rigid surface that rises by
  // delta, top held in z: a homogeneous uniaxial compression (free in x), so
  // the stress is the pointwise solution of the law at the stretch
  // (H - delta + penetration)/H, and the penetration is the contact
  // pressure over the penalty stiffness k = 1e3 E / h (h = 0.25, the edge
  // length).
  mesh::LayeredRectangleSpec spec;
  spec.width = 1.0;
  spec.cells_along = 4;
  spec.layers = {{"block", 1.0, 4, 1.0}};
  const mesh::Mesh mesh = mesh::layered_rectangle(spec);
  const double delta = 0.1;
  solver::ModelDefinition def;
  def.kinematics = solver::Kinematics::plane_strain;
  const double E = 2.0;
  def.regions = {{test::neo_hookean_from_young(E, 0.3), solver::LockingCure::off}};
  def.displacements.push_back(solver::symmetry("top", 1));
  def.displacements.push_back(solver::symmetry("left", 0));
  solver::SurfaceContact contact;
  contact.edge_set = "bottom";
  contact.surface = solver::RigidSurface::profile({{0.0, 0.0}, {5.0, 0.0}});
  contact.kind = solver::SurfaceContactKind::frictionless;
  contact.height_scale.function = [](double) { return 1.0; };
  contact.lift.value = delta;
  def.surface_contacts.push_back(contact);
  solver::Model model(mesh, def);
  nonlinear::DirectSparseSolver linear_solver;
  nonlinear::LoadStepperOptions options;
  options.steps = 4;
  const nonlinear::LoadPathResult path =
      nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()), options, {});
  INFO(path.reason);
  REQUIRE(path.completed());
  const Eigen::MatrixX2d u = model.displacements(path.q, 1.0);
  const solver::SurfaceContactState state = model.surface_contact_state(path.q, 1.0);
  CHECK(state.touching == state.nodes);
  CHECK(state.touching_fraction == Approx(1.0));
  // Every bottom node at the same height: the surface minus the penetration.
  const std::vector<int> bottom = mesh::nodes_of_edge_set(mesh, "bottom");
  const double squeeze = delta - state.max_penetration;
  for (const int node : bottom) {
    CHECK(u(node, 1) == Approx(squeeze).margin(1e-9));
  }
  // Homogeneous plane-strain uniaxial compression: P_xx = 0 fixes F_xx.
  const materials::LawParameters law = test::neo_hookean_from_young(E, 0.3);
  const double stretch = 1.0 - squeeze;
  double lateral = 1.0;
  for (int iteration = 0; iteration < 60; ++iteration) {
    const auto P = [&](double fx) {
      Eigen::Matrix3d F = Eigen::Matrix3d::Identity();
      F(0, 0) = fx;
      F(1, 1) = stretch;
      return materials::evaluate(law, F).first_piola;
    };
    const double h = 1e-7;
    const double slope = (P(lateral + h)(0, 0) - P(lateral - h)(0, 0)) / (2 * h);
    lateral -= P(lateral)(0, 0) / slope;
  }
  Eigen::Matrix3d F = Eigen::Matrix3d::Identity();
  F(0, 0) = lateral;
  F(1, 1) = stretch;
  const double nominal_pressure = -materials::evaluate(law, F).first_piola(1, 1);
  const int corner = mesh.node_sets.at("corner-top-right").front();
  CHECK(1.0 + u(corner, 0) == Approx(lateral).epsilon(1e-6));
  CHECK(state.max_pressure == Approx(nominal_pressure).epsilon(1e-6));
  // Penetration of p h / (1e3 E): well below the tolerance the runs state
  // (1 % of the node spacing).
  CHECK(state.max_penetration_to_spacing < 0.01);
  CHECK(state.max_penetration == Approx(nominal_pressure * 0.25 / (1e3 * E)).epsilon(1e-6));
  // The top reaction is the same force.
  const Eigen::MatrixX2d forces = model.nodal_forces(path.q, 1.0);
  double top = 0.0;
  for (const int node : mesh.node_sets.at("top")) {
    top += forces(node, 1);
  }
  CHECK(std::abs(top) == Approx(nominal_pressure * spec.width).epsilon(1e-6));
}
