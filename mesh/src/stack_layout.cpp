#include "stack_layout.hpp"

#include <algorithm>
#include <cmath>

namespace plystrain::mesh::detail {

double domain_start(const StackDescription& stack) {
  return (stack.shape == StackShape::strip && !stack.symmetric) ? -stack.width : 0.0;
}

DefectExtent extent_of(const StackDefect& defect) {
  DefectExtent extent;
  extent.lo = defect.at - 0.5 * defect.size;
  extent.hi = defect.at + 0.5 * defect.size;
  const double taper = defect.kind == DefectKind::thin_spot ? defect.taper : 0.0;
  extent.inner_lo = extent.lo + taper;
  extent.inner_hi = extent.hi - taper;
  return extent;
}

namespace {

struct Feature {
  double x = 0.0;
  bool fine = false;  // a defect edge or taper end: size_near here
};

// Element count and ratio of a column graded from its fine end: lengths
// h0, h0 r, h0 r^2, ... with r chosen so that the size would reach size_far
// after grade_over (a geometric series over grade_over).
struct Grading {
  double near = 0.0;
  double far = 0.0;
  double ratio = 1.0;
};

Grading make_grading(const StackDescription& stack) {
  Grading grading;
  grading.far = stack.size_far;
  grading.near = std::min(stack.size_near, stack.size_far);
  const double over = stack.grade_over;
  if (grading.far > grading.near * (1.0 + 1e-12)) {
    // Sum of the series = over and last term = far gives r = (over - near) / (over - far).
    grading.ratio = over > grading.far ? (over - grading.near) / (over - grading.far) : 2.0;
    grading.ratio = std::clamp(grading.ratio, 1.0, 2.0);
  }
  return grading;
}

Column graded_column(double x0, double x1, bool fine_at_left, const Grading& grading) {
  Column column{x0, x1, 1, grading.ratio, fine_at_left};
  const double length = x1 - x0;
  int count = 0;
  if (grading.ratio <= 1.0 + 1e-12) {
    count = static_cast<int>(std::ceil(length / grading.near - 1e-9));
    column.progression = 1.0;
  } else {
    double covered = 0.0;
    double step = grading.near;
    while (covered < length * (1.0 - 1e-9)) {
      covered += step;
      step *= grading.ratio;
      ++count;
    }
  }
  // At least two elements, so that a graded span always has an inner node.
  column.elements = std::max(2, count);
  return column;
}

Column uniform_column(double x0, double x1, double size) {
  Column column{x0, x1, 1, 1.0, true};
  column.elements = std::max(1, static_cast<int>(std::ceil((x1 - x0) / size - 1e-9)));
  return column;
}

std::vector<Feature> features_of(const StackDescription& stack) {
  const double start = domain_start(stack);
  const double end = stack.width;
  const double tolerance = 1e-9 * (end - start);
  std::vector<double> points;
  for (const StackDefect& defect : stack.defects) {
    const DefectExtent extent = extent_of(defect);
    points.push_back(extent.lo);
    points.push_back(extent.hi);
    if (defect.kind == DefectKind::thin_spot && defect.taper > 0.0) {
      points.push_back(extent.inner_lo);
      points.push_back(extent.inner_hi);
    }
  }
  std::sort(points.begin(), points.end());
  std::vector<Feature> features{{start, false}};
  for (const double x : points) {
    if (x < start - tolerance || x > end + tolerance) {
      continue;
    }
    if (std::abs(x - features.back().x) <= tolerance) {
      features.back().fine = true;
      continue;
    }
    features.push_back({x, true});
  }
  if (std::abs(features.back().x - end) <= tolerance) {
    features.back().x = end;
  } else {
    features.push_back({end, false});
  }
  if (std::abs(features.front().x - start) <= tolerance) {
    features.front().x = start;
  }
  return features;
}

std::vector<Column> make_columns(const StackDescription& stack) {
  const Grading grading = make_grading(stack);
  const double over = stack.grade_over;
  const std::vector<Feature> features = features_of(stack);
  std::vector<Column> columns;
  for (std::size_t s = 0; s + 1 < features.size(); ++s) {
    const Feature& a = features[s];
    const Feature& b = features[s + 1];
    const double length = b.x - a.x;
    if (!a.fine && !b.fine) {
      columns.push_back(uniform_column(a.x, b.x, grading.far));
    } else if (a.fine && b.fine) {
      if (length <= 2.0 * over) {
        const double mid = 0.5 * (a.x + b.x);
        columns.push_back(graded_column(a.x, mid, true, grading));
        columns.push_back(graded_column(mid, b.x, false, grading));
      } else {
        columns.push_back(graded_column(a.x, a.x + over, true, grading));
        columns.push_back(uniform_column(a.x + over, b.x - over, grading.far));
        columns.push_back(graded_column(b.x - over, b.x, false, grading));
      }
    } else if (length <= over) {
      columns.push_back(graded_column(a.x, b.x, a.fine, grading));
    } else if (a.fine) {
      columns.push_back(graded_column(a.x, a.x + over, true, grading));
      columns.push_back(uniform_column(a.x + over, b.x, grading.far));
    } else {
      columns.push_back(uniform_column(a.x, b.x - over, grading.far));
      columns.push_back(graded_column(b.x - over, b.x, false, grading));
    }
  }
  return columns;
}

bool contains(double lo, double hi, double x) { return lo < x && x < hi; }

// Share of the thin spot's depth at the column ends; the column lies
// entirely in the core, in one slope, or outside (0).
std::array<double, 2> recess_shape(const StackDefect& spot, const Column& column) {
  const DefectExtent extent = extent_of(spot);
  const double mid = 0.5 * (column.x0 + column.x1);
  if (!contains(extent.lo, extent.hi, mid)) {
    return {0.0, 0.0};
  }
  if (spot.taper > 0.0 && mid < extent.inner_lo) {
    const auto share = [&](double x) {
      return std::clamp((x - extent.lo) / (extent.inner_lo - extent.lo), 0.0, 1.0);
    };
    return {share(column.x0), share(column.x1)};
  }
  if (spot.taper > 0.0 && mid > extent.inner_hi) {
    const auto share = [&](double x) {
      return std::clamp((extent.hi - x) / (extent.hi - extent.inner_hi), 0.0, 1.0);
    };
    return {share(column.x0), share(column.x1)};
  }
  return {1.0, 1.0};
}

// Elements given to the wall of a stepped thin spot (the part of the layer
// beside the recess that is above the recess floor).
int step_wall_elements(const StackDefect& spot, int elements_through) {
  const double share = spot.depth / (1.0 - spot.depth);
  const int wall = static_cast<int>(std::lround(share * elements_through));
  return std::clamp(wall, 1, 2 * elements_through);
}

std::vector<int> layer_element_counts(const StackDescription& stack) {
  std::vector<int> counts;
  for (std::size_t l = 0; l < stack.layers.size(); ++l) {
    const StackLayer& layer = stack.layers[l];
    const int by_size = static_cast<int>(std::ceil(layer.thickness / stack.size_far - 1e-9));
    int count = std::max(layer.elements_through, by_size);
    for (const StackDefect& defect : stack.defects) {
      if (defect.kind == DefectKind::thin_spot && defect.taper == 0.0 &&
          defect.layer == static_cast<int>(l)) {
        count = std::max(count,
                         layer.elements_through + step_wall_elements(defect, layer.elements_through));
      }
    }
    counts.push_back(count);
  }
  return counts;
}

}  // namespace

Layout make_layout(const StackDescription& stack) {
  Layout layout;
  layout.columns = make_columns(stack);
  for (const Column& column : layout.columns) {
    layout.lines.push_back(column.x0);
  }
  layout.lines.push_back(layout.columns.back().x1);

  const int layer_count = static_cast<int>(stack.layers.size());
  const std::vector<int> counts = layer_element_counts(stack);
  // Depth and wall elements of the stepped thin spots of each layer (one
  // depth per layer, checked by validate_stack).
  std::vector<double> step_depth(stack.layers.size(), 0.0);
  std::vector<int> step_wall(stack.layers.size(), 0);
  for (const StackDefect& defect : stack.defects) {
    if (defect.kind == DefectKind::thin_spot && defect.taper == 0.0) {
      const auto li = static_cast<std::size_t>(defect.layer);
      step_depth[li] = defect.depth * stack.layers[li].thickness;
      step_wall[li] = step_wall_elements(defect, stack.layers[li].elements_through);
    }
  }
  std::vector<double> nominal_top(stack.layers.size());
  double running = 0.0;
  for (int l = 0; l < layer_count; ++l) {
    running += stack.layers[static_cast<std::size_t>(l)].thickness;
    nominal_top[static_cast<std::size_t>(l)] = running;
  }

  for (const Column& column : layout.columns) {
    const double mid = 0.5 * (column.x0 + column.x1);
    std::vector<Band> bands(stack.layers.size());
    // The surface the next layer rests on, its owner, and the sub-bands a
    // layer resting on it takes over (filled cavities below it).
    std::array<double, 2> support{0.0, 0.0};
    int support_owner = rests_on_ground;
    std::vector<std::array<double, 2>> carried_levels;
    std::vector<int> carried_elements;
    for (int l = 0; l < layer_count; ++l) {
      const auto li = static_cast<std::size_t>(l);
      const StackLayer& layer = stack.layers[li];
      const bool is_top = l == layer_count - 1;
      const StackDefect* pinhole = nullptr;
      const StackDefect* spot = nullptr;
      for (const StackDefect& defect : stack.defects) {
        if (defect.layer != l || defect.kind == DefectKind::delamination) {
          continue;
        }
        const DefectExtent extent = extent_of(defect);
        if (!contains(extent.lo, extent.hi, mid)) {
          continue;
        }
        (defect.kind == DefectKind::pinhole ? pinhole : spot) = &defect;
      }
      Band& band = bands[li];
      band.rests_on = support_owner;
      band.bottom = support;
      const double flat_top = nominal_top[li];
      if (pinhole != nullptr) {
        band.present = false;
        if (pinhole->fill == CavityFill::empty || is_top) {
          support = {flat_top, flat_top};
          support_owner = rests_on_nothing;
          carried_levels.clear();
          carried_elements.clear();
        } else if (step_depth[li] > 0.0) {
          // Keep the split of this layer's bands at its step floor.
          const double floor = flat_top - step_depth[li];
          carried_levels.push_back({floor, floor});
          carried_elements.push_back(counts[li] - step_wall[li]);
          carried_levels.push_back({flat_top, flat_top});
          carried_elements.push_back(step_wall[li]);
        } else {
          carried_levels.push_back({flat_top, flat_top});
          carried_elements.push_back(counts[li]);
        }
        continue;
      }
      band.present = true;
      band.top = {flat_top, flat_top};
      int wall = 0;
      if (spot != nullptr) {
        const std::array<double, 2> shape = recess_shape(*spot, column);
        const double depth = spot->depth * layer.thickness;
        band.top = {flat_top - depth * shape[0], flat_top - depth * shape[1]};
        if (spot->taper == 0.0) {
          wall = step_wall_elements(*spot, layer.elements_through);
        }
      }
      band.levels = carried_levels;
      band.sub_elements = carried_elements;
      // Beside a stepped thin spot of this layer the band is split at the
      // recess floor, so its nodes line up with the step wall everywhere.
      const double floor = flat_top - step_depth[li];
      const double tolerance = 1e-9 * flat_top;
      if (step_depth[li] > 0.0 && wall == 0 && band.top[0] > floor + tolerance &&
          band.top[1] > floor + tolerance) {
        band.levels.push_back({floor, floor});
        band.sub_elements.push_back(counts[li] - step_wall[li]);
        band.sub_elements.push_back(step_wall[li]);
      } else {
        band.sub_elements.push_back(counts[li] - wall);
      }
      band.elements = 0;
      for (const int e : band.sub_elements) {
        band.elements += e;
      }
      carried_levels.clear();
      carried_elements.clear();
      if (spot != nullptr && (spot->fill == CavityFill::empty || is_top)) {
        support = {flat_top, flat_top};
        support_owner = rests_on_nothing;
      } else {
        support = band.top;
        support_owner = l;
        if (wall > 0) {
          carried_levels.push_back({flat_top, flat_top});
          carried_elements.push_back(wall);
        }
      }
    }
    layout.bands.push_back(std::move(bands));
  }
  return layout;
}

}  // namespace plystrain::mesh::detail
