// Per-layer evaluation of a solved state, as results-format.md defines it.
//
// Why the averaged peak: the largest strain at a re-entrant corner (the edge
// of a film at a pinhole, the step of a recess) is singular and grows without
// bound under refinement; only a value averaged over a fixed radius converges
// (theory-of-critical-distances practice; verification.md section 6). The
// reported peak is the largest disc average, not the average at the raw
// maximum. The raw value is kept beside it, and where it would give another
// verdict the run says so: the radius then decides the verdict.
#include "plystrain/solver/stack_analysis.hpp"

#include <Eigen/Eigenvalues>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <map>

namespace plystrain {

namespace {

double largest_principal(const Eigen::Matrix3d& tensor) {
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> solver(tensor, Eigen::EigenvaluesOnly);
  return solver.eigenvalues().maxCoeff();
}

}  // namespace

double evaluated_extent(const CaseSpec& spec) {
  const double width = spec.geometry.width.value;
  // Stretch and bend: the whole width, since the loaded edges are consistent
  // with the homogeneous or pure-bending state and add no disturbance of
  // their own. Conform: the rim of the device is a real free edge (wrap) or
  // a clamp (press), where the layers' mismatch makes a corner singularity
  // that no mesh converges; the evaluation stops one stack thickness inside
  // it, beyond which the stack-level strain is the edge's own (theory.md).
  if (spec.load.kind.value == LoadKind::conform) {
    return std::max(0.5 * width, width - spec.total_thickness());
  }
  return width;
}

double cell_edge_zone_start(const CaseSpec& spec) {
  return edge_zone_fraction * evaluated_extent(spec);
}

namespace {

// The reference's points that stand for "the same place without the
// defect": all of them when the reference is uniform along x, else those
// within a few averaging radii of x_peak (a conform device, whose strain
// varies along the radius).
solver::PointResults reference_near(const UndisturbedState& reference, double x_peak,
                                    double radius) {
  if (reference.uniform_along_x) {
    return reference.points;
  }
  solver::PointResults near;
  near.status = reference.points.status;
  const double window = std::max(2.0 * radius, 1e-9);
  double nearest = std::numeric_limits<double>::infinity();
  for (const solver::PointResult& point : reference.points.points) {
    nearest = std::min(nearest, std::abs(point.position.x() - x_peak));
  }
  for (const solver::PointResult& point : reference.points.points) {
    if (std::abs(point.position.x() - x_peak) <= nearest + window) {
      near.points.push_back(point);
    }
  }
  return near;
}

}  // namespace

std::vector<LayerResult> evaluate_layers(const CaseSpec& spec,
                                         const solver::PointResults& all_points,
                                         const UndisturbedState* undisturbed) {
  const double radius = spec.report.averaging_radius.value;
  const double edge_start = cell_edge_zone_start(spec);
  const double extent = evaluated_extent(spec);
  solver::PointResults points;
  points.status = all_points.status;
  for (const solver::PointResult& point : all_points.points) {
    if (std::abs(point.position.x()) <= extent) {
      points.points.push_back(point);
    }
  }
  const auto max_strain = [](const solver::PointResult& point) {
    return point.max_principal_strain;
  };
  solver::PointResults edge_points;
  edge_points.status = points.status;
  for (const solver::PointResult& point : points.points) {
    if (std::abs(point.position.x()) >= edge_start) {
      edge_points.points.push_back(point);
    }
  }
  const auto negated_min_strain = [](const solver::PointResult& point) {
    return -point.min_principal_strain;
  };

  std::vector<LayerResult> layers;
  for (std::size_t region = 0; region < spec.layers.size(); ++region) {
    const LayerSpec& layer = spec.layers[region];
    const materials::MaterialRecord* record = spec.library.find(layer.material.value);
    LayerResult result;
    result.name = layer.name.value;
    result.role = role_name(layer.role.value);
    result.material = layer.material.value;
    result.basis = record ? record->basis : "";
    result.thickness = layer.thickness.value;
    if (record) {
      result.crack_onset_strain = record->crack_onset_strain;
      result.yield_strain = record->yield_strain;
    }

    const int r = static_cast<int>(region);
    const solver::DiscPeak peak = solver::max_disc_average(points, r, radius, max_strain);
    const solver::DiscPeak most_compressive =
        solver::max_disc_average(points, r, radius, negated_min_strain);
    result.peak_strain = peak.value;
    result.peak_at = {peak.at.x(), peak.at.y()};
    result.raw_peak_strain = peak.raw_peak;
    result.min_strain = -most_compressive.value;
    if (const solver::PointResult* at_peak = solver::nearest_point(points, r, peak.at)) {
      result.peak_stress = largest_principal(at_peak->cauchy_stress);
    }

    // Measured for the curious and for the isolation check: what the layer
    // carries at the outer edge of the modelled width, averaged like the
    // peak (a raw value would differ from the averaged undisturbed one by
    // the strain's gradient through a bent layer).
    const solver::DiscPeak at_edge = solver::max_disc_average(edge_points, r, radius, max_strain);
    if (std::isfinite(at_edge.value)) {
      result.strain_at_cell_edge = at_edge.value;
    }
    // The concentration is taken against the same stack without its
    // defects under the same load, at the peak's place: a far field measured
    // in the model itself can still lie inside the defect's reach.
    if (undisturbed != nullptr) {
      const solver::PointResults reference = reference_near(*undisturbed, peak.at.x(), radius);
      const solver::DiscPeak value = solver::max_disc_average(reference, r, radius, max_strain);
      if (std::isfinite(value.value)) {
        result.far_field_strain = value.value;
        if (std::abs(value.value) > 1e-9) {
          result.concentration = result.peak_strain / value.value;
        }
      }
    }
    if (result.crack_onset_strain) {
      result.crack_margin = 1.0 - result.peak_strain / *result.crack_onset_strain;
    }
    if (result.yield_strain) {
      result.yield_margin = 1.0 - result.peak_strain / *result.yield_strain;
    }
    result.verdict = judge(result.peak_strain, result.crack_onset_strain, result.yield_strain);
    result.raw_peak_verdict =
        judge(result.raw_peak_strain, result.crack_onset_strain, result.yield_strain);
    layers.push_back(result);
  }
  return layers;
}

namespace {

std::string percent(double strain) {
  char text[32];
  std::snprintf(text, sizeof text, "%.3g %%", 100.0 * strain);
  return text;
}

// "its crack onset (9 %)" or "its yield strain (2 %)": the limit the raw
// verdict is about (a disc average never exceeds the raw peak, so the raw
// verdict is the worse one).
std::string limit_of(const LayerResult& layer) {
  if (layer.raw_peak_verdict == Verdict::cracks && layer.crack_onset_strain) {
    return "its crack onset (" + percent(*layer.crack_onset_strain) + ")";
  }
  if (layer.yield_strain) {
    return "its yield strain (" + percent(*layer.yield_strain) + ")";
  }
  return "its limits";
}

}  // namespace

std::vector<std::string> averaging_cautions(const CaseSpec& spec,
                                            const std::vector<LayerResult>& layers) {
  std::vector<std::string> cautions;
  for (const LayerResult& layer : layers) {
    if (layer.raw_peak_verdict == layer.verdict || layer.raw_peak_verdict == Verdict::unknown ||
        layer.verdict == Verdict::unknown) {
      continue;
    }
    char radius[32];
    std::snprintf(radius, sizeof radius, "%.4g",
                  spec.report.averaging_radius.value / micrometres_per(spec.units.value));
    cautions.push_back(
        "layer " + layer.name + ": the verdict rests on the averaging: its peak averaged over " +
        "report.averaging_radius = " + radius + " " + unit_name(spec.units.value) + " (" +
        percent(layer.peak_strain) + ") says " + verdict_text(layer.verdict) +
        ", its raw integration-point peak (" + percent(layer.raw_peak_strain) + ") says " +
        verdict_text(layer.raw_peak_verdict) + " against " + limit_of(layer) +
        "; the raw peak at a corner grows as the mesh is refined, so weigh the radius against "
        "the film's critical distance (docs/theory.md)");
  }
  return cautions;
}

std::vector<ProfileSample> sample_profiles(const CaseSpec& spec,
                                           const solver::PointResults& points) {
  std::vector<ProfileSample> samples;
  const double tolerance = 1e-9 * std::max(1.0, spec.geometry.width.value);
  for (std::size_t region = 0; region < spec.layers.size(); ++region) {
    // Columns of points of this layer, keyed by x rounded to the tolerance.
    std::map<long long, std::vector<const solver::PointResult*>> columns;
    for (const solver::PointResult& point : points.points) {
      if (point.region == static_cast<int>(region)) {
        columns[std::llround(point.position.x() / tolerance)].push_back(&point);
      }
    }
    for (const auto& [key, column] : columns) {
      double z_min = std::numeric_limits<double>::infinity();
      double z_max = -std::numeric_limits<double>::infinity();
      for (const solver::PointResult* point : column) {
        z_min = std::min(z_min, point->position.y());
        z_max = std::max(z_max, point->position.y());
      }
      const double z_mid = 0.5 * (z_min + z_max);
      const solver::PointResult* mid = *std::min_element(
          column.begin(), column.end(), [z_mid](const auto* a, const auto* b) {
            return std::abs(a->position.y() - z_mid) < std::abs(b->position.y() - z_mid);
          });
      // Nominal strain of a material fibre along each reference axis:
      // |F e_i| - 1 (the third direction is principal by symmetry).
      const Eigen::Matrix3d& F = mid->deformation_gradient;
      ProfileSample sample;
      sample.layer = spec.layers[region].name.value;
      sample.x = mid->position.x();
      sample.z = mid->position.y();
      sample.strain_along = F.col(0).norm() - 1.0;
      sample.strain_across = F.col(1).norm() - 1.0;
      sample.strain_third = F(2, 2) - 1.0;
      sample.max_principal = mid->max_principal_strain;
      samples.push_back(sample);
    }
  }
  return samples;
}

FieldSnapshot make_field_snapshot(const CaseSpec& spec, const solver::Model& model,
                                  const solver::PointResults& points, const Eigen::VectorXd& q,
                                  double load_factor) {
  const mesh::Mesh& grid = model.mesh();
  FieldSnapshot snapshot;
  snapshot.load_factor = load_factor;
  snapshot.displacement = model.displacements(q, load_factor);

  const auto scalar = [](double value) {
    Eigen::VectorXd out(1);
    out(0) = value;
    return out;
  };
  // Voigt order of the output: xx yy zz xy yz xz, with the model's frame
  // (x, z, third) mapped to (x, y, z) of the file.
  const auto voigt = [](const Eigen::Matrix3d& t) {
    Eigen::VectorXd out(6);
    out << t(0, 0), t(1, 1), t(2, 2), t(0, 1), t(1, 2), t(0, 2);
    return out;
  };
  const solver::RegionNodalField max_strain = solver::recover_to_nodes(
      grid, points, [&](const solver::PointResult& p) { return scalar(p.max_principal_strain); }, 1);
  const solver::RegionNodalField min_strain = solver::recover_to_nodes(
      grid, points, [&](const solver::PointResult& p) { return scalar(p.min_principal_strain); }, 1);
  const solver::RegionNodalField log_strain = solver::recover_to_nodes(
      grid, points, [&](const solver::PointResult& p) { return voigt(p.hencky_strain); }, 6);
  const solver::RegionNodalField stress = solver::recover_to_nodes(
      grid, points, [&](const solver::PointResult& p) { return voigt(p.cauchy_stress); }, 6);
  const solver::RegionNodalField mises = solver::recover_to_nodes(
      grid, points, [&](const solver::PointResult& p) { return scalar(p.von_mises_stress); }, 1);

  for (std::size_t region = 0; region < max_strain.by_region.size(); ++region) {
    for (int node = 0; node < grid.node_count(); ++node) {
      if (std::isfinite(max_strain.by_region[region](node, 0))) {
        snapshot.point_copies.push_back({node, static_cast<int>(region)});
      }
    }
  }
  const Eigen::Index copies = static_cast<Eigen::Index>(snapshot.point_copies.size());
  snapshot.max_principal_strain.resize(copies);
  snapshot.min_principal_strain.resize(copies);
  snapshot.log_strain.resize(copies, 6);
  snapshot.cauchy_stress.resize(copies, 6);
  snapshot.von_mises_stress.resize(copies);
  snapshot.crack_ratio.resize(copies);
  for (Eigen::Index i = 0; i < copies; ++i) {
    const auto [node, region] = snapshot.point_copies[static_cast<std::size_t>(i)];
    const std::size_t r = static_cast<std::size_t>(region);
    snapshot.max_principal_strain(i) = max_strain.by_region[r](node, 0);
    snapshot.min_principal_strain(i) = min_strain.by_region[r](node, 0);
    snapshot.log_strain.row(i) = log_strain.by_region[r].row(node);
    snapshot.cauchy_stress.row(i) = stress.by_region[r].row(node);
    snapshot.von_mises_stress(i) = mises.by_region[r](node, 0);
    const materials::MaterialRecord* record =
        r < spec.layers.size() ? spec.library.find(spec.layers[r].material.value) : nullptr;
    const bool has_onset = record && record->crack_onset_strain && *record->crack_onset_strain > 0;
    snapshot.crack_ratio(i) =
        has_onset ? snapshot.max_principal_strain(i) / *record->crack_onset_strain : 0.0;
  }
  return snapshot;
}

std::vector<LayerResult> envelope(const std::vector<std::vector<LayerResult>>& runs) {
  if (runs.empty()) {
    return {};
  }
  std::vector<LayerResult> combined = runs.front();
  for (std::size_t run = 1; run < runs.size(); ++run) {
    for (std::size_t i = 0; i < combined.size() && i < runs[run].size(); ++i) {
      const LayerResult& other = runs[run][i];
      LayerResult& layer = combined[i];
      const double min_strain = std::min(layer.min_strain, other.min_strain);
      // The governing crossing of several solves is the earliest.
      const auto earliest = [](const std::optional<double>& a, const std::optional<double>& b) {
        return a && b ? std::optional<double>(std::min(*a, *b)) : (a ? a : b);
      };
      const std::optional<double> crack_onset_load_factor =
          earliest(layer.crack_onset_load_factor, other.crack_onset_load_factor);
      const std::optional<double> yield_load_factor =
          earliest(layer.yield_load_factor, other.yield_load_factor);
      if (other.peak_strain > layer.peak_strain) {
        layer = other;
      }
      layer.min_strain = min_strain;
      layer.crack_onset_load_factor = crack_onset_load_factor;
      layer.yield_load_factor = yield_load_factor;
    }
  }
  return combined;
}

}  // namespace plystrain
