#include "plystrain/solver/stack_from_case.hpp"

#include <string>

namespace plystrain {

namespace {

int layer_index(const CaseSpec& spec, const std::string& name) {
  for (std::size_t i = 0; i < spec.layers.size(); ++i) {
    if (spec.layers[i].name.value == name) {
      return static_cast<int>(i);
    }
  }
  // The reader has already refused unknown layer names.
  throw std::logic_error("defect names layer \"" + name + "\" that the case does not have");
}

mesh::DefectKind to_mesh(DefectKind kind) {
  switch (kind) {
    case DefectKind::pinhole: return mesh::DefectKind::pinhole;
    case DefectKind::thin_spot: return mesh::DefectKind::thin_spot;
    case DefectKind::delamination: return mesh::DefectKind::delamination;
  }
  return mesh::DefectKind::pinhole;
}

}  // namespace

mesh::StackDescription stack_from_case(const CaseSpec& spec) {
  mesh::StackDescription stack;
  stack.shape =
      spec.geometry.shape.value == Shape::disk ? mesh::StackShape::disk : mesh::StackShape::strip;
  stack.width = spec.geometry.width.value;
  stack.symmetric = spec.geometry.shape.value == Shape::disk || spec.geometry.symmetric.value;
  for (const LayerSpec& layer : spec.layers) {
    stack.layers.push_back(
        {layer.name.value, layer.thickness.value, layer.elements_through.value});
  }
  for (std::size_t i = 0; i < spec.defects.size(); ++i) {
    const DefectSpec& defect = spec.defects[i];
    mesh::StackDefect out;
    out.kind = to_mesh(defect.kind.value);
    out.layer = layer_index(spec, defect.host_layer().value);
    out.at = defect.at.value;
    out.size = defect.size.value;
    out.depth = defect.depth.value;
    out.taper = defect.taper.value;
    out.fill = defect.fill.value == DefectFill::above ? mesh::CavityFill::above
                                                      : mesh::CavityFill::empty;
    out.case_index = static_cast<int>(i) + 1;
    stack.defects.push_back(out);
  }
  stack.size_near = spec.mesh.size_near.value;
  stack.size_far = spec.mesh.size_far.value;
  stack.grade_over = spec.mesh.grade_over.value;
  stack.order = spec.mesh.order.value;
  return stack;
}

InputError input_error_from_mesh_error(const mesh::MeshError& error, const CaseSpec& spec) {
  const int index = error.index();
  if (error.subject() == mesh::MeshError::Subject::defect && index >= 1 &&
      index <= static_cast<int>(spec.defects.size())) {
    const DefectSpec& defect = spec.defects[static_cast<std::size_t>(index - 1)];
    return InputError(defect.where, "defect[" + std::to_string(index) + "]",
                      std::string("cannot be meshed: ") + error.what());
  }
  if (error.subject() == mesh::MeshError::Subject::layer && index >= 0 &&
      index < static_cast<int>(spec.layers.size())) {
    const LayerSpec& layer = spec.layers[static_cast<std::size_t>(index)];
    return InputError(layer.where, "layer." + layer.name.value,
                      std::string("cannot be meshed: ") + error.what());
  }
  return InputError(SourceLocation{spec.source.string(), 0, 0}, "geometry",
                    std::string("cannot be meshed: ") + error.what());
}

}  // namespace plystrain
