#include "plystrain/solver/post.hpp"

#include "model_impl.hpp"
#include "plystrain/solver/quadrature.hpp"
#include "plystrain/solver/thread_exceptions.hpp"

#include <Eigen/Eigenvalues>
#include <Eigen/QR>

#include <cmath>
#include <cstdint>
#include <limits>
#include <map>
#include <utility>

namespace plystrain::solver {

PointResult derive_point(const Eigen::Matrix3d& F, const Eigen::Matrix3d& P) {
  PointResult out;
  out.deformation_gradient = F;
  const double J = F.determinant();
  out.cauchy_stress = P * F.transpose() / J;
  // F is block diagonal (in-plane 2x2 and F33), so are C and b.
  const Eigen::Matrix2d F2 = F.topLeftCorner<2, 2>();
  const Eigen::Matrix2d C2 = F2.transpose() * F2;
  const Eigen::Matrix2d b2 = F2 * F2.transpose();
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix2d> right(C2);
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix2d> left(b2);
  // Eigenvalues ascending: index 1 is the major one.
  out.principal_stretches << std::sqrt(right.eigenvalues()(1)), std::sqrt(right.eigenvalues()(0)),
      std::abs(F(2, 2));
  out.major_in_plane_direction = right.eigenvectors().col(1);
  out.hencky_strain.setZero();
  for (int i = 0; i < 2; ++i) {
    const Eigen::Vector2d n = left.eigenvectors().col(i);
    out.hencky_strain.topLeftCorner<2, 2>() += 0.5 * std::log(left.eigenvalues()(i)) * n * n.transpose();
  }
  out.hencky_strain(2, 2) = std::log(std::abs(F(2, 2)));
  const Eigen::Matrix3d deviator = out.cauchy_stress - out.cauchy_stress.trace() / 3.0 * Eigen::Matrix3d::Identity();
  out.von_mises_stress = std::sqrt(1.5 * deviator.squaredNorm());
  out.max_principal_strain = out.principal_stretches.maxCoeff() - 1.0;
  out.min_principal_strain = out.principal_stretches.minCoeff() - 1.0;
  return out;
}

namespace {

// The states at one cell's points, into their slots of `results`.
void evaluate_cell_points(const ModelImpl& impl, const Eigen::VectorXd& z, int c,
                          KernelOutcome& outcome, PointResults& results) {
  CellCoordinates X;
  CellVector dofs;
  impl.gather_cell(c, z, X, dofs);
  std::array<PointState, max_cell_points> states;
  const int points =
      cell_point_states(impl.settings[static_cast<std::size_t>(c)], X, dofs, states, outcome);
  if (outcome.status != KernelStatus::ok) {
    return;
  }
  for (int p = 0; p < points; ++p) {
    const PointState& s = states[static_cast<std::size_t>(p)];
    PointResult r = derive_point(s.deformation_gradient, s.first_piola);
    r.cell = c;
    r.point = p;
    r.region = impl.mesh.cells[static_cast<std::size_t>(c)].region;
    r.position = s.position;
    r.area_weight = s.area_weight;
    r.volume_weight = s.volume_weight;
    r.pressure = s.pressure;
    results
        .points[static_cast<std::size_t>(results.cell_offsets[static_cast<std::size_t>(c)] + p)] =
        r;
  }
}

}  // namespace

PointResults evaluate_points(const Model& model, const Eigen::VectorXd& q, double load_factor) {
  const ModelImpl& impl = model.impl();
  PointResults results;
  const Eigen::VectorXd z = impl.variables(q, load_factor);
  const int cells = impl.mesh.cell_count();
  results.cell_offsets.assign(static_cast<std::size_t>(cells) + 1, 0);
  for (int c = 0; c < cells; ++c) {
    const int points =
        static_cast<int>(cell_rule(impl.settings[static_cast<std::size_t>(c)].type).size());
    results.cell_offsets[static_cast<std::size_t>(c) + 1] =
        results.cell_offsets[static_cast<std::size_t>(c)] + points;
  }
  results.points.resize(static_cast<std::size_t>(results.cell_offsets.back()));
  std::vector<KernelOutcome> outcomes(static_cast<std::size_t>(cells));
  ThreadExceptions exceptions;
#pragma omp parallel for schedule(static) num_threads(impl.threads())
  for (int c = 0; c < cells; ++c) {
    exceptions.capture(
        [&] { evaluate_cell_points(impl, z, c, outcomes[static_cast<std::size_t>(c)], results); });
  }
  exceptions.rethrow_first();
  for (int c = 0; c < cells; ++c) {
    const KernelOutcome& outcome = outcomes[static_cast<std::size_t>(c)];
    if (outcome.status != KernelStatus::ok) {
      results.status.status = outcome.status == KernelStatus::inverted ? EvaluationStatus::inverted_element
                                                                        : EvaluationStatus::material_failure;
      results.status.detail = "cell " + std::to_string(c) + ", point " + std::to_string(outcome.point) +
                              ": J = " + std::to_string(outcome.jacobian);
      results.points.clear();
      return results;
    }
  }
  return results;
}

namespace {

// Least-squares fit from a cell type's points to its nodes:
// nodal = (E^T E)^-1 E^T point_values, E(p, a) = N_a(xi_p).
Eigen::MatrixXd recovery_operator(mesh::CellType type) {
  const std::span<const QuadraturePoint> rule = cell_rule(type);
  const int n = mesh::node_count(type);
  Eigen::MatrixXd E(static_cast<Eigen::Index>(rule.size()), n);
  ShapeValues N;
  ShapeGradients dN;
  for (std::size_t p = 0; p < rule.size(); ++p) {
    shape_functions(type, rule[p].xi, N, dN);
    E.row(static_cast<Eigen::Index>(p)) = N.transpose();
  }
  return E.colPivHouseholderQr().solve(Eigen::MatrixXd::Identity(E.rows(), E.rows()));
}

}  // namespace

RegionNodalField recover_to_nodes(const mesh::Mesh& mesh, const PointResults& results,
                                  const PointQuantity& quantity, int components) {
  RegionNodalField field;
  field.components = components;
  const int regions = static_cast<int>(mesh.region_names.size());
  std::vector<Eigen::MatrixXd> sums(static_cast<std::size_t>(regions), Eigen::MatrixXd::Zero(mesh.node_count(), components));
  std::vector<Eigen::VectorXi> counts(static_cast<std::size_t>(regions), Eigen::VectorXi::Zero(mesh.node_count()));
  std::array<Eigen::MatrixXd, 5> operators;
  std::array<bool, 5> ready{};
  for (int c = 0; c < mesh.cell_count(); ++c) {
    const mesh::Cell& cell = mesh.cells[static_cast<std::size_t>(c)];
    const auto type_index = static_cast<std::size_t>(cell.type);
    if (!ready[type_index]) {
      operators[type_index] = recovery_operator(cell.type);
      ready[type_index] = true;
    }
    const int begin = results.cell_offsets[static_cast<std::size_t>(c)];
    const int end = results.cell_offsets[static_cast<std::size_t>(c) + 1];
    Eigen::MatrixXd values(end - begin, components);
    for (int p = begin; p < end; ++p) {
      values.row(p - begin) = quantity(results.points[static_cast<std::size_t>(p)]).transpose();
    }
    const Eigen::MatrixXd nodal = operators[type_index] * values;
    for (int a = 0; a < cell.size(); ++a) {
      const int node = cell.nodes[static_cast<std::size_t>(a)];
      sums[static_cast<std::size_t>(cell.region)].row(node) += nodal.row(a);
      counts[static_cast<std::size_t>(cell.region)](node) += 1;
    }
  }
  field.by_region.resize(static_cast<std::size_t>(regions));
  for (int r = 0; r < regions; ++r) {
    Eigen::MatrixXd& out = field.by_region[static_cast<std::size_t>(r)];
    out = sums[static_cast<std::size_t>(r)];
    for (int n = 0; n < mesh.node_count(); ++n) {
      const int count = counts[static_cast<std::size_t>(r)](n);
      if (count > 0) {
        out.row(n) /= count;
      } else {
        out.row(n).setConstant(std::numeric_limits<double>::quiet_NaN());
      }
    }
  }
  return field;
}

const PointResult* nearest_point(const PointResults& results, int region, const Eigen::Vector2d& at) {
  const PointResult* best = nullptr;
  double best_distance = std::numeric_limits<double>::infinity();
  for (const PointResult& point : results.points) {
    if (point.region != region) {
      continue;
    }
    const double distance = (point.position - at).squaredNorm();
    if (distance < best_distance) {
      best_distance = distance;
      best = &point;
    }
  }
  return best;
}

DiscPeak max_disc_average(const PointResults& results, int region, double radius,
                          const std::function<double(const PointResult&)>& quantity) {
  DiscPeak peak;
  std::vector<int> members;
  std::vector<double> values;
  for (std::size_t i = 0; i < results.points.size(); ++i) {
    if (results.points[i].region == region) {
      members.push_back(static_cast<int>(i));
      values.push_back(quantity(results.points[i]));
    }
  }
  peak.points = static_cast<int>(members.size());
  if (members.empty()) {
    peak.value = peak.raw_peak = std::numeric_limits<double>::quiet_NaN();
    return peak;
  }
  peak.raw_peak = -std::numeric_limits<double>::infinity();
  for (std::size_t k = 0; k < members.size(); ++k) {
    if (values[k] > peak.raw_peak) {
      peak.raw_peak = values[k];
      peak.raw_at = results.points[static_cast<std::size_t>(members[k])].position;
    }
  }
  if (!(radius > 0.0)) {
    peak.value = peak.raw_peak;
    peak.at = peak.raw_at;
    return peak;
  }
  // Bucket the points on a grid of cell size `radius`; a disc then touches
  // at most the 3 x 3 buckets around its centre.
  auto bucket_key = [radius](const Eigen::Vector2d& x) {
    const auto bx = static_cast<std::int64_t>(std::floor(x.x() / radius));
    const auto by = static_cast<std::int64_t>(std::floor(x.y() / radius));
    return std::make_pair(bx, by);
  };
  std::map<std::pair<std::int64_t, std::int64_t>, std::vector<int>> buckets;
  for (std::size_t k = 0; k < members.size(); ++k) {
    const auto [bx, by] = bucket_key(results.points[static_cast<std::size_t>(members[k])].position);
    buckets[{bx, by}].push_back(static_cast<int>(k));
  }
  peak.value = -std::numeric_limits<double>::infinity();
  const double r2 = radius * radius;
  for (std::size_t k = 0; k < members.size(); ++k) {
    const Eigen::Vector2d centre = results.points[static_cast<std::size_t>(members[k])].position;
    const auto [bx, by] = bucket_key(centre);
    double weighted = 0.0, area = 0.0;
    for (std::int64_t dx = -1; dx <= 1; ++dx) {
      for (std::int64_t dy = -1; dy <= 1; ++dy) {
        const auto found = buckets.find({bx + dx, by + dy});
        if (found == buckets.end()) {
          continue;
        }
        for (const int j : found->second) {
          const PointResult& p = results.points[static_cast<std::size_t>(members[static_cast<std::size_t>(j)])];
          if ((p.position - centre).squaredNorm() <= r2) {
            weighted += p.area_weight * values[static_cast<std::size_t>(j)];
            area += p.area_weight;
          }
        }
      }
    }
    const double average = weighted / area;
    if (average > peak.value) {
      peak.value = average;
      peak.at = centre;
    }
  }
  return peak;
}

}  // namespace plystrain::solver
