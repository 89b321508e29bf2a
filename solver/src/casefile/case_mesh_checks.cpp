// The checks that make a case one the mesher and the solver can honour, so
// that `check` refuses what `run` would otherwise meet first: features too
// small for the model (case_limits.hpp), a mesh too large to build, an
// averaging radius that averages the defects away, and the mesher's own
// validation of the stack.
#include "case_document.hpp"

#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/stack_mesher.hpp"
#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/stack_from_case.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace plystrain::casefile {

namespace {

// A place along x where the mesher cuts the stack into columns.
struct Cut {
  double x = 0.0;
  int defect = -1;  // index of the defect whose edge it is; -1 for an end of the cell
};

class MeshabilityChecker {
 public:
  MeshabilityChecker(const CaseSpec& spec, Problems& problems)
      : spec_(spec), problems_(problems), scale_(micrometres_per(spec.units.value)) {
    const double width = spec.geometry.width.value;
    const bool half = spec.geometry.shape.value == Shape::disk || spec.geometry.symmetric.value;
    start_ = half ? 0.0 : -width;
    end_ = width;
    extent_ = std::max(end_ - start_, spec.total_thickness());
    smallest_ = std::max(limits::smallest_feature_ratio * extent_, limits::smallest_length_um);
  }

  void run() {
    check_layers();
    for (std::size_t i = 0; i < spec_.defects.size(); ++i) {
      check_defect(i);
    }
    const std::vector<Cut> cuts = column_cuts();
    check_gaps(cuts);
    check_mesh_size(cuts);
    check_averaging_radius();
  }

  [[nodiscard]] double estimated_cells() const {
    return columns_along(column_cuts()) * rows_through();
  }

 private:
  const CaseSpec& spec_;
  Problems& problems_;
  double scale_;
  double start_ = 0.0;     // um, where the modelled span starts along x
  double end_ = 0.0;       // um
  double extent_ = 0.0;    // um, the larger of the span and the stack thickness
  double smallest_ = 0.0;  // um, the smallest feature the mesher is asked to resolve

  // A length in the case's unit, to four figures: these are computed limits,
  // not values the user wrote.
  std::string shown(double micrometres) const {
    return rounded(micrometres / scale_) + " " + unit_name(spec_.units.value);
  }

  static std::string rounded(double value) {
    char text[32];
    std::snprintf(text, sizeof text, "%.4g", value);
    return text;
  }

  // "at least 1e-05 um (1e-06 of the model's extent ...)"
  std::string smallest_text() const {
    return "at least " + shown(smallest_) + " (" + float_text(limits::smallest_feature_ratio) +
           " of the model's extent, " + shown(extent_) +
           ", the larger of the modelled span and the stack thickness; and 0.1 nm)";
  }

  void too_small(const SourceLocation& where, const std::string& key, const std::string& what,
                 double value) {
    problems_.add(where, key,
                  "expected " + what + " " + smallest_text() + ", found " + shown(value) +
                      ": the mesher cannot honour a smaller feature next to the rest");
  }

  const LayerSpec* layer_named(const std::string& name) const { return spec_.find_layer(name); }

  void check_layers() {
    for (const LayerSpec& layer : spec_.layers) {
      if (layer.thickness.value < smallest_) {
        too_small(layer.thickness.where, "layer." + layer.name.value + ".thickness",
                  "a layer thickness of", layer.thickness.value);
      }
    }
  }

  void check_defect(std::size_t index) {
    const DefectSpec& defect = spec_.defects[index];
    const std::string label = CaseDocument::defect_label(index);
    if (defect.size.value < smallest_) {
      too_small(defect.size.where, label + ".size", "a defect size of", defect.size.value);
    }
    if (defect.kind.value != DefectKind::thin_spot) {
      return;
    }
    if (defect.taper.value > 0.0 && defect.taper.value < smallest_) {
      too_small(defect.taper.where, label + ".taper", "0 or a taper of", defect.taper.value);
    }
    if (const LayerSpec* host = layer_named(defect.layer.value)) {
      const double recess = defect.depth.value * host->thickness.value;
      const double left = host->thickness.value - recess;
      if (std::min(recess, left) < smallest_) {
        too_small(defect.depth.where, label + ".depth",
                  "a recess (depth times the thickness of \"" + host->name.value +
                      "\") and a floor under it each of",
                  std::min(recess, left));
      }
    }
  }

