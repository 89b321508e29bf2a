// The checks that need the whole case: names, materials, whether defects fit
// the geometry, whether the load can be realised.
#include "case_document.hpp"

#include "plystrain/solver/text_distance.hpp"

#include "plystrain/solver/rigid_surface.hpp"

#include <cmath>
#include <numbers>
#include <set>

namespace plystrain::casefile {

namespace {

class CaseChecker {
 public:
  CaseChecker(const CaseSpec& spec, Problems& problems)
      : spec_(spec), problems_(problems), scale_(micrometres_per(spec.units.value)) {
    for (const LayerSpec& layer : spec.layers) {
      layer_names_.push_back(layer.name.value);
    }
  }

  void run() {
    check_width();
    check_layers();
    for (std::size_t i = 0; i < spec_.defects.size(); ++i) {
      check_defect(i);
    }
    check_overlaps();
    check_load();
    check_mesh_and_report();
    check_variants();
  }

 private:
  const CaseSpec& spec_;
  Problems& problems_;
  double scale_;  // micrometres per user unit
  std::vector<std::string> layer_names_;

  // A length in the user's unit, for messages.
  std::string shown(double micrometres) const {
    return float_text(micrometres / scale_) + " " + unit_name(spec_.units.value);
  }
  static std::string label(std::size_t defect) { return CaseDocument::defect_label(defect); }
  std::string width_text() const { return "geometry.width = " + shown(spec_.geometry.width.value); }
  bool half_model() const {
    return spec_.geometry.shape.value == Shape::disk || spec_.geometry.symmetric.value;
  }

  std::string layer_hint(const std::string& name) const {
    const std::string hint = closest_match(name, layer_names_);
    return hint.empty() ? "" : " (did you mean \"" + hint + "\"?)";
  }

  void check_width() {
    const GeometrySpec& geometry = spec_.geometry;
    if (geometry.defect_spacing.given && geometry.width.given) {
      problems_.add(geometry.defect_spacing.where, "geometry.defect_spacing",
                    "expected either a width or a defect spacing (the width is half the "
                    "spacing), found both (geometry.width on line " +
                        std::to_string(geometry.width.where.line) + ")");
    }
    if (spec_.load.kind.value == LoadKind::conform && !geometry.width.given) {
      problems_.add(geometry.where, "geometry.width",
                    "expected the device's radius for a conform analysis, found no width");
    }
  }

  void check_layers() {
    std::map<std::string, int> first_line;
    for (const LayerSpec& layer : spec_.layers) {
      const std::string path = "layer." + layer.name.value;
      if (const auto [found, inserted] =
              first_line.emplace(layer.name.value, layer.name.where.line);
          !inserted) {
        problems_.add(layer.name.where, path + ".name",
                      "expected a unique layer name, found \"" + layer.name.value +
                          "\" again (first at line " + std::to_string(found->second) + ")");
      }
      if (spec_.library.find(layer.material.value) == nullptr) {
        std::string message = "unknown material \"" + layer.material.value + "\"";
        const std::string hint = spec_.library.closest_key(layer.material.value);
        message += hint.empty() ? "; `plystrain materials` lists the library"
                                : " (did you mean \"" + hint + "\"?)";
        problems_.add(layer.material.where, path + ".material", message);
      }
    }
  }

  // The extent [lo, hi] the defect occupies in the modelled part.
  std::array<double, 2> extent(const DefectSpec& defect) const {
    const double half = defect.size.value / 2.0;
    if (half_model() && defect.at.value == 0.0) {
      return {0.0, half};
    }
    return {defect.at.value - half, defect.at.value + half};
  }

  void check_defect(std::size_t index) {
    const DefectSpec& defect = spec_.defects[index];
    const std::string path = label(index);
    const Located<std::string>& host = defect.host_layer();
    const std::string host_key = defect.kind.value == DefectKind::delamination ? "below" : "layer";
    const auto layer = std::find(layer_names_.begin(), layer_names_.end(), host.value);
    if (layer == layer_names_.end()) {
      problems_.add(
          host.where, path + "." + host_key,
          "expected the name of a layer, found \"" + host.value + "\"" + layer_hint(host.value));
    } else if (defect.kind.value == DefectKind::delamination && layer + 1 == layer_names_.end()) {
      problems_.add(host.where, path + ".below",
                    "expected a layer with another layer on top of it, found the top layer \"" +
                        host.value + "\" (its top face is free, not an interface)");
    } else if (defect.kind.value != DefectKind::delamination && defect.fill.given &&
               defect.fill.value == DefectFill::above && layer + 1 == layer_names_.end()) {
      problems_.add(defect.fill.where, path + ".fill",
                    "expected \"void\" for a defect in the top layer \"" + host.value +
                        "\" (no layer above it can fill the cavity), found \"above\"");
    }

    const double width = spec_.geometry.width.value;
    const double at = defect.at.value;
    const double half = defect.size.value / 2.0;
    if (half_model() && at < 0.0) {
      problems_.add(
          defect.at.where, path + ".at",
          std::string("expected at >= 0 on ") +
              (spec_.geometry.shape.value == Shape::disk ? "a disk" : "a symmetric strip") +
              ", found " + shown(at));
    } else if (half_model() && at != 0.0 && at - half < 0.0) {
      problems_.add(
          defect.at.where, path + ".at",
          std::string("expected the defect to stay clear of ") +
              (spec_.geometry.shape.value == Shape::disk ? "the axis" : "the symmetry plane") +
              " (at - size/2 >= 0; use at = 0 for a defect centred on it), found at - "
              "size/2 = " +
              shown(at - half));
    } else if (at + half > width || (!half_model() && at - half < -width)) {
      problems_.add(defect.size.where, path + ".size",
                    "expected the defect to fit inside " + width_text() + ", found it spans " +
                        shown(at - half) + " to " + shown(at + half));
    }
    if (defect.kind.value == DefectKind::thin_spot && defect.taper.value > half) {
      problems_.add(defect.taper.where, path + ".taper",
                    "expected a taper of at most half the size (" + shown(half) + "), found " +
                        shown(defect.taper.value));
    }
  }

