// A small finite-strain layered strip for the Newton-rate and thread tests:
// a nearly incompressible neo-Hookean substrate (nu = 0.499, mixed u-p) with
// a stiff thin film on top, plane strain, stretched and bent by a rigid
// right face (a non-homogeneous finite deformation).
#pragma once

#include "plystrain/materials/law.hpp"
#include "plystrain/mesh/structured.hpp"
#include "plystrain/solver/model.hpp"

namespace plystrain::test {

inline materials::LawParameters neo_hookean_young(double youngs_modulus, double poisson_ratio) {
  const materials::ShearBulk moduli = materials::to_shear_bulk(youngs_modulus, poisson_ratio);
  materials::LawParameters law;
  law.kind = materials::ModelKind::neo_hookean;
  law.shear_modulus = moduli.shear_modulus;
  law.bulk_modulus = moduli.bulk_modulus;
  return law;
}

// Moduli in MPa, invented for a demo of a PDMS-like substrate under a
// polymer-like film; lengths in micrometres.
inline solver::Model stretched_bilayer(int cells_along, int threads, double stretch = 0.2, double angle = 0.1) {
  mesh::LayeredRectangleSpec spec;
  spec.width = 200.0;
  spec.cells_along = cells_along;
  spec.layers = {{"substrate", 50.0, std::max(2, cells_along / 4), 1.0}, {"film", 2.0, 1, 1.0}};
  spec.cell_type = mesh::CellType::quad9;
  solver::ModelDefinition definition;
  definition.kinematics = solver::Kinematics::plane_strain;
  definition.regions = {{neo_hookean_young(1.0, 0.499), solver::LockingCure::automatic},
                        {neo_hookean_young(1000.0, 0.3), solver::LockingCure::automatic}};
  definition.displacements.push_back(solver::symmetry("left", 0));
  definition.displacements.push_back(solver::symmetry("corner-bottom-left", 1));
  solver::RigidFace face;
  face.node_set = "right";
  face.reference_point = Eigen::Vector2d(200.0, 0.0);
  face.angle = solver::ScaledValue{angle, {}};
  face.fixed_translation[0] = solver::ScaledValue{stretch * 200.0, {}};
  face.fixed_translation[1] = solver::ScaledValue{0.0, {}};
  definition.rigid_faces.push_back(face);
  definition.threads = threads;
  return solver::Model(mesh::layered_rectangle(spec), definition);
}

}  // namespace plystrain::test
