// Post-processing: the state at every integration point (deformation,
// principal stretches in all three directions, Hencky strain, Cauchy stress,
// von Mises stress, principal nominal strains), its recovery to nodes per
// region (an interface node carries one value per region: nothing is smeared
// across layers), and the disc-averaged peak that reports use.
//
// Tensors are 3x3 in the model's frame: index 0 = x (or r), 1 = z, 2 = the
// third direction (out of plane for strips, hoop for disks).
#pragma once

#include "plystrain/solver/model.hpp"

#include <Eigen/Core>

#include <functional>
#include <vector>

namespace plystrain::solver {

struct PointResult {
  int cell = 0;
  int point = 0;
  int region = 0;
  Eigen::Vector2d position = Eigen::Vector2d::Zero();  // reference
  double area_weight = 0.0;    // reference area of the point's share of the cell (no 2 pi R)
  double volume_weight = 0.0;  // as integrated
  Eigen::Matrix3d deformation_gradient = Eigen::Matrix3d::Identity();
  Eigen::Matrix3d cauchy_stress = Eigen::Matrix3d::Zero();
  Eigen::Matrix3d hencky_strain = Eigen::Matrix3d::Zero();  // ln V (spatial)
  // Principal stretches: the two in-plane ones (largest first) and the third.
  Eigen::Vector3d principal_stretches = Eigen::Vector3d::Ones();
  // Reference direction of the largest in-plane stretch (unit, in the x-z plane).
  Eigen::Vector2d major_in_plane_direction = Eigen::Vector2d::UnitX();
  double von_mises_stress = 0.0;
  double max_principal_strain = 0.0;  // largest (stretch - 1) over all three directions
  double min_principal_strain = 0.0;  // smallest
  double pressure = 0.0;              // the hydrostatic variable used by the element
};

struct PointResults {
  std::vector<PointResult> points;
  std::vector<int> cell_offsets;  // points of cell c: [cell_offsets[c], cell_offsets[c + 1])
  Evaluation status;              // not ok when a cell could not be evaluated (then points is empty)
};

// Evaluates every integration point at (q, lambda).
[[nodiscard]] PointResults evaluate_points(const Model& model, const Eigen::VectorXd& q,
                                           double load_factor);

// The derived quantities of one point from its F, P and pressure (also used
// by tests): stretches, Hencky strain, Cauchy and von Mises stress, strains.
[[nodiscard]] PointResult derive_point(const Eigen::Matrix3d& deformation_gradient,
                                       const Eigen::Matrix3d& first_piola);

// Nodal values recovered per region: each cell fits its point values with its
// own shape functions (least squares; exact extrapolation when the point count
// equals the node count), and the nodes average only over cells of one region.
struct RegionNodalField {
  int components = 1;
  // by_region[r] is node_count x components; NaN at nodes outside region r.
  std::vector<Eigen::MatrixXd> by_region;
};

using PointQuantity = std::function<Eigen::VectorXd(const PointResult&)>;

[[nodiscard]] RegionNodalField recover_to_nodes(const mesh::Mesh& mesh, const PointResults& results,
                                                const PointQuantity& quantity, int components);

// The largest over candidate centres (the integration points of a region) of
// the area-weighted average of a quantity over the points of the same region
// within `radius` of the centre. This is the maximum of the averages, not the
// average at the raw maximum. radius <= 0 gives the raw peak.
struct DiscPeak {
  double value = 0.0;
  Eigen::Vector2d at = Eigen::Vector2d::Zero();      // centre of the best disc (reference)
  double raw_peak = 0.0;                             // largest point value in the region
  Eigen::Vector2d raw_at = Eigen::Vector2d::Zero();
  int points = 0;                                    // points of the region
};

// The point of `region` nearest to the reference position `at`; null when
// the region has no points.
[[nodiscard]] const PointResult* nearest_point(const PointResults& results, int region, const Eigen::Vector2d& at);

[[nodiscard]] DiscPeak max_disc_average(const PointResults& results, int region, double radius,
                                        const std::function<double(const PointResult&)>& quantity);

}  // namespace plystrain::solver