  void check_overlaps() {
    for (std::size_t i = 0; i < spec_.defects.size(); ++i) {
      for (std::size_t j = 0; j < i; ++j) {
        const DefectSpec& a = spec_.defects[i];
        const DefectSpec& b = spec_.defects[j];
        if (a.kind.value != b.kind.value || a.host_layer().value != b.host_layer().value) {
          continue;
        }
        const std::array<double, 2> ea = extent(a);
        const std::array<double, 2> eb = extent(b);
        if (ea[0] < eb[1] && eb[0] < ea[1]) {
          problems_.add(a.where, label(i),
                        std::string("expected ") +
                            defect_kind_name(a.kind.value, spec_.geometry.shape.value) +
                            "s in one layer not to overlap, found it overlaps " + label(j) +
                            " (line " + std::to_string(b.where.line) + ") in \"" +
                            a.host_layer().value + "\"");
        }
      }
    }
  }

  // Length of the meridian of the target surface from the apex to its edge.
  double surface_length() const {
    const LoadSpec& load = spec_.load;
    switch (load.surface.value) {
      case SurfaceKind::sphere:
        return std::numbers::pi / 2.0 * load.surface_radius.value;
      case SurfaceKind::ellipsoid: {
        const double a = load.semi_axes.value[0];
        const double b = load.semi_axes.value[1];
        double length = 0.0;
        constexpr int segments = 2000;
        for (int k = 0; k < segments; ++k) {
          const double t0 = std::numbers::pi / 2.0 * k / segments;
          const double t1 = std::numbers::pi / 2.0 * (k + 1) / segments;
          length +=
              std::hypot(a * (std::sin(t1) - std::sin(t0)), b * (std::cos(t1) - std::cos(t0)));
        }
        return length;
      }
      case SurfaceKind::profile: {
        double length = 0.0;
        const auto& points = load.points.value;
        for (std::size_t k = 1; k < points.size(); ++k) {
          length += std::hypot(points[k][0] - points[k - 1][0], points[k][1] - points[k - 1][1]);
        }
        return length;
      }
    }
    return 0.0;
  }

  // How far the surface falls from its apex to radius r (nothing when the
  // surface cannot be built: its own problem is reported elsewhere).
  std::optional<double> surface_drop_at(double r) const {
    const LoadSpec& load = spec_.load;
    try {
      switch (load.surface.value) {
        case SurfaceKind::sphere:
          return -solver::RigidSurface::ellipse(load.surface_radius.value,
                                                load.surface_radius.value)
                      .height_at(r);
        case SurfaceKind::ellipsoid:
          return -solver::RigidSurface::ellipse(load.semi_axes.value[0], load.semi_axes.value[1])
                      .height_at(r);
        case SurfaceKind::profile:
          return -solver::RigidSurface::profile(load.points.value).height_at(r);
      }
    } catch (const std::invalid_argument&) {
    }
    return std::nullopt;
  }

  // How far the surface falls from its apex to where its meridian ends.
  double surface_height() const {
    const LoadSpec& load = spec_.load;
    switch (load.surface.value) {
      case SurfaceKind::sphere:
        return load.surface_radius.value;
      case SurfaceKind::ellipsoid:
        return load.semi_axes.value[1];
      case SurfaceKind::profile:
        return load.points.value.empty()
                   ? 0.0
                   : load.points.value.front()[1] - load.points.value.back()[1];
    }
    return 0.0;
  }

  double surface_reach() const {  // largest r the surface covers
    const LoadSpec& load = spec_.load;
    switch (load.surface.value) {
      case SurfaceKind::sphere:
        return load.surface_radius.value;
      case SurfaceKind::ellipsoid:
        return load.semi_axes.value[0];
      case SurfaceKind::profile:
        return load.points.value.empty() ? 0.0 : load.points.value.back()[0];
    }
    return 0.0;
  }