  // The defect edges and taper ends inside the cell, and its two ends, in
  // order; as the mesher does, places closer than 1e-9 of the span are one.
  std::vector<Cut> column_cuts() const {
    std::vector<Cut> cuts{{start_, -1}, {end_, -1}};
    for (std::size_t i = 0; i < spec_.defects.size(); ++i) {
      const DefectSpec& defect = spec_.defects[i];
      const double half = defect.size.value / 2.0;
      std::vector<double> places{defect.at.value - half, defect.at.value + half};
      if (defect.kind.value == DefectKind::thin_spot && defect.taper.value > 0.0) {
        places.push_back(defect.at.value - half + defect.taper.value);
        places.push_back(defect.at.value + half - defect.taper.value);
      }
      for (const double x : places) {
        if (x > start_ && x < end_) {
          cuts.push_back({x, static_cast<int>(i)});
        }
      }
    }
    std::sort(cuts.begin(), cuts.end(), [](const Cut& a, const Cut& b) { return a.x < b.x; });
    return cuts;
  }

  [[nodiscard]] double same_place() const { return 1e-9 * (end_ - start_); }

  void check_gaps(const std::vector<Cut>& cuts) {
    std::vector<bool> reported(spec_.defects.size(), false);
    for (std::size_t k = 1; k < cuts.size(); ++k) {
      const double gap = cuts[k].x - cuts[k - 1].x;
      const int owner = cuts[k].defect >= 0 ? cuts[k].defect : cuts[k - 1].defect;
      if (gap <= same_place() || gap >= smallest_ || owner < 0 ||
          reported[static_cast<std::size_t>(owner)]) {
        continue;
      }
      reported[static_cast<std::size_t>(owner)] = true;
      const DefectSpec& defect = spec_.defects[static_cast<std::size_t>(owner)];
      const Located<double>& culprit = defect.at.given ? defect.at : defect.size;
      problems_.add(culprit.where,
                    CaseDocument::defect_label(static_cast<std::size_t>(owner)) +
                        (defect.at.given ? ".at" : ".size"),
                    "expected the defect's edges on, or " + smallest_text() +
                        " away from, every other defect edge and the ends of the cell, found "
                        "an edge " +
                        shown(gap) + " from the next");
    }
  }

  // Cells along x, as the mesher lays them out (stack_layout.cpp), each
  // count rounded up: between two cuts that are defect edges, two columns
  // graded from size_near over at most grade_over (or half the gap), the
  // rest at size_far; next to an end of the cell, one graded column. The
  // geometric series of a graded column is summed in closed form.
  double columns_along(const std::vector<Cut>& cuts) const {
    const MeshSpec& mesh = spec_.mesh;
    const double far = mesh.size_far.value;
    const double near = std::min(mesh.size_near.value, far);
    const double over = mesh.grade_over.value;
    double ratio = 1.0;
    if (far > near * (1.0 + 1e-12)) {
      ratio = over > far ? (over - near) / (over - far) : 2.0;
      ratio = std::clamp(ratio, 1.0, 2.0);
    }
    const auto graded = [&](double length) {
      const double count = ratio <= 1.0 + 1e-12
                               ? length / near
                               : std::log1p(length * (ratio - 1.0) / near) / std::log(ratio);
      return std::max(2.0, std::ceil(count) + 1.0);
    };
    const auto uniform = [&](double length) { return std::ceil(length / far) + 1.0; };
    double columns = 0.0;
    for (std::size_t k = 1; k < cuts.size(); ++k) {
      const double length = cuts[k].x - cuts[k - 1].x;
      const int fine = (cuts[k - 1].defect >= 0 ? 1 : 0) + (cuts[k].defect >= 0 ? 1 : 0);
      if (length <= same_place()) {
        continue;
      }
      if (fine == 0) {
        columns += uniform(length);
      } else if (fine == 2) {
        columns += length <= 2.0 * over ? 2.0 * graded(length / 2.0)
                                        : 2.0 * graded(over) + uniform(length - 2.0 * over);
      } else {
        columns += length <= over ? graded(length) : graded(over) + uniform(length - over);
      }
    }
    return columns;
  }

