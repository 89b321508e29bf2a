#include "plystrain/solver/local_checks.hpp"

#include "plystrain/solver/zone_of_influence.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace plystrain {

namespace {

std::size_t layer_index(const CaseSpec& spec, const std::string& name) {
  for (std::size_t i = 0; i < spec.layers.size(); ++i) {
    if (spec.layers[i].name.value == name) {
      return i;
    }
  }
  throw std::logic_error("local check: no layer \"" + name + "\"");
}

double layer_mid_height(const CaseSpec& spec, std::size_t layer) {
  double below = 0.0;
  for (std::size_t i = 0; i < layer; ++i) {
    below += spec.layers[i].thickness.value;
  }
  return below + 0.5 * spec.layers[layer].thickness.value;
}

}  // namespace

CaseSpec without_defects(const CaseSpec& spec) {
  CaseSpec global = spec;
  global.defects.clear();
  return global;
}

std::array<double, 2> in_plane_strains(const solver::PointResult& point) {
  const Eigen::Matrix3d& F = point.deformation_gradient;
  return {F.col(0).head<2>().norm() - 1.0, F(2, 2) - 1.0};
}

CaseSpec local_cell_case(const CaseSpec& spec, std::size_t defect_index, double major, double minor) {
  const DefectSpec& defect = spec.defects.at(defect_index);
  CaseSpec cell = spec;
  cell.variants.clear();
  cell.sweep.reset();
  cell.title.value = spec.title.value + ", local cell of defect " + std::to_string(defect_index + 1);
  DefectSpec centred = defect;
  centred.at.value = 0.0;
  centred.at.given = true;
  cell.defects = {centred};
  // Wide enough that the defect's disturbance has died out at the loaded
  // edge: its zone of influence in this stack (zone_of_influence.hpp), and
  // never less than ten times its own reach.
  const double width = std::max(10.0 * defect_outer_edge(centred),
                                default_width({centred}, stack_scales(spec.layers, spec.library)));
  cell.geometry.width.value = width;
  cell.geometry.width.given = true;
  // Every defect of an axisymmetric global model is round (a hole, a thin
  // spot or a debond on the axis), so the state alone chooses the cell.
  const bool equibiaxial = major > 0.0 && minor >= equibiaxial_ratio * major;
  cell.load = LoadSpec{};
  cell.load.where = spec.load.where;
  // Marked as given: the case as run writes what the cell was given.
  cell.load.kind.value = LoadKind::stretch;
  cell.load.kind.given = true;
  cell.load.strain.value = major;
  cell.load.strain.given = true;
  cell.load.steps = spec.load.steps;
  cell.load.max_steps = spec.load.max_steps;
  if (equibiaxial) {
    cell.geometry.shape.value = Shape::disk;
    cell.geometry.shape.given = true;
  } else {
    cell.geometry.shape.value = Shape::strip;
    cell.geometry.shape.given = true;
    cell.geometry.symmetric.value = true;
    cell.load.lateral.value.mode = LateralMode::imposed;
    cell.load.lateral.value.strain = minor;
    cell.load.lateral.given = true;
  }
  // Sizes far from the defect follow the cell, not the device.
  if (!spec.mesh.size_far.given) {
    cell.mesh.size_far.value = std::max(width / 40.0, cell.mesh.size_near.value);
    cell.mesh.size_far.given = true;
  }
  if (!spec.mesh.grade_over.given) {
    cell.mesh.grade_over.value = 10.0 * cell.mesh.size_far.value;
    cell.mesh.grade_over.given = true;
  }
  cell.report.out.value.clear();
  return cell;
}

std::vector<LocalCellPlan> plan_local_cells(const CaseSpec& spec, const solver::PointResults& points,
                                            const std::vector<LayerResult>& layers) {
  std::vector<LocalCellPlan> plans;
  for (std::size_t d = 0; d < spec.defects.size(); ++d) {
    const DefectSpec& defect = spec.defects[d];
    const std::size_t layer = layer_index(spec, defect.host_layer().value);
    Eigen::Vector2d at;
    if (spec.load.local_at.value) {
      at = Eigen::Vector2d(*spec.load.local_at.value, layer_mid_height(spec, layer));
    } else {
      const auto found = std::find_if(layers.begin(), layers.end(),
                                      [&](const LayerResult& result) { return result.name == defect.host_layer().value; });
      if (found == layers.end()) {
        throw std::logic_error("local check: no global result for layer \"" + defect.host_layer().value + "\"");
      }
      at = Eigen::Vector2d(found->peak_at[0], found->peak_at[1]);
    }
    const solver::PointResult* point = solver::nearest_point(points, static_cast<int>(layer), at);
    if (point == nullptr) {
      throw std::logic_error("local check: layer \"" + defect.host_layer().value + "\" has no points");
    }
    const std::array<double, 2> strains = in_plane_strains(*point);
    LocalCellPlan plan;
    plan.defect_index = static_cast<int>(d) + 1;
    plan.major = std::max(strains[0], strains[1]);
    plan.minor = std::min(strains[0], strains[1]);
    plan.at = {point->position.x(), point->position.y()};
    plan.cell = local_cell_case(spec, d, plan.major, plan.minor);
    plans.push_back(std::move(plan));
  }
  return plans;
}

}  // namespace plystrain
