// Shared set-up of the sphere-inflation verification tests: an axisymmetric
// quarter of a hollow sphere (symmetry plane z = 0, axis r = 0) of an
// incompressible-like neo-Hookean solid under follower pressure on its inner
// face, followed with arc-length control past the pressure maximum.
#pragma once

#include "plystrain/materials/law.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/nonlinear/linear_solver.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"
#include "plystrain/solver/model.hpp"

#include <algorithm>
#include <functional>
#include <iterator>
#include <numbers>
#include <stdexcept>
#include <string>
#include <vector>

namespace plystrain::test {

struct InflationSpec {
  double inner_radius = 1.0;
  double outer_radius = 2.0;
  int cells_radial = 4;
  int cells_angular = 8;
  double shear_modulus = 1.0;
  double bulk_modulus = 1e4;         // kappa/mu = 1e4: the closed forms are for an incompressible solid
  double reference_pressure = 1.0;   // pressure at load factor 1
  double stop_inner_stretch = 2.0;   // end the path once the inner equator stretch exceeds this
  int steps = 10;
  double max_increment = 0.1;
};

struct InflationPoint {
  double pressure = 0.0;
  double inner_stretch = 0.0;  // a / A at the equator
  double outer_stretch = 0.0;  // b / B at the equator
};

struct InflationRun {
  nonlinear::LoadPathResult path;
  std::vector<InflationPoint> points;
};

inline int common_node(const mesh::Mesh& mesh, const std::string& first, const std::string& second) {
  const std::vector<int>& a = mesh.node_sets.at(first);
  const std::vector<int>& b = mesh.node_sets.at(second);
  std::vector<int> both;
  std::set_intersection(a.begin(), a.end(), b.begin(), b.end(), std::back_inserter(both));
  if (both.size() != 1) {
    throw std::logic_error("expected one node common to " + first + " and " + second);
  }
  return both.front();
}

inline InflationRun inflate_sphere(const InflationSpec& spec) {
  mesh::AnnulusSectorSpec sector;
  sector.inner_radius = spec.inner_radius;
  sector.outer_radius = spec.outer_radius;
  sector.start_angle = 0.0;                  // on the symmetry plane z = 0
  sector.end_angle = std::numbers::pi / 2;   // on the axis r = 0
  sector.cells_radial = spec.cells_radial;
  sector.cells_angular = spec.cells_angular;
  sector.cell_type = mesh::CellType::quad9;
  const mesh::Mesh mesh = mesh::annulus_sector(sector);
  const int inner_equator = common_node(mesh, "inner", "start");
  const int outer_equator = common_node(mesh, "outer", "start");

  solver::ModelDefinition definition;
  definition.kinematics = solver::Kinematics::axisymmetric;
  materials::LawParameters law;
  law.kind = materials::ModelKind::neo_hookean;
  law.shear_modulus = spec.shear_modulus;
  law.bulk_modulus = spec.bulk_modulus;
  definition.regions = {{law, solver::LockingCure::on}};
  definition.displacements.push_back(solver::symmetry("start", 1));  // z = 0 plane
  definition.displacements.push_back(solver::symmetry("end", 0));    // axis
  solver::FollowerPressure pressure;
  pressure.edge_set = "inner";
  pressure.pressure = solver::ScaledValue{spec.reference_pressure, {}};
  definition.pressures.push_back(pressure);
  definition.threads = 1;  // tiny meshes: thread start-up would cost more than the work
  solver::Model model(mesh, definition);

  nonlinear::LoadStepperOptions options;
  options.control = nonlinear::ControlMode::arc_length;
  options.steps = spec.steps;
  options.max_increment = spec.max_increment;
  options.max_steps = 400;
  options.load_factor_end = 1e6;  // the path is ended by the stretch below
  options.newton.symmetry =
      model.tangent_is_symmetric() ? nonlinear::MatrixSymmetry::symmetric : nonlinear::MatrixSymmetry::unsymmetric;

  InflationRun run;
  nonlinear::LoadStepperCallbacks callbacks;
  callbacks.on_increment = [&](const nonlinear::ConvergedIncrement& increment) {
    const Eigen::MatrixX2d u = model.displacements(increment.q, increment.load_factor);
    InflationPoint point;
    point.pressure = spec.reference_pressure * increment.load_factor;
    point.inner_stretch = (spec.inner_radius + u(inner_equator, 0)) / spec.inner_radius;
    point.outer_stretch = (spec.outer_radius + u(outer_equator, 0)) / spec.outer_radius;
    run.points.push_back(point);
    return point.inner_stretch < spec.stop_inner_stretch;
  };
  nonlinear::DirectSparseSolver linear_solver;
  run.path = nonlinear::solve_load_path(model, linear_solver, Eigen::VectorXd::Zero(model.size()), options, callbacks);
  return run;
}

}  // namespace plystrain::test
