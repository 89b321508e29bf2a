#include "plystrain/solver/case_spec.hpp"

#include <algorithm>

namespace plystrain {

const char* unit_name(LengthUnit unit) {
  switch (unit) {
    case LengthUnit::nm: return "nm";
    case LengthUnit::um: return "um";
    case LengthUnit::mm: return "mm";
    case LengthUnit::m: return "m";
  }
  return "um";
}

double micrometres_per(LengthUnit unit) {
  switch (unit) {
    case LengthUnit::nm: return 1e-3;
    case LengthUnit::um: return 1.0;
    case LengthUnit::mm: return 1e3;
    case LengthUnit::m: return 1e6;
  }
  return 1.0;
}

const char* shape_name(Shape shape) { return shape == Shape::strip ? "strip" : "disk"; }

const char* role_name(LayerRole role) {
  switch (role) {
    case LayerRole::substrate: return "substrate";
    case LayerRole::electrode: return "electrode";
    case LayerRole::active: return "active";
    case LayerRole::transport: return "transport";
    case LayerRole::adhesive: return "adhesive";
    case LayerRole::encapsulant: return "encapsulant";
    case LayerRole::other: return "other";
  }
  return "other";
}

const char* defect_kind_name(DefectKind kind, Shape shape) {
  switch (kind) {
    case DefectKind::pinhole:
      return shape == Shape::strip ? "slit" : "pinhole";
    case DefectKind::thin_spot: return "thin-spot";
    case DefectKind::delamination: return "delamination";
  }
  return "pinhole";
}

const char* fill_name(DefectFill fill) { return fill == DefectFill::above ? "above" : "void"; }

const char* load_kind_name(LoadKind kind) {
  switch (kind) {
    case LoadKind::stretch: return "stretch";
    case LoadKind::bend: return "bend";
    case LoadKind::conform: return "conform";
  }
  return "stretch";
}

const char* surface_name(SurfaceKind kind) {
  switch (kind) {
    case SurfaceKind::sphere: return "sphere";
    case SurfaceKind::ellipsoid: return "ellipsoid";
    case SurfaceKind::profile: return "profile";
  }
  return "sphere";
}

const char* method_name(ConformMethod method) {
  return method == ConformMethod::wrap ? "wrap" : "press";
}

const char* contact_name(ContactKind kind) {
  return kind == ContactKind::frictionless ? "frictionless" : "bonded";
}

const LayerSpec* CaseSpec::find_layer(std::string_view layer_name) const {
  const auto found = std::find_if(layers.begin(), layers.end(), [layer_name](const LayerSpec& layer) {
    return layer.name.value == layer_name;
  });
  return found == layers.end() ? nullptr : &*found;
}

double CaseSpec::total_thickness() const {
  double total = 0.0;
  for (const LayerSpec& layer : layers) {
    total += layer.thickness.value;
  }
  return total;
}

double CaseSpec::thinnest_thickness() const {
  if (layers.empty()) {
    return 0.0;
  }
  double thinnest = layers.front().thickness.value;
  for (const LayerSpec& layer : layers) {
    thinnest = std::min(thinnest, layer.thickness.value);
  }
  return thinnest;
}

std::string CaseSpec::name() const {
  if (source.empty()) {
    return "case";
  }
  if (source.filename() == "case.toml" && !source.parent_path().filename().empty()) {
    return source.parent_path().filename().string();
  }
  return source.stem().string();
}

bool CaseSpec::operator==(const CaseSpec& other) const {
  return format == other.format && title == other.title && units == other.units &&
         material_files == other.material_files && geometry == other.geometry &&
         layers == other.layers && defects == other.defects && load == other.load &&
         mesh == other.mesh && report == other.report && variants == other.variants &&
         sweep == other.sweep;
}

}  // namespace plystrain