  // Rows of cells through the stack, as the mesher counts them.
  double rows_through() const {
    double rows = 0.0;
    for (const LayerSpec& layer : spec_.layers) {
      rows += std::max(static_cast<double>(layer.elements_through.value),
                       std::ceil(layer.thickness.value / spec_.mesh.size_far.value));
    }
    for (const DefectSpec& defect : spec_.defects) {
      const LayerSpec* host = layer_named(defect.layer.value);
      if (defect.kind.value == DefectKind::thin_spot && defect.taper.value == 0.0 && host) {
        rows += 2.0 * host->elements_through.value;  // the step wall, at most
      }
    }
    return rows;
  }

  void check_mesh_size(const std::vector<Cut>& cuts) {
    const double along = columns_along(cuts);
    const double through = rows_through();
    const double cells = along * through;
    if (cells <= limits::mesh_cells) {
      return;
    }
    const MeshSpec& mesh = spec_.mesh;
    const Located<double>& culprit = mesh.size_far.given    ? mesh.size_far
                                     : mesh.size_near.given ? mesh.size_near
                                                            : spec_.geometry.width;
    const std::string key = mesh.size_far.given    ? "mesh.size_far"
                            : mesh.size_near.given ? "mesh.size_near"
                                                   : "geometry.width";
    problems_.add(culprit.where, key,
                  "expected a mesh of at most " +
                      grouped_count(static_cast<std::size_t>(limits::mesh_cells)) +
                      " cells, found about " + rounded(cells) + " (" + rounded(along) +
                      " along the cell times " + rounded(through) +
                      " through the stack); larger mesh sizes, a narrower width or fewer "
                      "elements_through make it smaller");
  }

  void check_averaging_radius() {
    const Located<double>& radius = spec_.report.averaging_radius;
    if (!radius.given || spec_.layers.empty()) {
      return;  // the default is chosen within both limits
    }
    const auto thinnest = std::min_element(spec_.layers.begin(), spec_.layers.end(),
                                           [](const LayerSpec& a, const LayerSpec& b) {
                                             return a.thickness.value < b.thickness.value;
                                           });
    const double by_layer = limits::averaging_radius_per_thinnest_layer * thinnest->thickness.value;
    if (radius.value > by_layer) {
      problems_.add(radius.where, "report.averaging_radius",
                    "expected at most the thickness of the thinnest layer (\"" +
                        thinnest->name.value + "\", " + shown(by_layer) + "), found " +
                        shown(radius.value) +
                        ": a disc wider than the film it averages in averages its "
                        "concentration away");
      return;
    }
    for (std::size_t i = 0; i < spec_.defects.size(); ++i) {
      const double by_defect =
          limits::averaging_radius_per_defect_size * spec_.defects[i].size.value;
      if (radius.value > by_defect) {
        problems_.add(radius.where, "report.averaging_radius",
                      "expected at most half the size of " + CaseDocument::defect_label(i) + " (" +
                          shown(by_defect) + "), found " + shown(radius.value) +
                          ": a disc wider than the defect averages it away");
        return;
      }
    }
  }
};

}  // namespace

void check_mesher_accepts(const CaseSpec& spec, Problems& problems) {
  MeshabilityChecker(spec, problems).run();
  if (!problems.empty()) {
    return;
  }
  // What the mesher itself refuses (two stepped thin spots of one layer at
  // different depths, touching delaminations, ...) is refused here too.
  try {
    mesh::validate_stack(stack_from_case(spec));
  } catch (const mesh::MeshError& error) {
    const InputError refused = input_error_from_mesh_error(error, spec);
    for (const InputProblem& problem : refused.problems()) {
      problems.add(problem.where, problem.key_path, problem.message);
    }
  }
}

}  // namespace plystrain::casefile

namespace plystrain {

double estimated_mesh_cells(const CaseSpec& spec) {
  casefile::Problems unused;
  return casefile::MeshabilityChecker(spec, unused).estimated_cells();
}

}  // namespace plystrain