  // The checks the surface itself makes (single-valued, falling, no kinks, an
  // interpolation that does not rise), reported against the points' line.
  void check_profile() {
    const auto& points = spec_.load.points;
    if (const std::optional<std::string> problem =
            solver::RigidSurface::profile_problem(points.value)) {
      problems_.add(points.where, "load.points", *problem);
    }
  }

  void check_load() {
    const LoadSpec& load = spec_.load;
    const double width = spec_.geometry.width.value;
    if (load.kind.value == LoadKind::bend) {
      for (const double radius : load.radius.value) {
        if (std::abs(radius) <= spec_.total_thickness()) {
          problems_.add(load.radius.where, "load.radius",
                        "expected |radius| larger than the stack thickness (" +
                            shown(spec_.total_thickness()) + "), found " + shown(radius));
        }
      }
    }
    if (load.kind.value == LoadKind::conform) {
      if (load.surface.value == SurfaceKind::profile) {
        check_profile();
      }
      if (load.method.value == ConformMethod::wrap && surface_length() < width) {
        problems_.add(load.surface.where, "load.surface",
                      "expected a surface long enough to take the whole width when wrapped (" +
                          width_text() + "), found a meridian of " + shown(surface_length()));
      }
      if (load.method.value == ConformMethod::press) {
        if (load.ring.value > width) {
          problems_.add(load.ring.where, "load.ring",
                        "expected a ring radius of at most " + width_text() + ", found " +
                            shown(load.ring.value));
        } else if (const std::optional<double> drop = surface_drop_at(load.ring.value); drop) {
          // The surface may be narrower than the ring: the sheet then spans
          // the gap freely. Two limits remain. Where the meridian ends (an
          // ellipse at its equator, a profile at its last point) the surface
          // has no more height to give. And a surface wider than the ring
          // where it crosses the ring's plane would run into the ring itself.
          const double height = surface_height();
          const double slack = 1e-9 * std::max(height, load.ring.value);
          if (load.travel.value > height + slack) {
            problems_.add(
                load.travel.where, "load.travel",
                "expected a travel of at most " + shown(height) +
                    ", the surface's height from its apex to where its meridian ends at r = " +
                    shown(surface_reach()) + ", found " + shown(load.travel.value));
          } else if (surface_reach() > load.ring.value && load.travel.value > *drop + slack) {
            problems_.add(load.travel.where, "load.travel",
                          "expected a travel of at most " + shown(*drop) +
                              ", the surface's drop from its apex to the ring radius " +
                              shown(load.ring.value) +
                              " (further, the surface would hit the ring), found " +
                              shown(load.travel.value));
          }
        }
      }
      if (load.local_at.value && *load.local_at.value > width) {
        problems_.add(
            load.local_at.where, "load.local_at",
            "expected a point inside " + width_text() + ", found " + shown(*load.local_at.value));
      }
    }
    if (load.max_steps.value < load.steps.value) {
      problems_.add(load.max_steps.where, "load.max_steps",
                    "expected at least load.steps = " + std::to_string(load.steps.value) +
                        ", found " + std::to_string(load.max_steps.value));
    }
  }

  void check_mesh_and_report() {
    const MeshSpec& mesh = spec_.mesh;
    if (mesh.size_near.value > mesh.size_far.value) {
      const Located<double>& culprit = mesh.size_near.given ? mesh.size_near : mesh.size_far;
      problems_.add(
          culprit.where, mesh.size_near.given ? "mesh.size_near" : "mesh.size_far",
          "expected mesh.size_near (" + shown(mesh.size_near.value) +
              ") at most mesh.size_far, found mesh.size_far = " + shown(mesh.size_far.value));
    }
  }

  void check_variants() {
    std::map<std::string, int> first_line;
    for (const VariantSpec& variant : spec_.variants) {
      const std::string path = "variant." + variant.name.value;
      if (const auto [found, inserted] =
              first_line.emplace(variant.name.value, variant.name.where.line);
          !inserted) {
        problems_.add(variant.name.where, path + ".name",
                      "expected a unique variant name, found \"" + variant.name.value +
                          "\" again (first at line " + std::to_string(found->second) + ")");
      }
      std::set<std::string> removed;
      for (const Located<std::string>& name : variant.remove) {
        if (std::find(layer_names_.begin(), layer_names_.end(), name.value) == layer_names_.end()) {
          problems_.add(name.where, path + ".remove",
                        "expected the name of a layer, found \"" + name.value + "\"" +
                            layer_hint(name.value));
        } else if (!removed.insert(name.value).second) {
          problems_.add(name.where, path + ".remove",
                        "expected each layer once, found \"" + name.value + "\" twice");
        }
      }
      if (!variant.remove.empty() && removed.size() >= layer_names_.size()) {
        problems_.add(variant.where, path + ".remove",
                      "expected at least one layer left, found every layer removed");
      }
    }
  }
};

}  // namespace

void check_case(const CaseSpec& spec, Problems& problems) {
  CaseChecker(spec, problems).run();
}

}  // namespace plystrain::casefile
